// Four eyes and frozen runs; authorisation across sites; amounts in each currency.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { db } from "@/server/db/client";
import { paymentRunLines, paymentRuns } from "@/server/db/schema";
import { POST as createRun } from "@/app/api/v1/studies/[studyId]/payment-runs/route";
import { POST as approve } from "@/app/api/v1/payment-runs/[runId]/approve/route";
import { POST as send } from "@/app/api/v1/payment-runs/[runId]/send/route";
import { GET as getRun } from "@/app/api/v1/payment-runs/[runId]/route";
import { POST as confirm } from "@/app/api/v1/sites/[siteId]/payment-confirmations/route";
import { POST as raiseQuery } from "@/app/api/v1/sites/[siteId]/payment-queries/route";
import { GET as reconciliation } from "@/app/api/v1/studies/[studyId]/reconciliation/route";
import { sendQueuedTransfers } from "@/server/payments/send-transfers";
import { callRoute } from "../../support/api";
import { paymentsFixture, startPaymentsFake, transfersOfRun, type PaymentsFake } from "./helpers";

let pf: PaymentsFake;
beforeAll(async () => {
  pf = await startPaymentsFake();
});
afterAll(async () => pf?.close());

describe("four eyes", () => {
  it("the preparer cannot approve their own run; a second person can, and the lines are then frozen", async () => {
    const { fx, approver } = await paymentsFixture(pf);
    const preparer = fx.userByRole.sponsor_finance.id;
    const created = await callRoute(createRun, { method: "POST", params: { studyId: fx.study.id }, body: { siteIds: [fx.siteA.id] }, userId: preparer });
    expect(created.status).toBe(201);
    const run = created.json.run;
    expect(run.lineCount).toBe(2);

    const own = await callRoute(approve, { method: "POST", params: { runId: run.id }, body: { contentHash: run.contentHash }, userId: preparer });
    expect(own.status).toBe(403);
    expect(own.json.error.message).toMatch(/different/);
    const early = await callRoute(send, { method: "POST", params: { runId: run.id }, userId: preparer });
    expect(early.status).toBe(409);

    const wrongHash = await callRoute(approve, { method: "POST", params: { runId: run.id }, body: { contentHash: "f".repeat(64) }, userId: approver.id });
    expect(wrongHash.status).toBe(409);
    const ok = await callRoute(approve, { method: "POST", params: { runId: run.id }, body: { contentHash: run.contentHash }, userId: approver.id });
    expect(ok.status).toBe(200);
    expect(ok.json.run.state).toBe("approved");

    // The database refuses to change an approved run's lines, even bypassing the API.
    const [line] = await db.select().from(paymentRunLines).where(eq(paymentRunLines.runId, run.id));
    await expect(db.update(paymentRunLines).set({ amountMinor: line!.amountMinor + 1n }).where(eq(paymentRunLines.id, line!.id))).rejects.toThrow();
    await expect(db.delete(paymentRunLines).where(eq(paymentRunLines.id, line!.id))).rejects.toThrow();
    await expect(
      db.insert(paymentRunLines).values({ ...line!, id: undefined, lineKey: `${line!.lineKey}:extra` }),
    ).rejects.toThrow();
    await expect(db.update(paymentRuns).set({ contentHash: "0".repeat(64) }).where(eq(paymentRuns.id, run.id))).rejects.toThrow();
    // And no one approves as the preparer even by writing the row.
    await expect(db.update(paymentRuns).set({ approvedBy: preparer }).where(eq(paymentRuns.id, run.id))).rejects.toThrow();
  });

  it("a line is in one live run at a time", async () => {
    const { fx } = await paymentsFixture(pf);
    const first = await callRoute(createRun, { method: "POST", params: { studyId: fx.study.id }, body: { siteIds: [fx.siteA.id] }, userId: fx.userByRole.sponsor_finance.id });
    expect(first.status).toBe(201);
    const second = await callRoute(createRun, { method: "POST", params: { studyId: fx.study.id }, body: { siteIds: [fx.siteA.id] }, userId: fx.userByRole.sponsor_finance.id });
    expect(second.status).toBe(422);
  });
});

