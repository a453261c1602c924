import "server-only";
import { and, desc, eq } from "drizzle-orm";
import type { Tx } from "@/server/db/client";
import { budgetItems, budgetVersions, protocolVersions, siteBudgets, sites, siteVersionApprovals } from "@/server/db/schema";
import { conflict, notFound, unprocessable, validationError } from "@/server/api/errors";
import { budgetVersionInputSchema, type BudgetVersionInput } from "@/lib/budgets";
import { computePaymentSchedule } from "@/lib/payment-schedule";
import { loadScheduleSnapshot } from "@/server/ledger/load-snapshot";

type ItemInsert = typeof budgetItems.$inferInsert;

function itemsOf(versionId: string, v: BudgetVersionInput): ItemInsert[] {
  return [
    { budgetVersionId: versionId, kind: "startup", amountMinor: v.startupFee },
    { budgetVersionId: versionId, kind: "screen_failure", amountMinor: v.screenFailureFee },
    ...v.milestones.map((m) => ({ budgetVersionId: versionId, kind: "milestone" as const, milestone: m.kind, n: m.n ?? null, amountMinor: m.amount })),
    ...v.visitFees.map((f) => ({ budgetVersionId: versionId, kind: "visit" as const, visitCode: f.visitCode, amountMinor: f.amount })),
  ];
}

async function loadSite(tx: Tx, siteId: string) {
  const [site] = await tx.select().from(sites).where(eq(sites.id, siteId)).limit(1);
  if (!site) throw notFound("That site");
  return site;
}

/** Validate the raw body against the site's currency; resolve the effective date of a protocol-driven amendment. */
async function parseInput(tx: Tx, site: { id: string; studyId: string; currency: string }, raw: unknown): Promise<BudgetVersionInput & { effectiveFrom: string }> {
  const parsed = budgetVersionInputSchema(site.currency).safeParse(raw);
  if (!parsed.success) throw validationError(parsed.error, "budget");
  const input = parsed.data;
  let effectiveFrom = input.effectiveFrom ?? null;
  if (input.protocolVersionId) {
    const [approval] = await tx
      .select({ approvedOn: siteVersionApprovals.approvedOn, label: protocolVersions.versionLabel })
      .from(protocolVersions)
      .leftJoin(siteVersionApprovals, and(eq(siteVersionApprovals.versionId, protocolVersions.id), eq(siteVersionApprovals.siteId, site.id)))
      .where(and(eq(protocolVersions.id, input.protocolVersionId), eq(protocolVersions.studyId, site.studyId)))
      .limit(1);
    if (!approval) throw unprocessable("That protocol version is not part of this study.", { protocolVersionId: ["Unknown protocol version"] });
    if (!approval.approvedOn) throw unprocessable(`The site's ethics committee has not approved protocol ${approval.label} yet: record the approval first.`, { protocolVersionId: ["Not approved at this site yet"] });
    // An amendment that follows a protocol amendment applies from the site's approval date of it.
    if (effectiveFrom && effectiveFrom !== approval.approvedOn) {
      throw unprocessable(`A budget amendment that follows protocol ${approval.label} takes effect on the site's approval date, ${approval.approvedOn}.`, { effectiveFrom: [`Use ${approval.approvedOn}`] });
    }
    effectiveFrom = approval.approvedOn;
  }
  return { ...input, effectiveFrom: effectiveFrom! };
}

function versionValues(input: BudgetVersionInput & { effectiveFrom: string }) {
  return {
    effectiveFrom: input.effectiveFrom,
    protocolVersionId: input.protocolVersionId ?? null,
    reason: input.reason,
    screenFailureCapPerEnrolled: input.screenFailureCapPerEnrolled ?? null,
    screenFailureCapMax: input.screenFailureCapMax ?? null,
    overheadBps: input.overheadPercent,
    holdbackBps: input.holdbackPercent,
    cycle: input.cycle,
    netDays: input.netDays,
    trigger: input.trigger,
  };
}

