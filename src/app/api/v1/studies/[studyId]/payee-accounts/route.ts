// GET /api/v1/studies/:studyId/payee-accounts — each site's connected account and its verification state
// POST /api/v1/studies/:studyId/payee-accounts — create a site's connected account in Stripe, or read its state again
import { apiRoute } from "@/server/api/route";
import { studyParams } from "@/lib/api/schemas";
import { payeeAccountBody } from "@/lib/payments/schemas";
import { createOrRefreshPayeeAccount, listPayeeAccounts } from "@/server/payments/payee-accounts";

export const GET = apiRoute(
  { permission: "payments.read", params: studyParams, scope: ({ params }) => ({ studyId: params.studyId }), siteFiltered: true },
  async ({ tx, input, siteIds }) => ({ accounts: await listPayeeAccounts(tx, { studyId: input.params.studyId, siteIds }) }),
);

export const POST = apiRoute(
  { permission: "payments.prepare", params: studyParams, body: payeeAccountBody, scope: ({ params }) => ({ studyId: params.studyId }) },
  async ({ tx, input, actor, audit }) => {
    const { before, after } = await createOrRefreshPayeeAccount(tx, { studyId: input.params.studyId, siteId: input.body.siteId, actorId: actor.userId });
    await audit({ action: before ? "payment.payee.refresh" : "payment.payee.create", entityType: "payee_account", entityId: after.id, siteId: after.siteId, before, after });
    return { account: after };
  },
);
