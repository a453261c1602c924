// Payments test helpers: a private Stripe fake per test file (faults injected here never reach
// another file's calls), a webhook receiver that hands each delivery to Cairn's route handler, and
// a study with payable lines at sites in several currencies.
import http from "node:http";
import { randomUUID } from "node:crypto";
import Stripe from "stripe";
import { NextRequest } from "next/server";
import { eq } from "drizzle-orm";
import { startStripeFake, type StripeFakeHandle } from "../../../docker-free-fakes/stripe.mjs";
import { db } from "@/server/db/client";
import { budgetItems, budgetVersions, memberships, passThroughInvoices, paymentTransfers, siteBudgets, sites, siteStatusEvents, users } from "@/server/db/schema";
import { createOrRefreshPayeeAccount } from "@/server/payments/payee-accounts";
import { createPaymentRun, approvePaymentRun } from "@/server/payments/runs";
import { POST as webhookPost } from "@/app/api/v1/webhooks/stripe/route";
import { createStudyFixture, type StudyFixture } from "../../support/db";

export const WEBHOOK_SECRET = process.env.STRIPE_WEBHOOK_SECRET ?? "whsec_cairn_fake_secret";

export async function control<T = unknown>(fake: StripeFakeHandle, method: string, path: string, body?: unknown): Promise<T> {
  const res = await fetch(`${fake.url}${path}`, { method, headers: body ? { "content-type": "application/json" } : {}, body: body ? JSON.stringify(body) : undefined });
  const text = await res.text();
  if (!res.ok) throw new Error(`${method} ${path}: ${res.status} ${text}`);
  return (text ? JSON.parse(text) : null) as T;
}

/** A webhook receiver on a free port that calls the route handler exactly as Next.js would. */
export async function startWebhookBridge() {
  const statuses: number[] = [];
  const server = http.createServer((req, res) => {
    const chunks: Buffer[] = [];
    req.on("data", (c: Buffer) => chunks.push(c));
    req.on("end", async () => {
      const headers = new Headers();
      for (const [k, v] of Object.entries(req.headers)) if (typeof v === "string") headers.set(k, v);
      const r = await webhookPost(new NextRequest("http://127.0.0.1/api/v1/webhooks/stripe", { method: "POST", headers, body: Buffer.concat(chunks).toString("utf8") }));
      statuses.push(r.status);
      res.writeHead(r.status, { "content-type": "application/json" });
      res.end(await r.text());
    });
  });
  await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", resolve));
  const addr = server.address();
  const port = typeof addr === "object" && addr ? addr.port : 0;
  return { url: `http://127.0.0.1:${port}/hook`, statuses, close: () => new Promise<void>((r) => server.close(() => r())) };
}

export async function startPaymentsFake() {
  const bridge = await startWebhookBridge();
  const fake = await startStripeFake({
    port: 0,
    dataDir: null,
    webhookUrl: bridge.url,
    webhookSecret: WEBHOOK_SECRET,
    initialAccountState: "pending",
    autoDeliver: false,
    webhookMaxAttempts: 3,
    webhookRetryBaseMs: 20,
    webhookRetryMaxMs: 100,
    holdMs: 5_000,
    log: () => {},
  });
  const stripe = new Stripe("sk_test_cairn_payments", { host: "127.0.0.1", port: fake.port, protocol: "http", telemetry: false, maxNetworkRetries: 0, timeout: 1_000 });
  return {
    fake,
    stripe,
    bridge,
    flush: () => control<{ pending: number }>(fake, "POST", "/_fake/webhooks/flush"),
    close: async () => {
      await fake.close();
      await bridge.close();
    },
  };
}
export type PaymentsFake = Awaited<ReturnType<typeof startPaymentsFake>>;

type SiteSpec = { currency: string; timeZone: string; country: string; startupMinor: bigint; invoices?: bigint[] };

