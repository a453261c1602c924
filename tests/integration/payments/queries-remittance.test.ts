// Queries move open → answered → resolved with mail to the other side; remittance advice lists
// the payment's lines and totals to the amount sent; a failed transfer shows until re-run.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eq, like } from "drizzle-orm";
import { db } from "@/server/db/client";
import { outboxMessages } from "@/server/db/schema";
import { POST as raiseQuery } from "@/app/api/v1/sites/[siteId]/payment-queries/route";
import { POST as reply } from "@/app/api/v1/payment-queries/[queryId]/messages/route";
import { GET as listQueries } from "@/app/api/v1/studies/[studyId]/payment-queries/route";
import { GET as remittance } from "@/app/api/v1/payments/[transferId]/remittance/route";
import { sendQueuedTransfers } from "@/server/payments/send-transfers";
import { requestSendPaymentRun } from "@/server/payments/runs";
import { listFailedTransfers } from "@/server/payments/home";
import { callRoute } from "../../support/api";
import { approvedRun, control, paymentsFixture, startPaymentsFake, transfersOfRun, type PaymentsFake } from "./helpers";

let pf: PaymentsFake;
beforeAll(async () => {
  pf = await startPaymentsFake();
});
afterAll(async () => pf?.close());

async function paidRunAtA() {
  const { fx, approver } = await paymentsFixture(pf);
  const run = await approvedRun(fx, approver.id, { siteIds: [fx.siteA.id] });
  await db.transaction((tx) => requestSendPaymentRun(tx, { runId: run.id, actorId: fx.userByRole.sponsor_finance.id }));
  await sendQueuedTransfers({ stripe: pf.stripe, runId: run.id });
  await pf.flush();
  const [t] = await transfersOfRun(run.id);
  return { fx, approver, run, t: t! };
}

describe("payment queries", () => {
  it("threads messages and moves open → answered → open → resolved, mailing the other side", async () => {
    const { fx, t } = await paidRunAtA();
    const site = fx.userByRole.site_finance;
    const sponsor = fx.userByRole.sponsor_finance;
    const raised = await callRoute(raiseQuery, { method: "POST", params: { siteId: fx.siteA.id }, body: { transferId: t.id, subject: "Amount lower than expected", message: "We expected the invoice to be included." }, userId: site.id });
    expect(raised.status).toBe(201);
    const queryId = raised.json.query.id;
    expect(raised.json.query.state).toBe("open");
    const toSponsor = await db.select().from(outboxMessages).where(eq(outboxMessages.toAddress, sponsor.email));
    expect(toSponsor.some((m) => m.subject.includes("Amount lower than expected"))).toBe(true);

    const answered = await callRoute(reply, { method: "POST", params: { queryId }, body: { message: "The invoice is line pass-through; see the remittance." }, userId: sponsor.id });
    expect(answered.json.query.state).toBe("answered");
    expect((await db.select().from(outboxMessages).where(eq(outboxMessages.toAddress, site.email))).some((m) => m.textBody.includes("see the remittance"))).toBe(true);
    const again = await callRoute(reply, { method: "POST", params: { queryId }, body: { message: "Found it, thanks." }, userId: site.id });
    expect(again.json.query.state).toBe("open");
    const resolved = await callRoute(reply, { method: "POST", params: { queryId }, body: { message: "Closing.", resolve: true }, userId: site.id });
    expect(resolved.json.query.state).toBe("resolved");
    const closed = await callRoute(reply, { method: "POST", params: { queryId }, body: { message: "One more thing" }, userId: sponsor.id });
    expect(closed.status).toBe(409);

    const list = await callRoute(listQueries, { params: { studyId: fx.study.id }, userId: site.id });
    const q = list.json.queries.find((x: { id: string }) => x.id === queryId);
    expect(q.messages.map((m: { side: string }) => m.side)).toEqual(["site", "sponsor", "site", "site"]);
    // Site B's finance sees none of site A's queries.
    const other = await callRoute(listQueries, { params: { studyId: fx.study.id }, userId: fx.siteBPeople.site_finance.id });
    expect(other.json.queries.some((x: { id: string }) => x.id === queryId)).toBe(false);
  });
});

describe("remittance advice", () => {
  it("lists the payment's lines in CSV and PDF, totalling the amount sent, and is mailed to the site's finance people", async () => {
    const { fx, run, t } = await paidRunAtA();
    const csv = await callRoute(remittance, { params: { transferId: t.id }, query: { format: "csv" }, userId: fx.userByRole.site_finance.id });
    expect(csv.status).toBe(200);
    const rows = (csv.json as string).trim().split("\r\n");
    expect(rows).toHaveLength(1 + 2 + 1); // header, start-up fee and invoice, total
    // 1,388.88 + 450.00 (REFERENCES worked example plus the invoice) = 1838.88 EUR.
    expect(rows.at(-1)!.endsWith(",EUR,1838.88")).toBe(true);
    expect(rows.at(-1)).toContain(`,${run.number},`);
    const pdf = await callRoute(remittance, { params: { transferId: t.id }, query: { format: "pdf" }, userId: fx.userByRole.sponsor_finance.id });
    expect(pdf.status).toBe(200);
    expect(pdf.headers.get("content-type")).toBe("application/pdf");
    expect(String(pdf.json).startsWith("%PDF-")).toBe(true);
    const mails = await db.select().from(outboxMessages).where(like(outboxMessages.dedupeKey, `remittance:${t.id}:%`));
    expect(mails.map((m) => m.toAddress)).toEqual([fx.userByRole.site_finance.email]);
    expect(mails[0]!.textBody).toContain("1,838.88 EUR");
    // Site B's finance may not read it.
    expect((await callRoute(remittance, { params: { transferId: t.id }, query: { format: "csv" }, userId: fx.siteBPeople.site_finance.id })).status).toBe(404);
  });
});

describe("failed transfers on the sponsor's home", () => {
  it("shows a failed transfer until its lines are in a new run", async () => {
    const { fx, approver, t } = await paidRunAtA();
    await control(pf.fake, "POST", `/_fake/transfers/${t.stripeTransferId}/fail`, {});
    await pf.flush();
    expect((await listFailedTransfers(db, { studyId: fx.study.id })).map((x) => x.id)).toEqual([t.id]);
    await approvedRun(fx, approver.id, { siteIds: [fx.siteA.id] });
    expect(await listFailedTransfers(db, { studyId: fx.study.id })).toEqual([]);
  });
});
