// GET /api/v1/sites/:siteId/visits — a site's overdue, due and upcoming visits for the coming weeks
import { apiRoute } from "@/server/api/route";
import { siteParams } from "@/lib/api/schemas";
import { siteScope } from "@/server/sites/get-site";
import { listSiteVisits } from "@/server/visits/site-visit-list";
import { siteVisitsQuery } from "@/server/visits/visit-schemas";

export const GET = apiRoute(
  { permission: "calendar.read", params: siteParams, query: siteVisitsQuery, scope: ({ params }, tx) => siteScope(tx, params) },
  async ({ tx, input }) => listSiteVisits(tx, { siteId: input.params.siteId, weeks: input.query.weeks }),
);
