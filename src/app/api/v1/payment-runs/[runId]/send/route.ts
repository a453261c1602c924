// POST /api/v1/payment-runs/:runId/send — queue an approved run's transfers for the worker (repeats change nothing)
import { apiRoute } from "@/server/api/route";
import { runParams } from "@/lib/payments/schemas";
import { requestSendPaymentRun, scopeOfRun } from "@/server/payments/runs";

export const POST = apiRoute(
  { permission: "payments.prepare", params: runParams, scope: ({ params }, tx) => scopeOfRun(tx, params.runId), status: 202 },
  async ({ tx, input, actor, audit, unchanged }) => {
    const r = await requestSendPaymentRun(tx, { runId: input.params.runId, actorId: actor.userId });
    if (r.changed) await audit({ action: "payment.run.send", entityType: "payment_run", entityId: r.after.id, before: { state: r.before.state }, after: { state: r.after.state, transfers: r.transfers } });
    else unchanged();
    return { run: r.after, queued: r.transfers };
  },
);
