// GET /api/v1/studies/:studyId/budgets — each visible site with its budget's latest version
import { apiRoute } from "@/server/api/route";
import { studyParams } from "@/lib/api/schemas";
import { listStudyBudgets } from "@/server/budgets/queries";

export const GET = apiRoute(
  { permission: "budget.read", params: studyParams, siteFiltered: true, scope: ({ params }) => ({ studyId: params.studyId }) },
  async ({ tx, input, siteIds }) => ({ budgets: await listStudyBudgets(tx, { studyId: input.params.studyId, siteIds }) }),
);
