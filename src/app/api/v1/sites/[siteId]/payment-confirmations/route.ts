// POST /api/v1/sites/:siteId/payment-confirmations — site finance confirms a payment arrived (date, amount, bank reference)
import { apiRoute } from "@/server/api/route";
import { siteParams } from "@/lib/api/schemas";
import { confirmReceiptBody } from "@/lib/payments/schemas";
import { scopeOfPayeeSite } from "@/server/payments/scopes";
import { confirmPaymentReceipt } from "@/server/payments/confirmations";

export const POST = apiRoute(
  { permission: "payments.confirm", params: siteParams, body: confirmReceiptBody, scope: ({ params }, tx) => scopeOfPayeeSite(tx, params.siteId), status: 201 },
  async ({ tx, input, actor, audit }) => {
    const confirmation = await confirmPaymentReceipt(tx, { siteId: input.params.siteId, ...input.body, actorId: actor.userId });
    await audit({ action: "payment.receipt.confirm", entityType: "payment_transfer", entityId: confirmation.transferId, after: confirmation });
    return { confirmation };
  },
);
