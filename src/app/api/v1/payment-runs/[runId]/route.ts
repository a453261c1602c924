// GET /api/v1/payment-runs/:runId — a run, its frozen lines and its transfers' progress
import { apiRoute } from "@/server/api/route";
import { runParams } from "@/lib/payments/schemas";
import { getPaymentRun, scopeOfRun } from "@/server/payments/runs";

export const GET = apiRoute(
  { permission: "payments.read", params: runParams, scope: ({ params }, tx) => scopeOfRun(tx, params.runId), siteFiltered: true },
  async ({ tx, input, siteIds }) => getPaymentRun(tx, { runId: input.params.runId, siteIds }),
);
