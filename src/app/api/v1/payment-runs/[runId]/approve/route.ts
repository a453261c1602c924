// POST /api/v1/payment-runs/:runId/approve — a second sponsor finance person approves the run's content hash
import { apiRoute } from "@/server/api/route";
import { approveRunBody, runParams } from "@/lib/payments/schemas";
import { approvePaymentRun, scopeOfRun } from "@/server/payments/runs";

export const POST = apiRoute(
  { permission: "payments.approve", params: runParams, body: approveRunBody, scope: ({ params }, tx) => scopeOfRun(tx, params.runId) },
  async ({ tx, input, actor, audit, unchanged }) => {
    const r = await approvePaymentRun(tx, { runId: input.params.runId, actorId: actor.userId, contentHash: input.body.contentHash });
    if (r.changed) await audit({ action: "payment.run.approve", entityType: "payment_run", entityId: r.after.id, before: { state: r.before.state }, after: { state: r.after.state, contentHash: r.after.contentHash } });
    else unchanged();
    return { run: r.after };
  },
);
