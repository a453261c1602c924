// Exactly once: many send requests and workers for one approved run, with a worker that dies
// between Stripe's answer and the database update, make one transfer per site and currency —
// counted in the Stripe fake's own record.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { db } from "@/server/db/client";
import { paymentRunLines, paymentRuns } from "@/server/db/schema";
import { sendQueuedTransfers } from "@/server/payments/send-transfers";
import { POST as sendRoute } from "@/app/api/v1/payment-runs/[runId]/send/route";
import { callRoute } from "../../support/api";
import { approvedRun, fakeTransfers, paymentsFixture, startPaymentsFake, transfersOfRun, type PaymentsFake } from "./helpers";

let pf: PaymentsFake;
beforeAll(async () => {
  pf = await startPaymentsFake();
});
afterAll(async () => pf?.close());

describe("one transfer per site and currency, whatever happens", () => {
  it("20 concurrent send requests, 20 concurrent workers and a crash mid-send create exactly one transfer per site and currency", async () => {
    const { fx, approver } = await paymentsFixture(pf);
    const run = await approvedRun(fx, approver.id);

    const responses = await Promise.all(
      Array.from({ length: 20 }, () => callRoute(sendRoute, { method: "POST", params: { runId: run.id }, userId: fx.userByRole.sponsor_finance.id, path: `/api/v1/payment-runs/${run.id}/send` })),
    );
    expect(responses.map((r) => r.status)).toEqual(Array(20).fill(202));
    expect(responses.reduce((n, r) => n + (r.json.queued as number), 0)).toBe(2); // EUR at A, JPY at B: queued once

    // The first worker dies after Stripe made each transfer but before recording it.
    const crashed = await sendQueuedTransfers({
      stripe: pf.stripe,
      runId: run.id,
      leaseMs: 50,
      afterStripeCall: () => {
        throw new Error("worker killed");
      },
    });
    expect(crashed.map((c) => c.outcome)).toEqual(["crashed", "crashed"]);
    expect(await fakeTransfers(pf, run.id)).toHaveLength(2);
    await new Promise((r) => setTimeout(r, 80)); // the lease runs out

    // Everyone tries at once now: more send requests and 20 workers.
    const [again, workers] = await Promise.all([
      Promise.all(Array.from({ length: 5 }, () => callRoute(sendRoute, { method: "POST", params: { runId: run.id }, userId: fx.userByRole.sponsor_finance.id }))),
      Promise.all(Array.from({ length: 20 }, () => sendQueuedTransfers({ stripe: pf.stripe, runId: run.id }))),
    ]);
    expect(again.every((r) => r.status === 202 && r.json.queued === 0)).toBe(true);
    expect(workers.flat().filter((o) => o.outcome === "sent")).toHaveLength(2);

    const atStripe = await fakeTransfers(pf, run.id);
    const mine = await transfersOfRun(run.id);
    expect(atStripe).toHaveLength(2);
    expect(new Set(atStripe.map((t) => `${t.destination}|${t.currency}`)).size).toBe(2);
    expect(mine.map((t) => t.state).sort()).toEqual(["sent", "sent"]);
    expect(mine.map((t) => t.stripeTransferId).sort()).toEqual(atStripe.map((t) => t.id).sort());
    // Amounts: EUR in cents, JPY in whole yen (Stripe's zero-decimal rule; ISO 4217 JPY has 0 digits).
    const eur = atStripe.find((t) => t.currency === "eur")!;
    const jpy = atStripe.find((t) => t.currency === "jpy")!;
    // A: start-up 1,234.56 + 25% overhead − 10% holdback = 1,388.88 (REFERENCES worked example) + invoice 450.00.
    expect(eur.amount).toBe(138_888 + 45_000);
    // B: ¥500,000 + 25% = ¥625,000; holdback 10% = ¥62,500 → ¥562,500, plus the ¥33,333 invoice.
    expect(jpy.amount).toBe(562_500 + 33_333);
    expect(eur.metadata.cairn_run_id).toBe(run.id);
    expect(eur.metadata.cairn_site_id).toBe(fx.siteA.id);

    const lines = await db.select().from(paymentRunLines).where(eq(paymentRunLines.runId, run.id));
    expect(lines.every((l) => l.state === "sent")).toBe(true);
    const [r] = await db.select().from(paymentRuns).where(eq(paymentRuns.id, run.id));
    expect(r!.state).toBe("sent");
  });

  it("an answer lost after Stripe made the transfer: the retry under the same key gets that transfer back", async () => {
    const { fx, approver } = await paymentsFixture(pf);
    const run = await approvedRun(fx, approver.id, { siteIds: [fx.siteA.id] });
    await callRoute(sendRoute, { method: "POST", params: { runId: run.id }, userId: fx.userByRole.sponsor_finance.id });
    // Stripe makes the transfer, then the answer is lost on every try.
    await fetch(`${pf.fake.url}/_fake/faults/fail-next`, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify({ count: 1, after: true }) });
    const first = await sendQueuedTransfers({ stripe: pf.stripe, runId: run.id, noBackoff: true });
    expect(first[0]!.outcome).toBe("retry");
    const second = await sendQueuedTransfers({ stripe: pf.stripe, runId: run.id, noBackoff: true });
    expect(second[0]!.outcome).toBe("sent");
    expect(await fakeTransfers(pf, run.id)).toHaveLength(1);
  });
});
