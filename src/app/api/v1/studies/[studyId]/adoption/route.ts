// GET /api/v1/studies/:studyId/adoption — released versions × sites with approval dates; POST — record a site's ethics approval
import { apiRoute } from "@/server/api/route";
import { studyParams } from "@/lib/api/schemas";
import { adoptionQuery, recordApprovalBody } from "@/lib/acknowledgements/api-schemas";
import { listAdoptionMatrix } from "@/server/adoption/list-adoption";
import { recordSiteApproval } from "@/server/adoption/record-approval";

export const GET = apiRoute(
  { permission: "adoption.read", params: studyParams, query: adoptionQuery, siteFiltered: true, scope: ({ params, query }) => ({ studyId: params.studyId, siteId: query.siteId }) },
  async ({ tx, input, siteIds }) => listAdoptionMatrix(tx, { studyId: input.params.studyId, siteIds: input.query.siteId ? [input.query.siteId] : siteIds }),
);

export const POST = apiRoute(
  { permission: "adoption.record", params: studyParams, body: recordApprovalBody, scope: ({ params, body }) => ({ studyId: params.studyId, siteId: body.siteId }), status: 201 },
  async ({ tx, input, actor, audit }) => {
    const { approval, version, site, letter } = await recordSiteApproval(tx, { studyId: input.params.studyId, ...input.body, recordedBy: actor.userId });
    await audit({
      action: "adoption.recorded",
      entityType: "site_version_approval",
      entityId: approval.id,
      after: { siteCode: site.code, versionLabel: version.versionLabel, approvedOn: approval.approvedOn, letterDocumentId: letter.id, letterSha256: letter.sha256, recordedAt: approval.recordedAt },
    });
    return { approval };
  },
);
