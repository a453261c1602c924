// GET /api/v1/studies/:studyId/reconciliation — earned, in a run, sent, paid, confirmed, queried, failed per site and currency
import { apiRoute } from "@/server/api/route";
import { studyParams } from "@/lib/api/schemas";
import { reconciliationQuery } from "@/lib/payments/schemas";
import { getReconciliation } from "@/server/payments/reconciliation";

export const GET = apiRoute(
  { permission: "payments.read", params: studyParams, query: reconciliationQuery, scope: ({ params }) => ({ studyId: params.studyId }), siteFiltered: true },
  async ({ tx, input, siteIds }) => {
    const only = input.query.siteId;
    const visible = only ? (siteIds === "all" || siteIds.includes(only) ? [only] : []) : siteIds;
    return getReconciliation(tx, { studyId: input.params.studyId, siteIds: visible, asOf: input.query.asOf ?? new Date().toISOString() });
  },
);
