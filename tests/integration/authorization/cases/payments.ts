import { randomUUID } from "node:crypto";
import { beforeEach } from "vitest";
import { db } from "@/server/db/client";
import { memberships, payeeAccounts, paymentQueries, paymentQueryMessages, paymentRunLines, paymentRuns, paymentTransfers, users } from "@/server/db/schema";
import { eq } from "drizzle-orm";
import { hashRunContent, transferIdempotencyKey } from "@/lib/payments/run-hash";
import type { StudyFixture } from "../../../support/db";
import type { RouteCase } from "../route-case";

// Payments routes address runs, payments and queries by id, so each fixture gets a few of its own:
// a prepared run and an approved one (prepared by a third person, so the fixture's sponsor finance
// may approve), a paid payment to site A and an open query at site A. They are made once per
// fixture, before the first signed-in call (the first call of each case is the signed-out one).

type Made = { preparedRunId: string; preparedHash: string; approvedRunId: string; cancelRunId: string; transferId: string; queryId: string };
const made = new Map<string, Made>();
let lastFx: StudyFixture | null = null;
const NONE = "00000000-0000-4000-8000-000000000000";

async function makeRun(fx: StudyFixture, preparerId: string, number: number, lineKey: string, finalState: "prepared" | "approved" | "sent") {
  const [run] = await db.insert(paymentRuns).values({ studyId: fx.study.id, number, contentHash: "pending", lineCount: 1, preparedBy: preparerId }).returning();
  const line = { lineKey, siteId: fx.siteA.id, currency: "EUR", amountMinor: 10_000n };
  await db.insert(paymentRunLines).values({ runId: run!.id, studyId: fx.study.id, ...line, kind: "pass_through", description: "Ethics committee fee", serviceDate: "2025-03-01", dueDate: "2025-04-30", cycle: "2025-03" });
  const hash = hashRunContent(run!.id, [line]);
  await db.update(paymentRuns).set({ contentHash: hash, state: finalState, ...(finalState !== "prepared" ? { approvedBy: fx.userByRole.sponsor_finance.id, approvedAt: new Date() } : {}) }).where(eq(paymentRuns.id, run!.id));
  return { id: run!.id, hash };
}

async function makeData(fx: StudyFixture): Promise<Made> {
  const [preparer] = await db.insert(users).values({ email: `preparer.${fx.tag}@test.example`, name: "Run Preparer" }).returning();
  await db.insert(memberships).values({ userId: preparer!.id, studyId: fx.study.id, siteId: null, role: "sponsor_finance" });
  await db.insert(payeeAccounts).values({ studyId: fx.study.id, siteId: fx.siteA.id, stripeAccountId: `acct_case_${fx.tag}`, state: "verified" });
  const prepared = await makeRun(fx, preparer!.id, 9001, `case:${fx.tag}:1`, "prepared");
  const approved = await makeRun(fx, preparer!.id, 9002, `case:${fx.tag}:2`, "approved");
  const paidRun = await makeRun(fx, preparer!.id, 9003, `case:${fx.tag}:3`, "sent");
  const toCancel = await makeRun(fx, preparer!.id, 9004, `case:${fx.tag}:4`, "prepared");
  const [t] = await db
    .insert(paymentTransfers)
    .values({ runId: paidRun.id, studyId: fx.study.id, siteId: fx.siteA.id, currency: "EUR", amountMinor: 10_000n, stripeAmount: 10_000n, destinationAccountId: `acct_case_${fx.tag}`, idempotencyKey: transferIdempotencyKey(paidRun.id, fx.siteA.id, "EUR"), stripeTransferId: `tr_case_${fx.tag}`, state: "paid", sentAt: new Date(), paidAt: new Date() })
    .returning();
  await db.update(paymentRunLines).set({ transferId: t!.id, state: "paid" }).where(eq(paymentRunLines.runId, paidRun.id));
  const [q] = await db.insert(paymentQueries).values({ studyId: fx.study.id, siteId: fx.siteA.id, transferId: t!.id, subject: "Amount differs", raisedBy: fx.userByRole.site_finance.id }).returning();
  await db.insert(paymentQueryMessages).values({ queryId: q!.id, authorId: fx.userByRole.site_finance.id, side: "site", body: "Our bank shows less." });
  return { preparedRunId: prepared.id, preparedHash: prepared.hash, approvedRunId: approved.id, cancelRunId: toCancel.id, transferId: t!.id, queryId: q!.id };
}

beforeEach(async () => {
  if (lastFx && !made.has(lastFx.tag)) made.set(lastFx.tag, await makeData(lastFx));
});

