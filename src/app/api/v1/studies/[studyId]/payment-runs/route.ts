// GET /api/v1/studies/:studyId/payment-runs — the study's payment runs (site people see their sites' part)
// POST /api/v1/studies/:studyId/payment-runs — freeze selected due lines into a new run
import { apiRoute } from "@/server/api/route";
import { studyParams } from "@/lib/api/schemas";
import { createRunBody } from "@/lib/payments/schemas";
import { createPaymentRun, listPaymentRuns } from "@/server/payments/runs";

export const GET = apiRoute(
  { permission: "payments.read", params: studyParams, scope: ({ params }) => ({ studyId: params.studyId }), siteFiltered: true },
  async ({ tx, input, siteIds }) => ({ runs: await listPaymentRuns(tx, { studyId: input.params.studyId, siteIds }) }),
);

export const POST = apiRoute(
  { permission: "payments.prepare", params: studyParams, body: createRunBody, scope: ({ params }) => ({ studyId: params.studyId }), status: 201 },
  async ({ tx, input, actor, audit }) => {
    const b = input.body;
    const run = await createPaymentRun(tx, {
      studyId: input.params.studyId,
      actorId: actor.userId,
      asOf: b.asOf ?? new Date().toISOString(),
      cycle: b.cycle,
      siteIds: b.siteIds,
      currency: b.currency,
      lineKeys: b.lineKeys,
      note: b.note,
    });
    await audit({ action: "payment.run.prepare", entityType: "payment_run", entityId: run.id, after: run });
    return { run };
  },
);
