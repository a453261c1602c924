// GET /api/v1/sites/:siteId — a site with its lifecycle history
// PATCH /api/v1/sites/:siteId — edit a site's details
import { apiRoute } from "@/server/api/route";
import { siteParams } from "@/lib/api/schemas";
import { getSiteDetail, siteScope } from "@/server/sites/get-site";
import { updateSite } from "@/server/sites/update-site";
import { updateSiteSchema } from "@/server/sites/site-schemas";

export const GET = apiRoute({ permission: "sites.read", params: siteParams, scope: ({ params }, tx) => siteScope(tx, params) }, async ({ tx, input }) =>
  getSiteDetail(tx, { siteId: input.params.siteId }),
);

export const PATCH = apiRoute(
  { permission: "sites.manage", params: siteParams, body: updateSiteSchema, scope: ({ params }, tx) => siteScope(tx, params) },
  async ({ tx, input, audit }) => {
    const { before, after } = await updateSite(tx, { siteId: input.params.siteId, input: input.body });
    await audit({ action: "site.update", entityType: "site", entityId: after.id, before, after });
    return { site: after };
  },
);
