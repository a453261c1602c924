// Faults: with about 30% of Stripe calls failing (before or after taking effect) or timing out,
// every transfer ends in a definite state and nothing is paid twice (the fake's own record).
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eq, inArray } from "drizzle-orm";
import { db } from "@/server/db/client";
import { paymentRunLines } from "@/server/db/schema";
import { sendQueuedTransfers } from "@/server/payments/send-transfers";
import { requestSendPaymentRun } from "@/server/payments/runs";
import { createStudyFixture } from "../../support/db";
import { addSite, approvedRun, control, fakeTransfers, secondSponsorFinance, startPaymentsFake, transfersOfRun, verifiedPayee, type PaymentsFake } from "./helpers";
import { seededRandom } from "../../../scripts/lib/seeded-random";

let pf: PaymentsFake;
beforeAll(async () => {
  pf = await startPaymentsFake();
});
afterAll(async () => pf?.close());

// A small seeded generator (mulberry32), so a failing run can be repeated.
const prng = seededRandom;

describe("sending through a faulty Stripe", () => {
  it("ends every line sent or failed, with exactly one transfer per site and currency", async () => {
    const fx = await createStudyFixture();
    const specs = [
      { code: "EUR", currency: "EUR", timeZone: "Europe/Berlin", country: "DE", startupMinor: 200_000n, invoices: [12_345n, 6_789n] },
      { code: "JPY", currency: "JPY", timeZone: "Asia/Tokyo", country: "JP", startupMinor: 800_000n, invoices: [55_555n] },
      { code: "GBP", currency: "GBP", timeZone: "Europe/London", country: "GB", startupMinor: 150_000n },
      { code: "CHF", currency: "CHF", timeZone: "Europe/Zurich", country: "CH", startupMinor: 175_000n, invoices: [9_900n] },
      { code: "SEK", currency: "SEK", timeZone: "Europe/Stockholm", country: "SE", startupMinor: 1_900_000n },
      { code: "USD", currency: "USD", timeZone: "America/New_York", country: "US", startupMinor: 210_000n },
      { code: "US2", currency: "USD", timeZone: "America/Chicago", country: "US", startupMinor: 99_999n },
      { code: "JP2", currency: "JPY", timeZone: "Asia/Tokyo", country: "JP", startupMinor: 333_333n },
    ];
    const siteIds: string[] = [];
    for (const s of specs) {
      const site = await addSite(fx, { ...s, code: `${s.code}${fx.tag.slice(0, 3)}`.toUpperCase() });
      siteIds.push(site.id);
      await verifiedPayee(pf, fx, site.id);
    }
    const approver = await secondSponsorFinance(fx);
    const run = await approvedRun(fx, approver.id, { siteIds });
    await db.transaction((tx) => requestSendPaymentRun(tx, { runId: run.id, actorId: fx.userByRole.sponsor_finance.id }));
    const expected = await transfersOfRun(run.id);
    expect(expected).toHaveLength(specs.length);

    const random = prng(20261201);
    let faults = 0;
    let passes = 0;
    for (; passes < 400; passes++) {
      const open = (await transfersOfRun(run.id)).filter((t) => t.state === "queued" || t.state === "sending");
      if (open.length === 0) break;
      // ~30% of calls get a fault: a 500 before or after the call took effect, or no answer at all.
      if (random() < 0.3) {
        faults++;
        const r = random();
        if (r < 0.35) await control(pf.fake, "POST", "/_fake/faults/fail-next", { count: 1, after: false });
        else if (r < 0.7) await control(pf.fake, "POST", "/_fake/faults/fail-next", { count: 1, after: true });
        else if (r < 0.85) await control(pf.fake, "POST", "/_fake/faults/timeout-next", { count: 1, after: false });
        else await control(pf.fake, "POST", "/_fake/faults/timeout-next", { count: 1, after: true });
      }
      await sendQueuedTransfers({ stripe: pf.stripe, runId: run.id, limit: 1, noBackoff: true, leaseMs: 1_500 });
      // A held (timed-out) call keeps its lease a moment; let it run out.
      if ((await transfersOfRun(run.id)).some((t) => t.state === "sending")) await new Promise((r) => setTimeout(r, 1_600));
    }
    await control(pf.fake, "DELETE", "/_fake/faults");
    expect(faults).toBeGreaterThan(0);

    const mine = await transfersOfRun(run.id);
    expect(mine.every((t) => t.state === "sent" || t.state === "failed"), JSON.stringify(mine.map((t) => [t.state, t.lastError]))).toBe(true);
    const lines = await db.select().from(paymentRunLines).where(eq(paymentRunLines.runId, run.id));
    expect(lines.every((l) => l.state === "sent" || l.state === "failed")).toBe(true);

    // Nothing paid twice: at most one Stripe transfer per (destination, currency), with the frozen amount.
    const atStripe = await fakeTransfers(pf, run.id);
    const keys = atStripe.map((t) => `${t.destination}|${t.currency}`);
    expect(new Set(keys).size).toBe(keys.length);
    for (const t of mine.filter((x) => x.state === "sent")) {
      const s = atStripe.find((x) => x.id === t.stripeTransferId)!;
      expect(s.amount).toBe(Number(t.stripeAmount));
      expect(s.metadata.cairn_transfer_id).toBe(t.id);
    }
    // A transfer marked failed must not exist at Stripe.
    for (const t of mine.filter((x) => x.state === "failed")) expect(atStripe.some((s) => s.metadata.cairn_transfer_id === t.id)).toBe(false);
    expect(atStripe).toHaveLength(mine.filter((t) => t.state === "sent").length);

    // Stripe's events then mark them paid; failed lines are due again (in no live run).
    await pf.flush();
    const after = await transfersOfRun(run.id);
    expect(after.filter((t) => t.state === "paid")).toHaveLength(mine.filter((t) => t.state === "sent").length);
    const failedKeys = lines.filter((l) => l.state === "failed").map((l) => l.lineKey);
    if (failedKeys.length) {
      const live = await db.select().from(paymentRunLines).where(inArray(paymentRunLines.lineKey, failedKeys));
      expect(live.every((l) => l.state === "failed")).toBe(true);
    }
  }, 180_000);

  it("a declined transfer fails with Stripe's reason and its lines are due again", async () => {
    const fx = await createStudyFixture();
    const site = await addSite(fx, { code: `DC${fx.tag.slice(0, 3)}`.toUpperCase(), currency: "EUR", timeZone: "Europe/Paris", country: "FR", startupMinor: 100_000n });
    await verifiedPayee(pf, fx, site.id);
    const approver = await secondSponsorFinance(fx);
    const run = await approvedRun(fx, approver.id, { siteIds: [site.id] });
    await db.transaction((tx) => requestSendPaymentRun(tx, { runId: run.id, actorId: fx.userByRole.sponsor_finance.id }));
    await control(pf.fake, "POST", "/_fake/faults/decline-next-transfer", { count: 1, code: "balance_insufficient", message: "Insufficient funds in the platform balance." });
    const [out] = await sendQueuedTransfers({ stripe: pf.stripe, runId: run.id });
    expect(out!.outcome).toBe("failed");
    const [t] = await transfersOfRun(run.id);
    expect(t!.state).toBe("failed");
    expect(t!.failureCode).toBe("balance_insufficient");
    const lines = await db.select().from(paymentRunLines).where(eq(paymentRunLines.runId, run.id));
    expect(lines.every((l) => l.state === "failed" && /Insufficient funds/.test(l.stateReason ?? ""))).toBe(true);
    expect(await fakeTransfers(pf, run.id)).toHaveLength(0);
    // Due again: a new run can take the same lines.
    const again = await approvedRun(fx, approver.id, { siteIds: [site.id] });
    const againLines = await db.select().from(paymentRunLines).where(eq(paymentRunLines.runId, again.id));
    expect(againLines.map((l) => l.lineKey).sort()).toEqual(lines.map((l) => l.lineKey).sort());
  });
});
