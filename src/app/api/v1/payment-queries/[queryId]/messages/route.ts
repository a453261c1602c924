// POST /api/v1/payment-queries/:queryId/messages — reply to a payment query, optionally resolving it
import { apiRoute } from "@/server/api/route";
import { queryParams, replyQueryBody } from "@/lib/payments/schemas";
import { rolesIn } from "@/lib/auth/authorize";
import { replyToPaymentQuery, scopeOfQuery } from "@/server/payments/queries";

export const POST = apiRoute(
  { permission: "payments.query", params: queryParams, body: replyQueryBody, scope: ({ params }, tx) => scopeOfQuery(tx, params.queryId), status: 201 },
  async ({ tx, input, actor, scope, audit }) => {
    const side = rolesIn(actor, scope.studyId, scope.siteId).includes("site_finance") ? "site" : "sponsor";
    const r = await replyToPaymentQuery(tx, { queryId: input.params.queryId, ...input.body, actorId: actor.userId, side });
    await audit({ action: input.body.resolve ? "payment.query.resolve" : "payment.query.reply", entityType: "payment_query", entityId: r.after.id, before: { state: r.before.state }, after: { state: r.after.state } });
    return { query: r.after };
  },
);
