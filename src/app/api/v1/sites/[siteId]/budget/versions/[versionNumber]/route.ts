// PUT /api/v1/sites/:siteId/budget/versions/:versionNumber — correct a version no line was earned under yet
import { z } from "zod";
import { apiRoute } from "@/server/api/route";
import { budgetVersionParams } from "@/lib/budgets/api-schemas";
import { scopeOfSite } from "@/server/budgets/site-scope";
import { updateBudgetVersion } from "@/server/budgets/save-budget-version";

export const PUT = apiRoute(
  { permission: "budget.write", params: budgetVersionParams, body: z.record(z.string(), z.unknown()), scope: ({ params }, tx) => scopeOfSite(tx, params.siteId) },
  async ({ tx, input, audit }) => {
    const { before, after } = await updateBudgetVersion(tx, { siteId: input.params.siteId, versionNumber: input.params.versionNumber, body: input.body });
    await audit({ action: "budget.corrected", entityType: "budget_version", entityId: after.id, before, after: { ...after, items: input.body } });
    return { version: after };
  },
);
