// GET /api/v1/studies/:studyId/ledger/projection — 12-month projection with its 80% band, and paid/due/projected cash flow
import { apiRoute } from "@/server/api/route";
import { studyParams } from "@/lib/api/schemas";
import { asOfQuery } from "@/lib/budgets/api-schemas";
import { getProjection } from "@/server/ledger/get-projection";

export const GET = apiRoute(
  { permission: "ledger.read", params: studyParams, query: asOfQuery, siteFiltered: true, scope: ({ params }) => ({ studyId: params.studyId }) },
  async ({ tx, input, siteIds }) => getProjection(tx, { studyId: input.params.studyId, siteIds, asOf: input.query.asOf }),
);
