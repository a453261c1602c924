import "server-only";
import { and, asc, desc, eq, inArray, sql } from "drizzle-orm";
import type { Tx } from "@/server/db/client";
import { payeeAccounts, paymentRunLines, paymentRuns, paymentTransfers, sites, users } from "@/server/db/schema";
import { AppError, conflict, notFound, unprocessable } from "@/server/api/errors";
import { groupBySiteAndCurrency, hashRunContent, transferIdempotencyKey } from "@/lib/payments/run-hash";
import { StripeAmountError, toStripeAmount } from "@/lib/payments/stripe-amount";
import { listDueLines } from "./due-lines";

export async function scopeOfRun(tx: Tx, runId: string) {
  const [run] = await tx.select({ studyId: paymentRuns.studyId }).from(paymentRuns).where(eq(paymentRuns.id, runId)).limit(1);
  if (!run) throw notFound("That payment run");
  return { studyId: run.studyId };
}

/**
 * Freeze the selected due lines into a new run. Lines are taken at their outstanding amount as the
 * schedule computes it now; the run's hash binds the lines and amounts the approver will see.
 */
export async function createPaymentRun(
  tx: Tx,
  {
    studyId,
    actorId,
    asOf,
    cycle,
    siteIds,
    currency,
    lineKeys,
    note,
  }: { studyId: string; actorId: string; asOf: string; cycle?: string | null; siteIds?: string[] | null; currency?: string | null; lineKeys?: string[] | null; note?: string },
) {
  const { lines: due } = await listDueLines(tx, { studyId, siteIds: siteIds?.length ? siteIds : "all", asOf, cycle, currency });
  const wanted = lineKeys?.length ? new Set(lineKeys) : null;
  const chosen = wanted ? due.filter((l) => wanted.has(l.key)) : due;
  if (wanted && chosen.length !== wanted.size) {
    const missing = [...wanted].filter((k) => !chosen.some((l) => l.key === k));
    throw unprocessable(`Some lines are not due or are already in a run: ${missing.slice(0, 5).join(", ")}`, { lineKeys: ["Not due, or already in a run"] });
  }
  if (chosen.length === 0) throw unprocessable("No due lines match this selection.", { cycle: ["No due lines"] });

  // Run numbers per study; the lock serialises two preparers so numbers never collide.
  await tx.execute(sql`select pg_advisory_xact_lock(hashtextextended(${`payment-run-number:${studyId}`}, 0))`);
  const [{ next } = { next: 1 }] = await tx
    .select({ next: sql<number>`coalesce(max(${paymentRuns.number}), 0) + 1` })
    .from(paymentRuns)
    .where(eq(paymentRuns.studyId, studyId));
  const [run] = await tx
    .insert(paymentRuns)
    .values({ studyId, number: Number(next), selection: { cycle: cycle ?? null, siteIds: siteIds ?? null, currency: currency ?? null }, note: note ?? "", contentHash: "pending", lineCount: chosen.length, preparedBy: actorId })
    .returning();
  const hash = hashRunContent(
    run!.id,
    chosen.map((l) => ({ lineKey: l.key, siteId: l.siteId, currency: l.currency, amountMinor: l.amountMinor })),
  );
  try {
    await tx.insert(paymentRunLines).values(
      chosen.map((l) => ({
        runId: run!.id,
        studyId,
        siteId: l.siteId,
        currency: l.currency,
        lineKey: l.key,
        kind: l.kind,
        description: l.description,
        serviceDate: l.serviceDate,
        dueDate: l.dueDate,
        cycle: l.cycle,
        amountMinor: l.amountMinor,
      })),
    );
  } catch (err) {
    if ((err as { cause?: { code?: string } }).cause?.code === "23505") throw conflict("Another run took some of these lines a moment ago. Reload the due lines.");
    throw err;
  }
  const [saved] = await tx.update(paymentRuns).set({ contentHash: hash }).where(eq(paymentRuns.id, run!.id)).returning();
  return saved!;
}

