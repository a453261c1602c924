// POST /api/v1/payment-runs/:runId/cancel — withdraw a run not yet approved; its lines are due again
import { apiRoute } from "@/server/api/route";
import { runParams } from "@/lib/payments/schemas";
import { cancelPaymentRun, scopeOfRun } from "@/server/payments/runs";

export const POST = apiRoute(
  { permission: "payments.prepare", params: runParams, scope: ({ params }, tx) => scopeOfRun(tx, params.runId) },
  async ({ tx, input, actor, audit, unchanged }) => {
    const r = await cancelPaymentRun(tx, { runId: input.params.runId, actorId: actor.userId });
    if (r.changed) await audit({ action: "payment.run.cancel", entityType: "payment_run", entityId: r.after.id, before: { state: r.before.state, lines: r.lines.map((l) => ({ lineKey: l.lineKey, siteId: l.siteId, amountMinor: l.amountMinor })) }, after: { state: r.after.state } });
    else unchanged();
    return { run: r.after };
  },
);
