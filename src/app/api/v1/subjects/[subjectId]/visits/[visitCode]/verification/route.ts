// POST /api/v1/subjects/:subjectId/visits/:visitCode/verification — the monitor verifies a visit against source
import { apiRoute } from "@/server/api/route";
import { subjectScope } from "@/server/subjects/load-subject";
import { verifyVisit } from "@/server/visits/verify-visit";
import { verifyVisitSchema, visitParams } from "@/server/visits/visit-schemas";

export const POST = apiRoute(
  { permission: "visits.verify", params: visitParams, body: verifyVisitSchema, scope: ({ params }, tx) => subjectScope(tx, params) },
  async ({ tx, input, actor, audit }) => {
    const { before, after } = await verifyVisit(tx, { ...input.params, verifiedOn: input.body.verifiedOn, actor });
    await audit({ action: "visit.verify", entityType: "visit_record", entityId: after.id, before, after });
    return { visit: after };
  },
);
