// Demo payments of KESTREL-VP through the local Stripe fake: a connected account per site (ES01
// still pending), run 1 paid to the sites with lines due (DE01 and GB01 confirmed, JP01 waiting
// for confirmation with an open query), run 2 to CH01 failed and its lines re-sent and paid in
// run 3, and run 4 to US01 prepared and awaiting a second approver. Paid lines are recorded in
// payments_recorded (reference "cairn-transfer:<id>") as the app does.
// Every figure is invented. Runs without the app (plain tsx), so it writes rows directly.
import Stripe from "stripe";
import { and, eq, inArray } from "drizzle-orm";
import {
  budgetItems,
  budgetVersions,
  memberships,
  passThroughInvoices,
  payeeAccounts,
  paymentConfirmations,
  paymentQueries,
  paymentQueryMessages,
  paymentRunLines,
  paymentRuns,
  paymentsRecorded,
  paymentTransfers,
  sites,
  siteStatusEvents,
  studies,
  subjects,
  users,
  visitRecords,
} from "../../src/server/db/schema";
import { buildSnapshot } from "../../src/lib/ledger/build-snapshot";
import { computePaymentSchedule, localDate, type EarnedLine } from "../../src/lib/payment-schedule";
import { groupBySiteAndCurrency, hashRunContent, transferIdempotencyKey } from "../../src/lib/payments/run-hash";
import { toStripeAmount } from "../../src/lib/payments/stripe-amount";
import { payeeStateOf } from "../../src/server/payments/payee-state";
import { demoStudy } from "./demo-data";
import type { SeedContext } from "./context";

const DEMO_TODAY = "2026-12-01";

