// GET /api/v1/sites/:siteId/budget — a site's budget and every version; POST — first version or an amendment
import { z } from "zod";
import { apiRoute } from "@/server/api/route";
import { siteParams } from "@/lib/api/schemas";
import { notFound } from "@/server/api/errors";
import { scopeOfSite } from "@/server/budgets/site-scope";
import { getSiteBudget } from "@/server/budgets/queries";
import { createBudgetVersion } from "@/server/budgets/save-budget-version";

export const GET = apiRoute(
  { permission: "budget.read", params: siteParams, scope: ({ params }, tx) => scopeOfSite(tx, params.siteId) },
  async ({ tx, input }) => {
    const budget = await getSiteBudget(tx, { siteId: input.params.siteId });
    if (!budget) throw notFound("That site");
    return budget;
  },
);

export const POST = apiRoute(
  // The body is validated in the domain function against the site's currency (minor units differ).
  { permission: "budget.write", params: siteParams, body: z.record(z.string(), z.unknown()), scope: ({ params }, tx) => scopeOfSite(tx, params.siteId), status: 201 },
  async ({ tx, input, actor, audit }) => {
    const { budget, version, previous } = await createBudgetVersion(tx, { siteId: input.params.siteId, body: input.body, actorId: actor.userId });
    await audit({
      action: previous ? "budget.amended" : "budget.created",
      entityType: "budget_version",
      entityId: version.id,
      before: previous ? { versionNumber: previous.versionNumber, effectiveFrom: previous.effectiveFrom } : null,
      after: { budgetId: budget.id, versionNumber: version.versionNumber, effectiveFrom: version.effectiveFrom, items: input.body },
    });
    return { budget, version };
  },
);
