// GET /api/v1/studies/:studyId/acknowledgements — compliance matrix (version × site × investigator); POST — sign an acknowledgement
import { apiRoute } from "@/server/api/route";
import { studyParams } from "@/lib/api/schemas";
import { matrixQuery, signBody } from "@/lib/acknowledgements/api-schemas";
import { countByState, listAcknowledgementMatrix } from "@/server/acknowledgements/list-matrix";
import { signAcknowledgement } from "@/server/acknowledgements/sign-acknowledgement";

export const GET = apiRoute(
  { permission: "acknowledgement.read", params: studyParams, query: matrixQuery, siteFiltered: true, scope: ({ params, query }) => ({ studyId: params.studyId, siteId: query.siteId }) },
  async ({ tx, input, siteIds }) => {
    const rows = await listAcknowledgementMatrix(tx, { studyId: input.params.studyId, siteIds, ...input.query });
    return { rows, counts: countByState(rows) };
  },
);

export const POST = apiRoute(
  { permission: "acknowledgement.sign", params: studyParams, body: signBody, scope: ({ params, body }) => ({ studyId: params.studyId, siteId: body.siteId }), status: 201 },
  async ({ tx, input, actor, audit, req }) => {
    const ip = req.headers.get("x-forwarded-for")?.split(",")[0]?.trim() ?? null;
    const signature = await signAcknowledgement(tx, actor, { studyId: input.params.studyId, ...input.body, ip });
    await audit({ action: "acknowledgement.signed", entityType: "electronic_signature", entityId: signature.id, after: signature });
    return { signature };
  },
);