export async function seedPayments({ db, log }: SeedContext) {
  const [study] = await db.select().from(studies).where(eq(studies.code, demoStudy.code)).limit(1);
  if (!study) return;
  const [existing] = await db.select({ id: paymentRuns.id }).from(paymentRuns).where(eq(paymentRuns.studyId, study.id)).limit(1);
  if (existing) {
    log("payments: already seeded");
    return;
  }
  const host = process.env.STRIPE_API_HOST || "127.0.0.1";
  const port = Number(process.env.STRIPE_API_PORT ?? 12111);
  const protocol = (process.env.STRIPE_API_PROTOCOL as "http" | "https" | undefined) ?? "http";
  const stripe = new Stripe(process.env.STRIPE_SECRET_KEY ?? "sk_test_cairn_fake", { host, port, protocol, maxNetworkRetries: 2, telemetry: false, timeout: 5_000 });
  const control = async (path: string, body: unknown) => {
    const res = await fetch(`${protocol}://${host}:${port}/_fake${path}`, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify(body) });
    if (!res.ok) throw new Error(`Stripe fake ${path}: ${res.status}`);
  };
  try {
    await stripe.balance.retrieve();
  } catch (err) {
    log(`payments: Stripe is not reachable (${(err as Error).message}); skipped`);
    return;
  }

  const siteRows = await db.select().from(sites).where(eq(sites.studyId, study.id));
  const byCode = new Map(siteRows.map((s) => [s.code, s]));
  const person = async (email: string) => (await db.select().from(users).where(eq(users.email, email)).limit(1))[0]!;
  const preparer = await person("payments@kestrel-vp.example");
  const approver = await person("payments2@kestrel-vp.example");
  const financeOf = async (siteId: string) =>
    (await db.select({ id: users.id }).from(memberships).innerJoin(users, eq(users.id, memberships.userId)).where(and(eq(memberships.siteId, siteId), eq(memberships.role, "site_finance"))).limit(1))[0];

  // Connected accounts: created through the SDK, verified through the fake's control API.
  for (const s of siteRows) {
    const account = await stripe.accounts.create(
      { type: "custom", country: s.country, metadata: { cairn_site_id: s.id, cairn_study_id: study.id, cairn_site_code: s.code }, capabilities: { transfers: { requested: true } } },
      { idempotencyKey: `cairn-account-${s.id}` },
    );
    if (s.code !== "ES01") await control(`/accounts/${account.id}/verification`, { state: "verified" });
    const { state, reason } = payeeStateOf(await stripe.accounts.retrieve(account.id));
    await db.insert(payeeAccounts).values({ studyId: study.id, siteId: s.id, stripeAccountId: account.id, state, stateReason: reason, createdBy: preparer.id }).onConflictDoNothing();
  }
  const accounts = await db.select().from(payeeAccounts).where(eq(payeeAccounts.studyId, study.id));

  // The schedule as the app computes it: recorded payments applied.
  const ids = siteRows.map((s) => s.id);
  const versions = await db.select().from(budgetVersions).where(inArray(budgetVersions.siteId, ids));
  const items = versions.length ? await db.select().from(budgetItems).where(inArray(budgetItems.budgetVersionId, versions.map((v) => v.id))) : [];
  const steps = await db.select({ siteId: siteStatusEvents.siteId, status: siteStatusEvents.toStatus, on: siteStatusEvents.effectiveOn }).from(siteStatusEvents).where(inArray(siteStatusEvents.siteId, ids));
  const subjectRows = await db.select().from(subjects).where(eq(subjects.studyId, study.id));
  const visitRows = await db
    .select({ id: visitRecords.id, subjectId: visitRecords.subjectId, visitCode: visitRecords.visitCode, outcome: visitRecords.outcome, actualDate: visitRecords.actualDate, dataEnteredOn: visitRecords.dataEnteredOn, verifiedOn: visitRecords.verifiedOn })
    .from(visitRecords)
    .innerJoin(subjects, eq(subjects.id, visitRecords.subjectId))
    .where(eq(subjects.studyId, study.id));
  const invoices = await db.select().from(passThroughInvoices).where(eq(passThroughInvoices.studyId, study.id));
  const recorded = await db.select({ siteId: paymentsRecorded.siteId, lineKey: paymentsRecorded.lineKey, amountMinor: paymentsRecorded.amountMinor, paidOn: paymentsRecorded.paidOn }).from(paymentsRecorded).where(eq(paymentsRecorded.studyId, study.id));
  const schedule = computePaymentSchedule(
    buildSnapshot({ asOf: DEMO_TODAY, sites: siteRows, siteSteps: steps, versions: versions.map((v) => ({ ...v, items: items.filter((i) => i.budgetVersionId === v.id) })), invoices, subjects: subjectRows, visits: visitRows, payments: recorded }),
  );
  // Lines due by today; for a site with none, the next cycle's lines.
  const dueAt = (code: string) => {
    const open = schedule.lines.filter((l) => l.siteId === byCode.get(code)?.id && l.outstandingMinor > 0n && (l.state === "overdue" || l.state === "outstanding"));
    const due = open.filter((l) => l.dueDate <= DEMO_TODAY);
    if (due.length) return due;
    const next = open.map((l) => l.cycle.label).sort()[0];
    return open.filter((l) => l.cycle.label === next);
  };

  const describe = (l: EarnedLine) => {
    const who = l.source.subjectCode ? ` ${l.source.subjectCode}` : "";
    if (l.source.description) return l.source.description;
    if (l.kind === "visit") return `Visit ${l.source.visitCode ?? ""}${who}`;
    if (l.kind === "milestone") return `Milestone ${(l.source.milestone ?? "").replaceAll("_", " ")}${l.source.n ? ` (${l.source.n})` : ""}`;
    if (l.kind === "startup") return "Start-up fee";
    if (l.kind === "screen_failure") return `Screen failure${who}`;
    return l.kind.replaceAll("_", " ");
  };
  let number = 0;
  const makeRun = async (lines: EarnedLine[], state: "prepared" | "approved", preparedBy: string, approvedBy: string | null, preparedAt: Date) => {
    number += 1;
    const [run] = await db.insert(paymentRuns).values({ studyId: study.id, number, contentHash: "pending", lineCount: lines.length, preparedBy, preparedAt, note: "Demo run" }).returning();
    const frozen = lines.map((l) => ({ lineKey: l.key, siteId: l.siteId, currency: l.currency, amountMinor: l.outstandingMinor }));
    await db.insert(paymentRunLines).values(
      lines.map((l) => ({ runId: run!.id, studyId: study.id, siteId: l.siteId, currency: l.currency, lineKey: l.key, kind: l.kind, description: describe(l), serviceDate: l.serviceDate, dueDate: l.dueDate, cycle: l.cycle.label, amountMinor: l.outstandingMinor })),
    );
    await db.update(paymentRuns).set({ contentHash: hashRunContent(run!.id, frozen), ...(state === "approved" ? { state, approvedBy, approvedAt: new Date(preparedAt.getTime() + 3_600_000) } : {}) }).where(eq(paymentRuns.id, run!.id));
    return { run: run!, frozen };
  };
  const send = async ({ run, frozen }: Awaited<ReturnType<typeof makeRun>>, at: Date) => {
    await db.update(paymentRuns).set({ state: "sending", sendRequestedBy: preparer.id, sendRequestedAt: at }).where(eq(paymentRuns.id, run.id));
    const out: (typeof paymentTransfers.$inferSelect)[] = [];
    for (const g of groupBySiteAndCurrency(frozen)) {
      const destination = accounts.find((a) => a.siteId === g.siteId)!.stripeAccountId;
      const [t] = await db
        .insert(paymentTransfers)
        .values({ runId: run.id, studyId: study.id, siteId: g.siteId, currency: g.currency, amountMinor: g.amountMinor, stripeAmount: toStripeAmount(g.amountMinor, g.currency), destinationAccountId: destination, idempotencyKey: transferIdempotencyKey(run.id, g.siteId, g.currency), attempts: 1 })
        .returning();
      const tr = await stripe.transfers.create(
        { amount: Number(t!.stripeAmount), currency: g.currency.toLowerCase(), destination, transfer_group: `cairn-run-${run.id}`, description: `Cairn payment run ${run.id}`, metadata: { cairn_transfer_id: t!.id, cairn_run_id: run.id, cairn_site_id: g.siteId, cairn_study_id: study.id } },
        { idempotencyKey: t!.idempotencyKey },
      );
      // Stripe's transfer.created event confirms it: paid.
      const [paid] = await db.update(paymentTransfers).set({ stripeTransferId: tr.id, state: "paid", sentAt: at, paidAt: at }).where(eq(paymentTransfers.id, t!.id)).returning();
      const paidLines = await db.update(paymentRunLines).set({ transferId: t!.id, state: "paid" }).where(and(eq(paymentRunLines.runId, run.id), eq(paymentRunLines.siteId, g.siteId), eq(paymentRunLines.currency, g.currency))).returning();
      const zone = siteRows.find((x) => x.id === g.siteId)?.timeZone ?? "UTC";
      await db.insert(paymentsRecorded).values(paidLines.map((l) => ({ studyId: study.id, siteId: g.siteId, lineKey: l.lineKey, amountMinor: l.amountMinor, paidOn: localDate(at.toISOString(), zone), reference: `cairn-transfer:${t!.id}`, recordedBy: preparer.id })));
      out.push(paid!);
    }
    await db.update(paymentRuns).set({ state: "sent" }).where(eq(paymentRuns.id, run.id));
    return out;
  };

  // Run 1: the sites with lines due (CH01 and US01 have their own runs below, ES01 is not verified).
  const run1 = await makeRun(["DE01", "NL01", "GB01", "JP01"].flatMap((c) => dueAt(c).filter((l) => l.dueDate <= DEMO_TODAY)), "approved", preparer.id, approver.id, new Date("2026-11-09T09:00:00Z"));
  const paid1 = await send(run1, new Date("2026-11-10T10:00:00Z"));
  const t = (code: string) => paid1.find((p) => p.siteId === byCode.get(code)?.id);
  for (const [code, receivedOn, ref] of [
    ["DE01", "2026-11-12", "DE-SPK-20261112-0042"],
    ["GB01", "2026-11-13", "GB-FPS-7731"],
  ] as const) {
    const tr = t(code);
    const fin = byCode.get(code) && (await financeOf(byCode.get(code)!.id));
    if (tr && fin) await db.insert(paymentConfirmations).values({ transferId: tr.id, studyId: study.id, siteId: tr.siteId, receivedOn, amountMinor: tr.amountMinor, bankReference: ref, confirmedBy: fin.id });
  }
  const jp = t("JP01");
  const jpFinance = byCode.get("JP01") && (await financeOf(byCode.get("JP01")!.id));
  if (jp && jpFinance) {
    const [q] = await db.insert(paymentQueries).values({ studyId: study.id, siteId: jp.siteId, transferId: jp.id, subject: "Which visits does this payment cover?", raisedBy: jpFinance.id }).returning();
    await db.insert(paymentQueryMessages).values({ queryId: q!.id, authorId: jpFinance.id, side: "site", body: "Our statement shows one amount. Please confirm which subject visits it covers so we can book it." });
  }

  // Run 2: CH01, failed after creation (account closed); run 3 re-sends the same lines and is paid.
  const chLines = dueAt("CH01");
  if (chLines.length) {
    const run2 = await makeRun(chLines, "approved", preparer.id, approver.id, new Date("2026-11-16T09:00:00Z"));
    const [sent2] = await send(run2, new Date("2026-11-17T10:00:00Z"));
    if (sent2) {
      await control(`/transfers/${sent2.stripeTransferId}/fail`, { code: "account_closed", message: "The destination bank account was closed." });
      const reason = "Transfer failed: The destination bank account was closed.";
      await db.update(paymentTransfers).set({ state: "failed", failedAt: new Date("2026-11-18T08:00:00Z"), failureCode: "account_closed", failureMessage: "The destination bank account was closed." }).where(eq(paymentTransfers.id, sent2.id));
      await db.update(paymentRunLines).set({ state: "failed", stateReason: reason }).where(eq(paymentRunLines.transferId, sent2.id));
      await db.delete(paymentsRecorded).where(eq(paymentsRecorded.reference, `cairn-transfer:${sent2.id}`));
      const run3 = await makeRun(chLines, "approved", preparer.id, approver.id, new Date("2026-11-23T09:00:00Z"));
      await send(run3, new Date("2026-11-24T10:00:00Z"));
    }
  }

  // Run 4: US01, prepared by the second officer, waiting for the first to approve it.
  const usLines = dueAt("US01");
  if (usLines.length) await makeRun(usLines, "prepared", approver.id, null, new Date("2026-11-30T15:00:00Z"));
  log(`payments: ${accounts.length} payee accounts, ${number} runs (CH01 failed and re-sent, JP01 query open, US01 awaiting approval)`);
}