describe("site finance sees and acts on its own site only", () => {
  it("site A's finance cannot confirm or query site B's payment; site B's finance can", async () => {
    const { fx, approver } = await paymentsFixture(pf);
    const created = await callRoute(createRun, { method: "POST", params: { studyId: fx.study.id }, body: { siteIds: [fx.siteB.id] }, userId: fx.userByRole.sponsor_finance.id });
    const runId = created.json.run.id;
    await callRoute(approve, { method: "POST", params: { runId }, body: { contentHash: created.json.run.contentHash }, userId: approver.id });
    await callRoute(send, { method: "POST", params: { runId }, userId: fx.userByRole.sponsor_finance.id });
    await sendQueuedTransfers({ stripe: pf.stripe, runId });
    await pf.flush();
    const [t] = await transfersOfRun(runId);
    expect(t!.state).toBe("paid");
    // JPY: whole yen, ¥562,500 + ¥33,333 (ISO 4217 JPY 0 digits; Stripe zero-decimal).
    expect(t!.amountMinor).toBe(595_833n);
    expect(t!.stripeAmount).toBe(595_833n);

    const siteAFinance = fx.userByRole.site_finance.id;
    const body = { transferId: t!.id, receivedOn: "2026-11-30", amount: "595833", bankReference: "MIZ-0001" };
    // Through site B's address: not their site → 404. Through their own site: the payment is not theirs → 422.
    expect((await callRoute(confirm, { method: "POST", params: { siteId: fx.siteB.id }, body, userId: siteAFinance })).status).toBe(404);
    expect((await callRoute(confirm, { method: "POST", params: { siteId: fx.siteA.id }, body, userId: siteAFinance })).status).toBe(422);
    expect((await callRoute(raiseQuery, { method: "POST", params: { siteId: fx.siteB.id }, body: { transferId: t!.id, subject: "Not ours", message: "?" }, userId: siteAFinance })).status).toBe(404);
    expect((await callRoute(raiseQuery, { method: "POST", params: { siteId: fx.siteA.id }, body: { transferId: t!.id, subject: "Not ours", message: "?" }, userId: siteAFinance })).status).toBe(422);
    // Site A's finance does not see site B's lines in the run either.
    const seen = await callRoute(getRun, { params: { runId }, userId: siteAFinance });
    expect(seen.status).toBe(200);
    expect(seen.json.lines).toHaveLength(0);
    expect(seen.json.transfers).toHaveLength(0);

    const siteBFinance = fx.siteBPeople.site_finance.id;
    const ok = await callRoute(confirm, { method: "POST", params: { siteId: fx.siteB.id }, body, userId: siteBFinance });
    expect(ok.status).toBe(201);
    const again = await callRoute(confirm, { method: "POST", params: { siteId: fx.siteB.id }, body, userId: siteBFinance });
    expect(again.status).toBe(409);
    const recon = await callRoute(reconciliation, { params: { studyId: fx.study.id }, userId: siteBFinance });
    expect(recon.status).toBe(200);
    expect(recon.json.rows).toHaveLength(1);
    const row = recon.json.rows[0];
    expect(row.siteId).toBe(fx.siteB.id);
    expect(row.paidMinor).toBe("595833");
    expect(row.confirmedMinor).toBe("595833");
    expect(row.differenceMinor).toBe("0");
  });
});

describe("cancelling", () => {
  it("a prepared run can be cancelled and its lines are due again; an approved one cannot", async () => {
    const { POST: cancel } = await import("@/app/api/v1/payment-runs/[runId]/cancel/route");
    const { fx, approver } = await paymentsFixture(pf);
    const user = fx.userByRole.sponsor_finance.id;
    const first = await callRoute(createRun, { method: "POST", params: { studyId: fx.study.id }, body: { siteIds: [fx.siteA.id] }, userId: user });
    const c = await callRoute(cancel, { method: "POST", params: { runId: first.json.run.id }, userId: user });
    expect(c.status).toBe(200);
    expect(c.json.run.state).toBe("cancelled");
    const second = await callRoute(createRun, { method: "POST", params: { studyId: fx.study.id }, body: { siteIds: [fx.siteA.id] }, userId: user });
    expect(second.status).toBe(201);
    expect(second.json.run.lineCount).toBe(first.json.run.lineCount);
    await callRoute(approve, { method: "POST", params: { runId: second.json.run.id }, body: { contentHash: second.json.run.contentHash }, userId: approver.id });
    expect((await callRoute(cancel, { method: "POST", params: { runId: second.json.run.id }, userId: user })).status).toBe(409);
  });
});
