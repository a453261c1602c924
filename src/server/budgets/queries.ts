import "server-only";
import { and, asc, eq, inArray } from "drizzle-orm";
import type { Tx } from "@/server/db/client";
import { budgetItems, budgetVersions, siteBudgets, sites, type BudgetItemRow, type BudgetVersionRow } from "@/server/db/schema";

export type BudgetVersionWithItems = BudgetVersionRow & { items: BudgetItemRow[] };

/** Versions (oldest first) with their items, for the given sites. */
export async function listBudgetVersions(tx: Tx, { siteIds }: { siteIds: readonly string[] }): Promise<BudgetVersionWithItems[]> {
  if (siteIds.length === 0) return [];
  const versions = await tx
    .select()
    .from(budgetVersions)
    .where(inArray(budgetVersions.siteId, [...siteIds]))
    .orderBy(asc(budgetVersions.siteId), asc(budgetVersions.effectiveFrom), asc(budgetVersions.versionNumber));
  if (versions.length === 0) return [];
  const items = await tx.select().from(budgetItems).where(inArray(budgetItems.budgetVersionId, versions.map((v) => v.id)));
  const byVersion = new Map<string, BudgetItemRow[]>();
  for (const i of items) {
    const list = byVersion.get(i.budgetVersionId) ?? [];
    list.push(i);
    byVersion.set(i.budgetVersionId, list);
  }
  return versions.map((v) => ({ ...v, items: byVersion.get(v.id) ?? [] }));
}

/** A site's budget with every version, or null when none was made yet. */
export async function getSiteBudget(tx: Tx, { siteId }: { siteId: string }) {
  const [row] = await tx
    .select({ budget: siteBudgets, site: { id: sites.id, code: sites.code, name: sites.name, currency: sites.currency, timeZone: sites.timeZone, studyId: sites.studyId } })
    .from(sites)
    .leftJoin(siteBudgets, eq(siteBudgets.siteId, sites.id))
    .where(eq(sites.id, siteId))
    .limit(1);
  if (!row) return null;
  const versions = row.budget ? await listBudgetVersions(tx, { siteIds: [siteId] }) : [];
  return { site: row.site, budget: row.budget, versions };
}

/** Each visible site of a study with its budget's latest version (if any). */
export async function listStudyBudgets(tx: Tx, { studyId, siteIds }: { studyId: string; siteIds: "all" | string[] }) {
  const siteRows = await tx
    .select({ id: sites.id, code: sites.code, name: sites.name, currency: sites.currency, status: sites.status, budgetId: siteBudgets.id })
    .from(sites)
    .leftJoin(siteBudgets, eq(siteBudgets.siteId, sites.id))
    .where(and(eq(sites.studyId, studyId), siteIds === "all" ? undefined : inArray(sites.id, siteIds.length ? siteIds : ["00000000-0000-4000-8000-000000000000"])))
    .orderBy(asc(sites.code));
  const versions = await listBudgetVersions(tx, { siteIds: siteRows.filter((s) => s.budgetId).map((s) => s.id) });
  return siteRows.map((s) => {
    const mine = versions.filter((v) => v.siteId === s.id);
    return { site: s, versionCount: mine.length, latest: mine[mine.length - 1] ?? null };
  });
}