/**
 * A site's first budget, or an amendment: a new version effective from a later date than every
 * existing one (earlier lines keep the version they were earned under).
 */
export async function createBudgetVersion(tx: Tx, { siteId, body, actorId }: { siteId: string; body: unknown; actorId: string }) {
  const site = await loadSite(tx, siteId);
  const input = await parseInput(tx, site, body);
  let [budget] = await tx.select().from(siteBudgets).where(eq(siteBudgets.siteId, siteId)).limit(1);
  if (!budget) {
    [budget] = await tx.insert(siteBudgets).values({ studyId: site.studyId, siteId, currency: site.currency, createdBy: actorId }).returning();
  } else if (budget.currency !== site.currency) {
    throw conflict(`The budget is in ${budget.currency} but the site now uses ${site.currency}.`);
  }
  const [latest] = await tx.select().from(budgetVersions).where(eq(budgetVersions.budgetId, budget!.id)).orderBy(desc(budgetVersions.versionNumber)).limit(1);
  if (latest && input.effectiveFrom <= latest.effectiveFrom) {
    throw conflict(`An amendment must take effect after version ${latest.versionNumber} (effective ${latest.effectiveFrom}).`);
  }
  const [version] = await tx
    .insert(budgetVersions)
    .values({ budgetId: budget!.id, siteId, versionNumber: (latest?.versionNumber ?? 0) + 1, ...versionValues(input), createdBy: actorId })
    .returning();
  await tx.insert(budgetItems).values(itemsOf(version!.id, input));
  return { budget: budget!, version: version!, previous: latest ?? null };
}

/** Lines earned under a version as of now (the engine run for the site). */
async function linesEarnedUnder(tx: Tx, { studyId, siteId, versionId }: { studyId: string; siteId: string; versionId: string }): Promise<number> {
  const { snapshot } = await loadScheduleSnapshot(tx, { studyId, siteIds: [siteId], asOf: new Date().toISOString() });
  return computePaymentSchedule(snapshot).lines.filter((l) => l.budgetVersionId === versionId).length;
}

/** Correct a version in place: only while no line was earned under it; otherwise amend. */
export async function updateBudgetVersion(tx: Tx, { siteId, versionNumber, body }: { siteId: string; versionNumber: number; body: unknown }) {
  const site = await loadSite(tx, siteId);
  const [before] = await tx.select().from(budgetVersions).where(and(eq(budgetVersions.versionNumber, versionNumber), eq(budgetVersions.siteId, siteId))).limit(1);
  if (!before) throw notFound("That budget version");
  const versionId = before.id;
  const input = await parseInput(tx, site, body);
  // Lock the version row so two edits or an edit and an amendment do not interleave.
  await tx.select({ id: budgetVersions.id }).from(budgetVersions).where(eq(budgetVersions.id, versionId)).for("update");
  const earned = await linesEarnedUnder(tx, { studyId: site.studyId, siteId, versionId });
  if (earned > 0) throw conflict(`Version ${before.versionNumber} has ${earned} earned line${earned === 1 ? "" : "s"}: it can no longer be changed. Make an amendment instead.`);
  const others = await tx.select().from(budgetVersions).where(eq(budgetVersions.budgetId, before.budgetId));
  for (const o of others) {
    if (o.id === versionId) continue;
    if (o.versionNumber < before.versionNumber && input.effectiveFrom <= o.effectiveFrom) throw conflict(`Version ${before.versionNumber} must take effect after version ${o.versionNumber} (${o.effectiveFrom}).`);
    if (o.versionNumber > before.versionNumber && input.effectiveFrom >= o.effectiveFrom) throw conflict(`Version ${before.versionNumber} must take effect before version ${o.versionNumber} (${o.effectiveFrom}).`);
  }
  const [after] = await tx.update(budgetVersions).set(versionValues(input)).where(eq(budgetVersions.id, versionId)).returning();
  await tx.delete(budgetItems).where(eq(budgetItems.budgetVersionId, versionId));
  await tx.insert(budgetItems).values(itemsOf(versionId, input));
  return { before, after: after! };
}
