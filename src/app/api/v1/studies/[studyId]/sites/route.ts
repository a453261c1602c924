// GET /api/v1/studies/:studyId/sites — the study's sites the caller may see
// POST /api/v1/studies/:studyId/sites — add a site (starts Proposed)
import { apiRoute } from "@/server/api/route";
import { studyParams } from "@/lib/api/schemas";
import { listSitesForStudy } from "@/server/studies/queries";
import { createSite } from "@/server/sites/create-site";
import { createSiteSchema } from "@/server/sites/site-schemas";

export const GET = apiRoute(
  { permission: "sites.read", params: studyParams, scope: ({ params }) => ({ studyId: params.studyId }), siteFiltered: true },
  async ({ tx, input, siteIds }) => ({ sites: await listSitesForStudy(tx, { studyId: input.params.studyId, siteIds }) }),
);

export const POST = apiRoute(
  { permission: "sites.manage", params: studyParams, body: createSiteSchema, scope: ({ params }) => ({ studyId: params.studyId }), status: 201 },
  async ({ tx, input, actor, audit }) => {
    const site = await createSite(tx, { studyId: input.params.studyId, input: input.body, actor });
    await audit({ action: "site.create", entityType: "site", entityId: site.id, siteId: site.id, after: site });
    return { site };
  },
);