/** Give a site a budget (start-up fee; 25% overhead, 10% holdback), an activation date and invoices. */
export async function makeSitePayable(siteId: string, studyId: string, spec: SiteSpec) {
  const [budget] = await db.insert(siteBudgets).values({ studyId, siteId, currency: spec.currency }).returning();
  const [v] = await db
    .insert(budgetVersions)
    .values({ budgetId: budget!.id, siteId, versionNumber: 1, effectiveFrom: "2025-01-01", overheadBps: 2500, holdbackBps: 1000, cycle: "monthly", netDays: 30, trigger: "visit_completed", reason: "First budget" })
    .returning();
  await db.insert(budgetItems).values({ budgetVersionId: v!.id, kind: "startup", amountMinor: spec.startupMinor });
  await db.insert(siteStatusEvents).values({ siteId, fromStatus: "start_up", toStatus: "open", effectiveOn: "2025-02-10" });
  for (const [i, amount] of (spec.invoices ?? []).entries()) {
    await db.insert(passThroughInvoices).values({ studyId, siteId, description: `Ethics committee fee ${i + 1}`, amountMinor: amount, approvedOn: "2025-03-0" + ((i % 9) + 1) });
  }
}

export async function addSite(fx: StudyFixture, spec: SiteSpec & { code: string }) {
  const [s] = await db.insert(sites).values({ studyId: fx.study.id, code: spec.code, name: `Site ${spec.code}`, country: spec.country, timeZone: spec.timeZone, currency: spec.currency, status: "open" }).returning();
  await makeSitePayable(s!.id, fx.study.id, spec);
  return s!;
}

export async function verifiedPayee(pf: PaymentsFake, fx: StudyFixture, siteId: string) {
  const { after } = await createOrRefreshPayeeAccount(db, { studyId: fx.study.id, siteId, actorId: fx.userByRole.sponsor_finance.id, stripe: pf.stripe });
  await control(pf.fake, "POST", `/_fake/accounts/${after.stripeAccountId}/verification`, { state: "verified" });
  return (await createOrRefreshPayeeAccount(db, { studyId: fx.study.id, siteId, actorId: fx.userByRole.sponsor_finance.id, stripe: pf.stripe })).after;
}

/** A second sponsor finance person (four eyes). */
export async function secondSponsorFinance(fx: StudyFixture) {
  const [u] = await db.insert(users).values({ email: `payments2.${fx.tag}.${randomUUID().slice(0, 4)}@test.example`, name: "Second Approver" }).returning();
  await db.insert(memberships).values({ userId: u!.id, studyId: fx.study.id, siteId: null, role: "sponsor_finance" });
  return u!;
}

/** Study fixture with sites A (EUR) and B (JPY) payable and verified, plus a second approver. */
export async function paymentsFixture(pf: PaymentsFake) {
  const fx = await createStudyFixture();
  // Worked example (REFERENCES.md): EUR 1,234.56 fee + 25% overhead − 10% holdback = 1,388.88 net.
  await makeSitePayable(fx.siteA.id, fx.study.id, { currency: "EUR", timeZone: "Europe/Berlin", country: "DE", startupMinor: 123_456n, invoices: [45_000n] });
  await makeSitePayable(fx.siteB.id, fx.study.id, { currency: "JPY", timeZone: "Asia/Tokyo", country: "JP", startupMinor: 500_000n, invoices: [33_333n] });
  await verifiedPayee(pf, fx, fx.siteA.id);
  await verifiedPayee(pf, fx, fx.siteB.id);
  const approver = await secondSponsorFinance(fx);
  return { fx, approver };
}

export async function approvedRun(fx: StudyFixture, approverId: string, opts: { siteIds?: string[] } = {}) {
  const run = await db.transaction((tx) => createPaymentRun(tx, { studyId: fx.study.id, actorId: fx.userByRole.sponsor_finance.id, asOf: new Date().toISOString(), siteIds: opts.siteIds ?? null }));
  await db.transaction((tx) => approvePaymentRun(tx, { runId: run.id, actorId: approverId, contentHash: run.contentHash }));
  return run;
}

export async function transfersOfRun(runId: string) {
  return db.select().from(paymentTransfers).where(eq(paymentTransfers.runId, runId));
}

export type FakeTransfer = { id: string; amount: number; currency: string; destination: string; transfer_group: string | null; metadata: Record<string, string>; reversed: boolean };
export async function fakeTransfers(pf: PaymentsFake, runId: string): Promise<FakeTransfer[]> {
  const all = await control<FakeTransfer[]>(pf.fake, "GET", "/_fake/transfers");
  return all.filter((t) => t.transfer_group === `cairn-run-${runId}`);
}
