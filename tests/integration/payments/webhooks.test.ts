// Webhooks: a bad signature is refused (400) and changes nothing; a duplicate is applied once;
// out-of-order events end in the right state; a failure after creation puts lines back as due.
import Stripe from "stripe";
import { NextRequest } from "next/server";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { count, eq } from "drizzle-orm";
import { db } from "@/server/db/client";
import { auditEvents, outboxMessages, paymentRunLines, paymentsRecorded, stripeEvents } from "@/server/db/schema";
import { sendQueuedTransfers } from "@/server/payments/send-transfers";
import { requestSendPaymentRun } from "@/server/payments/runs";
import { POST as webhookPost } from "@/app/api/v1/webhooks/stripe/route";
import { WEBHOOK_SECRET, approvedRun, control, paymentsFixture, startPaymentsFake, transfersOfRun, type PaymentsFake } from "./helpers";

let pf: PaymentsFake;
beforeAll(async () => {
  pf = await startPaymentsFake();
});
afterAll(async () => pf?.close());

async function sentRun(siteOnly?: "A") {
  const { fx, approver } = await paymentsFixture(pf);
  const run = await approvedRun(fx, approver.id, siteOnly ? { siteIds: [fx.siteA.id] } : {});
  await db.transaction((tx) => requestSendPaymentRun(tx, { runId: run.id, actorId: fx.userByRole.sponsor_finance.id }));
  await sendQueuedTransfers({ stripe: pf.stripe, runId: run.id });
  return { fx, run };
}

const post = (body: string, signature: string | null) => {
  const headers = new Headers({ "content-type": "application/json" });
  if (signature) headers.set("stripe-signature", signature);
  return webhookPost(new NextRequest("http://127.0.0.1/api/v1/webhooks/stripe", { method: "POST", headers, body }));
};

