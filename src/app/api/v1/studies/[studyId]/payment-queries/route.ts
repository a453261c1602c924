// GET /api/v1/studies/:studyId/payment-queries — payment queries with their messages (site people see their sites')
import { apiRoute } from "@/server/api/route";
import { studyParams } from "@/lib/api/schemas";
import { listPaymentQueries } from "@/server/payments/queries";

export const GET = apiRoute(
  { permission: "payments.read", params: studyParams, scope: ({ params }) => ({ studyId: params.studyId }), siteFiltered: true },
  async ({ tx, input, siteIds }) => ({ queries: await listPaymentQueries(tx, { studyId: input.params.studyId, siteIds }) }),
);
