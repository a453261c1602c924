// POST /api/v1/sites/:siteId/payment-queries — raise a query on a payment, a line, or the site's payments in general
import { apiRoute } from "@/server/api/route";
import { siteParams } from "@/lib/api/schemas";
import { raiseQueryBody } from "@/lib/payments/schemas";
import { rolesIn } from "@/lib/auth/authorize";
import { scopeOfPayeeSite } from "@/server/payments/scopes";
import { raisePaymentQuery } from "@/server/payments/queries";

export const POST = apiRoute(
  { permission: "payments.query", params: siteParams, body: raiseQueryBody, scope: ({ params }, tx) => scopeOfPayeeSite(tx, params.siteId), status: 201 },
  async ({ tx, input, actor, scope, audit }) => {
    const side = rolesIn(actor, scope.studyId, input.params.siteId).includes("site_finance") ? "site" : "sponsor";
    const query = await raisePaymentQuery(tx, { studyId: scope.studyId, siteId: input.params.siteId, ...input.body, actorId: actor.userId, side });
    await audit({ action: "payment.query.raise", entityType: "payment_query", entityId: query.id, after: query });
    return { query };
  },
);