export async function getPaymentRun(tx: Tx, { runId, siteIds }: { runId: string; siteIds: "all" | string[] }) {
  const [run] = await tx.select().from(paymentRuns).where(eq(paymentRuns.id, runId)).limit(1);
  if (!run) throw notFound("That payment run");
  const siteFilter = siteIds === "all" ? undefined : inArray(paymentRunLines.siteId, siteIds.length ? siteIds : ["00000000-0000-4000-8000-000000000000"]);
  const lines = await tx
    .select()
    .from(paymentRunLines)
    .where(and(eq(paymentRunLines.runId, runId), siteFilter))
    .orderBy(asc(paymentRunLines.siteId), asc(paymentRunLines.serviceDate), asc(paymentRunLines.lineKey));
  const transfers = await tx
    .select({
      id: paymentTransfers.id,
      siteId: paymentTransfers.siteId,
      siteCode: sites.code,
      currency: paymentTransfers.currency,
      amountMinor: paymentTransfers.amountMinor,
      stripeAmount: paymentTransfers.stripeAmount,
      state: paymentTransfers.state,
      attempts: paymentTransfers.attempts,
      stripeTransferId: paymentTransfers.stripeTransferId,
      lastError: paymentTransfers.lastError,
      failureCode: paymentTransfers.failureCode,
      failureMessage: paymentTransfers.failureMessage,
      sentAt: paymentTransfers.sentAt,
      paidAt: paymentTransfers.paidAt,
      failedAt: paymentTransfers.failedAt,
    })
    .from(paymentTransfers)
    .innerJoin(sites, eq(sites.id, paymentTransfers.siteId))
    .where(and(eq(paymentTransfers.runId, runId), siteIds === "all" ? undefined : inArray(paymentTransfers.siteId, siteIds.length ? siteIds : ["00000000-0000-4000-8000-000000000000"])))
    .orderBy(asc(sites.code));
  const people = await tx
    .select({ id: users.id, name: users.name })
    .from(users)
    .where(inArray(users.id, [run.preparedBy, run.approvedBy, run.sendRequestedBy].filter((x): x is string => !!x)));
  const nameOf = (id: string | null) => (id ? (people.find((p) => p.id === id)?.name ?? null) : null);
  const siteRows = await tx.select({ id: sites.id, code: sites.code, name: sites.name }).from(sites).where(eq(sites.studyId, run.studyId));
  const progress = { total: transfers.length, done: transfers.filter((t) => t.state !== "queued" && t.state !== "sending").length, paid: transfers.filter((t) => t.state === "paid").length, failed: transfers.filter((t) => t.state === "failed" || t.state === "reversed").length };
  return { run: { ...run, preparedByName: nameOf(run.preparedBy), approvedByName: nameOf(run.approvedBy), sendRequestedByName: nameOf(run.sendRequestedBy) }, lines, transfers, progress, sites: siteRows };
}

export async function listPaymentRuns(tx: Tx, { studyId, siteIds }: { studyId: string; siteIds: "all" | string[] }) {
  const runs = await tx.select().from(paymentRuns).where(eq(paymentRuns.studyId, studyId)).orderBy(desc(paymentRuns.number));
  if (runs.length === 0) return [];
  const totals = await tx
    .select({
      runId: paymentRunLines.runId,
      currency: paymentRunLines.currency,
      amountMinor: sql<string>`sum(${paymentRunLines.amountMinor})::text`,
      lines: sql<number>`count(*)::int`,
      sites: sql<number>`count(distinct ${paymentRunLines.siteId})::int`,
      paid: sql<number>`count(*) filter (where ${paymentRunLines.state} = 'paid')::int`,
      failed: sql<number>`count(*) filter (where ${paymentRunLines.state} in ('failed', 'reversed'))::int`,
    })
    .from(paymentRunLines)
    .where(and(inArray(paymentRunLines.runId, runs.map((r) => r.id)), siteIds === "all" ? undefined : inArray(paymentRunLines.siteId, siteIds.length ? siteIds : ["00000000-0000-4000-8000-000000000000"])))
    .groupBy(paymentRunLines.runId, paymentRunLines.currency);
  const names = await tx.select({ id: users.id, name: users.name }).from(users).where(inArray(users.id, [...new Set(runs.flatMap((r) => [r.preparedBy, r.approvedBy].filter((x): x is string => !!x)))]));
  const nameOf = (id: string | null) => (id ? (names.find((n) => n.id === id)?.name ?? null) : null);
  return runs
    .map((r) => {
      const mine = totals.filter((t) => t.runId === r.id);
      return {
        id: r.id,
        number: r.number,
        state: r.state,
        preparedBy: nameOf(r.preparedBy),
        preparedAt: r.preparedAt,
        approvedBy: nameOf(r.approvedBy),
        approvedAt: r.approvedAt,
        lineCount: mine.reduce((n, t) => n + t.lines, 0),
        siteCount: Math.max(0, ...mine.map((t) => t.sites)),
        paidLines: mine.reduce((n, t) => n + t.paid, 0),
        failedLines: mine.reduce((n, t) => n + t.failed, 0),
        amounts: mine.map((t) => ({ currency: t.currency, amountMinor: BigInt(t.amountMinor) })),
      };
    })
    .filter((r) => siteIds === "all" || r.lineCount > 0);
}

/** Recompute the hash from the stored lines: what is about to be approved or sent is what was frozen. */
async function verifyRunHash(tx: Tx, run: { id: string; contentHash: string }) {
  const lines = await tx.select().from(paymentRunLines).where(eq(paymentRunLines.runId, run.id));
  const hash = hashRunContent(run.id, lines);
  if (hash !== run.contentHash) throw conflict("This run's lines no longer match what was prepared. It cannot be approved or sent.");
  return lines;
}

