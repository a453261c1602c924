// GET /api/v1/studies/:studyId/ledger/summary — totals by site and currency, converted into the reporting currency
import { apiRoute } from "@/server/api/route";
import { studyParams } from "@/lib/api/schemas";
import { asOfQuery } from "@/lib/budgets/api-schemas";
import { getStudySummary } from "@/server/ledger/get-study-summary";

export const GET = apiRoute(
  { permission: "ledger.read", params: studyParams, query: asOfQuery, siteFiltered: true, scope: ({ params }) => ({ studyId: params.studyId }) },
  async ({ tx, input, siteIds }) => getStudySummary(tx, { studyId: input.params.studyId, siteIds, asOf: input.query.asOf }),
);
