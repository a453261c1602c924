// GET /api/v1/studies/:studyId/sites — the study's sites the caller may see
import { apiRoute } from "@/server/api/route";
import { studyParams } from "@/lib/api/schemas";
import { listSitesForStudy } from "@/server/studies/queries";

export const GET = apiRoute(
  { permission: "sites.read", params: studyParams, scope: ({ params }) => ({ studyId: params.studyId }), siteFiltered: true },
  async ({ tx, input, siteIds }) => ({ sites: await listSitesForStudy(tx, { studyId: input.params.studyId, siteIds }) }),
);