/** Four eyes: a sponsor finance person who did not prepare the run approves the hash they saw. */
export async function approvePaymentRun(tx: Tx, { runId, actorId, contentHash }: { runId: string; actorId: string; contentHash: string }) {
  const [run] = await tx.select().from(paymentRuns).where(eq(paymentRuns.id, runId)).for("update").limit(1);
  if (!run) throw notFound("That payment run");
  if (run.preparedBy === actorId) throw new AppError("forbidden", "You prepared this run: a different sponsor finance person must approve it.");
  if (run.state !== "prepared") {
    if (run.state === "cancelled") throw conflict("This run was cancelled.");
    return { before: run, after: run, changed: false };
  }
  if (contentHash !== run.contentHash) throw conflict("The run changed since you opened it. Reload and review it again.");
  await verifyRunHash(tx, run);
  const [after] = await tx.update(paymentRuns).set({ state: "approved", approvedBy: actorId, approvedAt: new Date() }).where(eq(paymentRuns.id, runId)).returning();
  return { before: run, after: after!, changed: true };
}

/**
 * Ask the worker to send an approved run: one transfer row per site and currency, each with its
 * idempotency key. Repeats (double clicks, other tabs) find the rows and change nothing.
 */
export async function requestSendPaymentRun(tx: Tx, { runId, actorId }: { runId: string; actorId: string }) {
  const [run] = await tx.select().from(paymentRuns).where(eq(paymentRuns.id, runId)).for("update").limit(1);
  if (!run) throw notFound("That payment run");
  if (run.state === "prepared") throw conflict("A second sponsor finance person must approve this run before it is sent.");
  if (run.state === "cancelled") throw conflict("This run was cancelled.");
  if (run.state === "sending" || run.state === "sent") return { before: run, after: run, changed: false, transfers: 0 };
  const lines = await verifyRunHash(tx, run);
  const groups = groupBySiteAndCurrency(lines);
  const accounts = await tx.select().from(payeeAccounts).where(inArray(payeeAccounts.siteId, groups.map((g) => g.siteId)));
  const siteRows = await tx.select({ id: sites.id, code: sites.code }).from(sites).where(inArray(sites.id, groups.map((g) => g.siteId)));
  const unverified = groups.filter((g) => accounts.find((a) => a.siteId === g.siteId)?.state !== "verified").map((g) => siteRows.find((s) => s.id === g.siteId)?.code ?? g.siteId);
  if (unverified.length) throw unprocessable(`No payment goes to a site whose payee account is not verified: ${[...new Set(unverified)].join(", ")}.`);
  const values = groups.map((g) => ({
    runId,
    studyId: run.studyId,
    siteId: g.siteId,
    currency: g.currency,
    amountMinor: g.amountMinor,
    stripeAmount: stripeAmountOrRefuse(g.amountMinor, g.currency),
    destinationAccountId: accounts.find((a) => a.siteId === g.siteId)!.stripeAccountId,
    idempotencyKey: transferIdempotencyKey(runId, g.siteId, g.currency),
  }));
  const inserted = await tx.insert(paymentTransfers).values(values).onConflictDoNothing().returning({ id: paymentTransfers.id, siteId: paymentTransfers.siteId, currency: paymentTransfers.currency });
  for (const t of inserted) {
    await tx
      .update(paymentRunLines)
      .set({ transferId: t.id, updatedAt: new Date() })
      .where(and(eq(paymentRunLines.runId, runId), eq(paymentRunLines.siteId, t.siteId), eq(paymentRunLines.currency, t.currency)));
  }
  const [after] = await tx.update(paymentRuns).set({ state: "sending", sendRequestedBy: actorId, sendRequestedAt: new Date() }).where(eq(paymentRuns.id, runId)).returning();
  return { before: run, after: after!, changed: true, transfers: inserted.length };
}

/**
 * Withdraw a run nobody has approved yet: its lines are released (due again) and the run stays
 * listed as cancelled. The audit event keeps the lines it held. An approved run cannot be cancelled.
 */
export async function cancelPaymentRun(tx: Tx, { runId, actorId }: { runId: string; actorId: string }) {
  const [run] = await tx.select().from(paymentRuns).where(eq(paymentRuns.id, runId)).for("update").limit(1);
  if (!run) throw notFound("That payment run");
  if (run.state === "cancelled") return { before: run, after: run, lines: [], changed: false };
  if (run.state !== "prepared") throw conflict("Only a run that is not yet approved can be cancelled.");
  const lines = await tx.delete(paymentRunLines).where(eq(paymentRunLines.runId, runId)).returning();
  const [after] = await tx.update(paymentRuns).set({ state: "cancelled", cancelledBy: actorId, cancelledAt: new Date() }).where(eq(paymentRuns.id, runId)).returning();
  return { before: run, after: after!, lines, changed: true };
}

function stripeAmountOrRefuse(amountMinor: bigint, currency: string): bigint {
  try {
    return toStripeAmount(amountMinor, currency);
  } catch (err) {
    if (err instanceof StripeAmountError) throw unprocessable(err.message);
    throw err;
  }
}