const data = (fx: StudyFixture): Made => {
  lastFx = fx;
  return made.get(fx.tag) ?? { preparedRunId: NONE, preparedHash: "0".repeat(64), approvedRunId: NONE, cancelRunId: NONE, transferId: NONE, queryId: NONE };
};

const readers = ["sponsor_admin", "site_finance", "sponsor_finance", "auditor"] as const;

export const cases: RouteCase[] = [
  { name: "payee accounts", route: "studies/[studyId]/payee-accounts", method: "GET", params: (fx) => (data(fx), { studyId: fx.study.id }), allow: [...readers], allowSiteB: ["site_finance"] },
  {
    name: "create or refresh a payee account",
    route: "studies/[studyId]/payee-accounts",
    method: "POST",
    params: (fx) => (data(fx), { studyId: fx.study.id }),
    body: (fx) => ({ siteId: fx.siteB.id }),
    allow: ["sponsor_finance"],
  },
  { name: "payment runs", route: "studies/[studyId]/payment-runs", method: "GET", params: (fx) => (data(fx), { studyId: fx.study.id }), allow: [...readers], allowSiteB: ["site_finance"] },
  {
    name: "prepare a payment run",
    route: "studies/[studyId]/payment-runs",
    method: "POST",
    params: (fx) => (data(fx), { studyId: fx.study.id }),
    body: () => ({ lineKeys: [`no-such-line:${randomUUID()}`] }),
    allow: ["sponsor_finance"],
  },
  { name: "due lines", route: "studies/[studyId]/payment-runs/due-lines", method: "GET", params: (fx) => (data(fx), { studyId: fx.study.id }), allow: ["sponsor_finance"] },
  { name: "a payment run and its progress", route: "payment-runs/[runId]", method: "GET", params: (fx) => ({ runId: data(fx).approvedRunId }), allow: [...readers], allowSiteB: ["site_finance"] },
  {
    name: "approve a payment run (four eyes)",
    route: "payment-runs/[runId]/approve",
    method: "POST",
    params: (fx) => ({ runId: data(fx).preparedRunId }),
    body: (fx) => ({ contentHash: data(fx).preparedHash }),
    allow: ["sponsor_finance"],
  },
  { name: "cancel a run not yet approved", route: "payment-runs/[runId]/cancel", method: "POST", params: (fx) => ({ runId: data(fx).cancelRunId }), allow: ["sponsor_finance"] },
  { name: "send an approved run", route: "payment-runs/[runId]/send", method: "POST", params: (fx) => ({ runId: data(fx).approvedRunId }), allow: ["sponsor_finance"] },
  { name: "reconciliation", route: "studies/[studyId]/reconciliation", method: "GET", params: (fx) => (data(fx), { studyId: fx.study.id }), allow: [...readers], allowSiteB: ["site_finance"] },
  { name: "payment queries", route: "studies/[studyId]/payment-queries", method: "GET", params: (fx) => (data(fx), { studyId: fx.study.id }), allow: [...readers], allowSiteB: ["site_finance"] },
  {
    name: "confirm receipt of a site A payment (site B's finance may not)",
    route: "sites/[siteId]/payment-confirmations",
    method: "POST",
    params: (fx) => (data(fx), { siteId: fx.siteA.id }),
    body: (fx) => ({ transferId: data(fx).transferId, receivedOn: "2025-05-02", amount: "100.00", bankReference: "BANK-REF-1" }),
    allow: ["site_finance"],
  },
  {
    name: "raise a query on a site A payment (site B's finance may not)",
    route: "sites/[siteId]/payment-queries",
    method: "POST",
    params: (fx) => (data(fx), { siteId: fx.siteA.id }),
    body: (fx) => ({ transferId: data(fx).transferId, subject: "Which visits?", message: "Which visits does this payment cover?" }),
    allow: ["site_finance", "sponsor_finance"],
  },
  {
    name: "reply to a site A payment query",
    route: "payment-queries/[queryId]/messages",
    method: "POST",
    params: (fx) => ({ queryId: data(fx).queryId }),
    body: () => ({ message: "See the remittance advice." }),
    allow: ["site_finance", "sponsor_finance"],
  },
  { name: "remittance advice of a site A payment", route: "payments/[transferId]/remittance", method: "GET", params: (fx) => ({ transferId: data(fx).transferId }), query: () => ({ format: "csv" }), allow: [...readers] },
  { name: "Stripe webhook (signature, not session)", route: "webhooks/stripe", method: "POST", body: () => ({ id: "evt_forged", type: "transfer.created" }), allow: "public" },
];