describe("Stripe webhooks", () => {
  it("refuses a bad signature, a stale timestamp and a missing header with 400, changing nothing", async () => {
    const { fx, run } = await sentRun("A");
    const [t] = await transfersOfRun(run.id);
    // Counted within this test's own study: other test files write audit events to the same database at the same time.
    const studyAudits = async () => (await db.select({ n: count() }).from(auditEvents).where(eq(auditEvents.studyId, fx.study.id)))[0]!.n;
    const payload = JSON.stringify({ id: `evt_forged_${t!.id}`, object: "event", type: "transfer.failed", created: Math.floor(Date.now() / 1000), data: { object: { id: t!.stripeTransferId, object: "transfer", metadata: { cairn_transfer_id: t!.id }, reversed: true } } });
    const stripe = new Stripe("sk_test_x");
    const wrongSecret = stripe.webhooks.generateTestHeaderString({ payload, secret: "whsec_not_ours" });
    const stale = stripe.webhooks.generateTestHeaderString({ payload, secret: WEBHOOK_SECRET, timestamp: Math.floor(Date.now() / 1000) - 3600 });
    const tampered = stripe.webhooks.generateTestHeaderString({ payload: payload.replace("transfer.failed", "transfer.created"), secret: WEBHOOK_SECRET });
    const auditBefore = await studyAudits();
    for (const sig of [wrongSecret, stale, tampered, null]) {
      const res = await post(payload, sig);
      expect(res.status).toBe(400);
    }
    expect(await db.select().from(stripeEvents).where(eq(stripeEvents.id, `evt_forged_${t!.id}`))).toHaveLength(0);
    expect((await transfersOfRun(run.id))[0]!.state).toBe("sent");
    expect(await studyAudits()).toBe(auditBefore);
    // The same payload correctly signed is accepted (so the refusals above were for the signature).
    const good = await post(payload, stripe.webhooks.generateTestHeaderString({ payload, secret: WEBHOOK_SECRET }));
    expect(good.status).toBe(200);
    expect((await transfersOfRun(run.id))[0]!.state).toBe("failed");
    // ...and its audit event lands in the counted study, so the unchanged count above could have moved.
    expect(await studyAudits()).toBeGreaterThan(auditBefore);
  });

  it("applies a duplicated event once", async () => {
    await control(pf.fake, "POST", "/_fake/faults/duplicate-next-webhook", { count: 50 });
    const { run } = await sentRun("A");
    await pf.flush();
    await control(pf.fake, "DELETE", "/_fake/faults");
    const [t] = await transfersOfRun(run.id);
    expect(t!.state).toBe("paid");
    const created = await db.select().from(stripeEvents).where(eq(stripeEvents.objectId, t!.stripeTransferId!));
    expect(created.filter((e) => e.type === "transfer.created")).toHaveLength(1);
    const paidAudits = await db.select().from(auditEvents).where(eq(auditEvents.entityId, t!.id));
    expect(paidAudits.filter((a) => a.action === "payment.transfer.paid")).toHaveLength(1);
    const mails = await db.select().from(outboxMessages);
    expect(mails.filter((m) => m.dedupeKey.startsWith(`remittance:${t!.id}:`))).toHaveLength(1); // site A has one finance person
    expect(pf.bridge.statuses.every((s) => s === 200)).toBe(true);
    // The schedule reads paid lines from payments_recorded: each line once, at its frozen amount.
    const recorded = await db.select().from(paymentsRecorded).where(eq(paymentsRecorded.reference, `cairn-transfer:${t!.id}`));
    const lines = await db.select().from(paymentRunLines).where(eq(paymentRunLines.transferId, t!.id));
    expect(recorded.map((r) => [r.lineKey, r.amountMinor]).sort()).toEqual(lines.map((l) => [l.lineKey, l.amountMinor]).sort());
  });

  it("ends failed when the failure arrives before the creation event", async () => {
    const { run } = await sentRun("A");
    const [t] = await transfersOfRun(run.id);
    await control(pf.fake, "POST", `/_fake/transfers/${t!.stripeTransferId}/fail`, { code: "account_closed", message: "The destination account is closed." });
    // Deliver newest first: transfer.failed, then transfer.created.
    const events = (await control<Stripe.Event[]>(pf.fake, "GET", "/_fake/events")).filter((e) => (e.data.object as { id?: string }).id === t!.stripeTransferId);
    expect(events.map((e) => e.type)).toEqual(["transfer.created", "transfer.failed"]);
    for (const e of [...events].reverse()) {
      const payload = JSON.stringify(e);
      const res = await post(payload, new Stripe("sk_test_x").webhooks.generateTestHeaderString({ payload, secret: WEBHOOK_SECRET }));
      expect(res.status).toBe(200);
    }
    const [after] = await transfersOfRun(run.id);
    expect(after!.state).toBe("failed");
    expect(after!.failureCode).toBe("account_closed");
    const lines = await db.select().from(paymentRunLines).where(eq(paymentRunLines.runId, run.id));
    expect(lines.every((l) => l.state === "failed" && l.stateReason?.includes("account is closed"))).toBe(true);
  });

  it("ends paid, then reversed, whatever order the fake delivers them in", async () => {
    const { run } = await sentRun("A");
    const [t] = await transfersOfRun(run.id);
    await control(pf.fake, "POST", "/_fake/faults/reorder-next-webhooks", { count: 2 });
    await pf.stripe.transfers.createReversal(t!.stripeTransferId!, {});
    await pf.flush();
    await pf.flush();
    const [after] = await transfersOfRun(run.id);
    expect(after!.state).toBe("reversed");
    const lines = await db.select().from(paymentRunLines).where(eq(paymentRunLines.runId, run.id));
    expect(lines.every((l) => l.state === "reversed")).toBe(true);
    // Paid, then reversed: the recorded payments are taken out again, so the lines are due.
    expect(await db.select().from(paymentsRecorded).where(eq(paymentsRecorded.reference, `cairn-transfer:${t!.id}`))).toHaveLength(0);
  });
});
