// Budgets, amendments and the ledger through the API, against a real PostgreSQL. Each expected
// amount is worked out by hand in the comment beside it (computation rules of DESIGN.md: one
// rounding per line, half away from zero).
import { beforeAll, describe, expect, it } from "vitest";
import * as budgetRoute from "@/app/api/v1/sites/[siteId]/budget/route";
import * as versionRoute from "@/app/api/v1/sites/[siteId]/budget/versions/[versionNumber]/route";
import * as ledgerRoute from "@/app/api/v1/sites/[siteId]/ledger/route";
import * as statementRoute from "@/app/api/v1/sites/[siteId]/statement/route";
import * as summaryRoute from "@/app/api/v1/studies/[studyId]/ledger/summary/route";
import * as projectionRoute from "@/app/api/v1/studies/[studyId]/ledger/projection/route";
import * as ratesRoute from "@/app/api/v1/studies/[studyId]/exchange-rates/route";
import * as listRoute from "@/app/api/v1/studies/[studyId]/budgets/route";
import * as invoicesRoute from "@/app/api/v1/sites/[siteId]/pass-through-invoices/route";
import { paymentsRecorded, protocolVersions, siteStatusEvents, siteVersionApprovals } from "@/server/db/schema";
import { subjects, visitRecords } from "@/server/db/schema/subjects";
import { callRoute } from "../../support/api";
import { parseCsv } from "./csv";
import { createStudyFixture, db, type StudyFixture } from "../../support/db";

let fx: StudyFixture;
let v1: string;
let v2: string;
let sponsorFinance: string;
let siteFinanceA: string;
const visitIds: Record<string, string> = {};

const budgetV1 = {
  effectiveFrom: "2025-01-01",
  reason: "Agreement signed",
  startupFee: "5,000.00",
  milestones: [{ kind: "site_activated", amount: "1,000.00" }],
  visitFees: [
    { visitCode: "M01", amount: "1,234.56" },
    { visitCode: "M03", amount: "800.00" },
  ],
  screenFailureFee: "300.00",
  screenFailureCapPerEnrolled: 4,
  overheadPercent: "25",
  holdbackPercent: "10",
  cycle: "quarterly",
  netDays: 45,
  trigger: "visit_completed",
};

async function protocolVersion(label: string) {
  const [v] = await db
    .insert(protocolVersions)
    .values({ studyId: fx.study.id, versionLabel: label, title: `Protocol ${label}`, content: { type: "doc", content: [] }, state: "released", contentHash: "0".repeat(64), authorId: fx.userByRole.protocol_writer.id })
    .returning();
  return v!.id;
}

async function subject(code: string, fields: Partial<typeof subjects.$inferInsert>) {
  const [s] = await db
    .insert(subjects)
    .values({ studyId: fx.study.id, siteId: fx.siteA.id, code: `${fx.tag}-${code}`, consentDate: "2025-03-20", consentVersionId: v1, status: "enrolled", ...fields })
    .returning();
  return s!.id;
}

async function visit(subjectId: string, visitCode: string, actualDate: string) {
  const [v] = await db.insert(visitRecords).values({ subjectId, visitCode, versionId: v1, outcome: "done", actualDate }).returning();
  return v!.id;
}

const ledger = async (asOf: string, userId = siteFinanceA) => callRoute(ledgerRoute.GET, { params: { siteId: fx.siteA.id }, query: { asOf }, userId });
const line = (json: any, key: string) => (json.lines as any[]).find((l) => l.key === key);

beforeAll(async () => {
  fx = await createStudyFixture();
  sponsorFinance = fx.userByRole.sponsor_finance.id;
  siteFinanceA = fx.userByRole.site_finance.id;
  v1 = await protocolVersion("1.0");
  v2 = await protocolVersion("2.0");
  await db.insert(siteStatusEvents).values([
    { siteId: fx.siteA.id, fromStatus: "start_up", toStatus: "open", effectiveOn: "2025-03-03" },
    { siteId: fx.siteB.id, fromStatus: "start_up", toStatus: "open", effectiveOn: "2025-05-12" },
  ]);
  await db.insert(siteVersionApprovals).values([
    { siteId: fx.siteA.id, versionId: v1, approvedOn: "2025-02-20" },
    { siteId: fx.siteA.id, versionId: v2, approvedOn: "2025-06-15" },
  ]);

  // Four enrolled by the end of April, one screen failure before and one after; four more in August.
  const s1 = await subject("S1", { enrolmentDate: "2025-04-01", screeningDate: "2025-03-25" });
  for (const [i, d] of ["2025-04-10", "2025-04-20", "2025-04-30"].entries()) await subject(`S${i + 2}`, { enrolmentDate: d });
  await subject("F1", { status: "screen_failed", screeningDate: "2025-04-02", endedOn: "2025-04-05" });
  await subject("F2", { status: "screen_failed", screeningDate: "2025-04-15", endedOn: "2025-05-02" });
  for (const i of [5, 6, 7, 8]) await subject(`S${i}`, { enrolmentDate: "2025-08-01" });
  visitIds.m01 = await visit(s1, "M01", "2025-05-10");
  visitIds.m03 = await visit(s1, "M03", "2025-07-01");
});

describe("budget versions", () => {
  it("creates the first version with amounts parsed in the site's currency", async () => {
    const res = await callRoute(budgetRoute.POST, { method: "POST", params: { siteId: fx.siteA.id }, body: budgetV1, userId: sponsorFinance });
    expect(res.status, JSON.stringify(res.json)).toBe(201);
    expect(res.json.version.versionNumber).toBe(1);
    const read = await callRoute(budgetRoute.GET, { params: { siteId: fx.siteA.id }, userId: siteFinanceA });
    expect(read.status).toBe(200);
    const items = read.json.versions[0].items as { kind: string; visitCode: string | null; amountMinor: string }[];
    // "1,234.56" EUR = 123456 cents (ISO 4217: EUR has 2 minor units).
    expect(items.find((i) => i.visitCode === "M01")?.amountMinor).toBe("123456");
    expect(read.json.versions[0].overheadBps).toBe(2500);
  });

  it("rejects an amount with more decimals than the currency has, naming the field", async () => {
    const res = await callRoute(budgetRoute.POST, { method: "POST", params: { siteId: fx.siteB.id }, body: { ...budgetV1, startupFee: "500000.5" }, userId: sponsorFinance });
    // Site B is in JPY, which has no minor unit (ISO 4217).
    expect(res.status).toBe(400);
    expect(Object.keys(res.json.error.fields)).toContain("startupFee");
  });

  it("an amendment that follows protocol 2.0 takes effect on the site's approval date of it", async () => {
    const body = { ...budgetV1, effectiveFrom: null, protocolVersionId: v2, reason: "Protocol 2.0 adds work at M03", visitFees: [{ visitCode: "M01", amount: "1,234.56" }, { visitCode: "M03", amount: "900.00" }] };
    const res = await callRoute(budgetRoute.POST, { method: "POST", params: { siteId: fx.siteA.id }, body, userId: sponsorFinance });
    expect(res.status, JSON.stringify(res.json)).toBe(201);
    expect(res.json.version.versionNumber).toBe(2);
    expect(res.json.version.effectiveFrom).toBe("2025-06-15");
  });

  it("never edits a version in place once a line was earned under it", async () => {
    const res = await callRoute(versionRoute.PUT, { method: "PUT", params: { siteId: fx.siteA.id, versionNumber: "1" }, body: { ...budgetV1, startupFee: "9,999.00" }, userId: sponsorFinance });
    expect(res.status).toBe(409);
    expect(res.json.error.message).toMatch(/amendment/);
  });

  it("refuses an amendment dated before the latest version", async () => {
    const res = await callRoute(budgetRoute.POST, { method: "POST", params: { siteId: fx.siteA.id }, body: { ...budgetV1, effectiveFrom: "2025-06-01" }, userId: sponsorFinance });
    expect(res.status).toBe(409);
  });

  it("lists the site's budget for its finance officer only", async () => {
    const mine = await callRoute(listRoute.GET, { params: { studyId: fx.study.id }, userId: siteFinanceA });
    expect(mine.json.budgets.map((b: any) => b.site.id)).toEqual([fx.siteA.id]);
  });
});

describe("the site ledger", () => {
  it("prices a visit fee with overhead and holdback, one rounding per component", async () => {
    const res = await ledger("2025-12-31");
    expect(res.status).toBe(200);
    const m01 = line(res.json, `visit:${visitIds.m01}`);
    // Fee 1,234.56; overhead 25% = 308.64; holdback 10% of 1,543.20 = 154.32; net 1,388.88
    // (the worked example in the project's references, common practice).
    expect([m01.grossMinor, m01.overheadMinor, m01.holdbackMinor, m01.netMinor]).toEqual(["123456", "30864", "15432", "138888"]);
    expect(m01.budgetVersionNumber).toBe(1);
    // Quarterly cycle: 2025-05-10 falls in 2025-Q2, which ends 2025-06-30; net 45 → 2025-08-14.
    expect(m01.cycle.label).toBe("2025-Q2");
    expect(m01.dueDate).toBe("2025-08-14");
  });

  it("splits one subject's visits between versions by service date", async () => {
    const res = await ledger("2025-12-31");
    const m03 = line(res.json, `visit:${visitIds.m03}`);
    // 2025-07-01 is on or after 2025-06-15: version 2 applies. Fee 900.00; overhead 225.00;
    // holdback 10% of 1,125.00 = 112.50; net 1,012.50.
    expect(m03.budgetVersionNumber).toBe(2);
    expect([m03.grossMinor, m03.overheadMinor, m03.holdbackMinor, m03.netMinor]).toEqual(["90000", "22500", "11250", "101250"]);
  });

  it("pays one screen failure per four enrolled, the second once enrolment lifts the cap", async () => {
    const key = (code: string) => (res: any) => (res.json.lines as any[]).find((l) => l.kind === "screen_failure" && l.source.subjectCode === `${fx.tag}-${code}`);
    const before = await ledger("2025-07-31");
    // Four enrolled by 2025-04-30 → floor(4 / 4) = 1 paid screen failure: F1 (the earlier) is paid.
    expect(key("F1")(before).overCap).toBe(false);
    expect(key("F1")(before).grossMinor).toBe("30000");
    expect(key("F2")(before).overCap).toBe(true);
    expect(key("F2")(before).netMinor).toBe("0");
    expect(key("F2")(before).state).toBe("not_payable");
    const after = await ledger("2025-09-30");
    // Eight enrolled on 2025-08-01 → floor(8 / 4) = 2: F2 becomes payable at the full fee.
    expect(key("F2")(after).overCap).toBe(false);
    expect(key("F2")(after).grossMinor).toBe("30000");
    expect(key("F2")(after).capLiftedOn).toBe("2025-08-01");
  });

  it("applies recorded payments and keeps earned = paid + outstanding + held back", async () => {
    await db.insert(paymentsRecorded).values({ studyId: fx.study.id, siteId: fx.siteA.id, lineKey: `visit:${visitIds.m01}`, amountMinor: 138888n, paidOn: "2025-08-10", reference: "TEST" });
    const res = await ledger("2025-12-31");
    expect(line(res.json, `visit:${visitIds.m01}`).state).toBe("paid");
    const t = res.json.totals;
    expect(BigInt(t.earnedMinor)).toBe(BigInt(t.paidMinor) + BigInt(t.outstandingMinor) + BigInt(t.heldBackMinor));
    expect(t.paidMinor).toBe("138888");
  });

  it("hides site A's ledger and statement from site B's finance officer (404)", async () => {
    const other = fx.siteBPeople.site_finance.id;
    expect((await ledger("2025-12-31", other)).status).toBe(404);
    const st = await callRoute(statementRoute.GET, { params: { siteId: fx.siteA.id }, query: { format: "csv" }, userId: other });
    expect(st.status).toBe(404);
  });
});

describe("pass-through invoices", () => {
  it("reimburses an approved invoice at cost, without overhead or holdback", async () => {
    const bad = await callRoute(invoicesRoute.POST, { method: "POST", params: { siteId: fx.siteA.id }, body: { documentId: fx.docB.id, description: "Ethics fee", amount: "1,200.00", approvedOn: "2025-05-20" }, userId: sponsorFinance });
    // Site B's document cannot be site A's invoice.
    expect(bad.status).toBe(422);
    const res = await callRoute(invoicesRoute.POST, { method: "POST", params: { siteId: fx.siteA.id }, body: { documentId: fx.docA.id, description: "Ethics fee", amount: "1,200.00", approvedOn: "2025-05-20" }, userId: sponsorFinance });
    expect(res.status, JSON.stringify(res.json)).toBe(201);
    const l = line((await ledger("2025-12-31")).json, `pass-through:${res.json.invoice.id}`);
    // EUR 1,200.00 at cost (common practice): gross = net = 120000 cents.
    expect([l.grossMinor, l.overheadMinor, l.holdbackMinor, l.netMinor]).toEqual(["120000", "0", "0", "120000"]);
  });
});

describe("statements", () => {
  it("a cycle's CSV statement totals equal the sum of the ledger lines of that cycle", async () => {
    const res = await callRoute(statementRoute.GET, { params: { siteId: fx.siteA.id }, query: { cycle: "2025-Q2", asOf: "2025-12-31" }, userId: siteFinanceA });
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toMatch(/text\/csv/);
    const rows = parseCsv(res.json as string);
    const total = rows[rows.length - 1]!;
    const lg = await ledger("2025-12-31");
    const q2 = (lg.json.lines as any[]).filter((l) => l.cycle.label === "2025-Q2");
    const sum = (f: string) => q2.reduce((a, l) => a + BigInt(l[f]), 0n);
    expect(rows.length).toBe(q2.length + 2);
    // Net column (13th): cents printed as major units with two decimals.
    const net = sum("netMinor");
    expect(total[12]).toBe(`${net / 100n}.${String(net % 100n).padStart(2, "0")}`);
  });

  it("a PDF statement is a PDF", async () => {
    const res = await callRoute(statementRoute.GET, { params: { siteId: fx.siteA.id }, query: { cycle: "2025-Q2", format: "pdf", asOf: "2025-12-31" }, userId: siteFinanceA });
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toBe("application/pdf");
    expect(String(res.json).startsWith("%PDF-")).toBe(true);
  });
});

describe("study summary and projection", () => {
  it("converts each currency's totals with the latest rate entered on or before the as-of date", async () => {
    // Site B (JPY): start-up ¥500,000, no overhead or holdback, earned on activation 2025-05-12.
    const jp = { ...budgetV1, startupFee: "500,000", milestones: [], visitFees: [], screenFailureFee: "0", overheadPercent: "0", holdbackPercent: "0" };
    expect((await callRoute(budgetRoute.POST, { method: "POST", params: { siteId: fx.siteB.id }, body: jp, userId: sponsorFinance })).status).toBe(201);
    for (const [rate, rateDate] of [["0.0061", "2025-11-28"], ["0.0070", "2026-01-05"]]) {
      const r = await callRoute(ratesRoute.POST, { method: "POST", params: { studyId: fx.study.id }, body: { currency: "JPY", rate, rateDate }, userId: sponsorFinance });
      expect(r.status, JSON.stringify(r.json)).toBe(201);
    }
    const res = await callRoute(summaryRoute.GET, { params: { studyId: fx.study.id }, query: { asOf: "2025-12-31" }, userId: sponsorFinance });
    expect(res.status).toBe(200);
    const jpy = (res.json.converted.earnedMinor.lines as any[]).find((l) => l.currency === "JPY");
    // ¥500,000 × 0.0061 (the rate of 2025-11-28; the 2026 rate is later than the as-of date)
    // = EUR 3,050.00 = 305000 cents (JPY 0 minor units, EUR 2).
    expect(jpy).toMatchObject({ amountMinor: "500000", convertedMinor: "305000", rate: "0.0061", rateDate: "2025-11-28" });
    const eur = (res.json.currencies as any[]).find((c) => c.currency === "EUR");
    expect(res.json.converted.earnedMinor.totalMinor).toBe(String(BigInt(eur.earnedMinor) + 305000n));
  });

  it("site finance sees only its own site in the summary", async () => {
    const res = await callRoute(summaryRoute.GET, { params: { studyId: fx.study.id }, query: { asOf: "2025-12-31" }, userId: siteFinanceA });
    expect(res.json.sites.map((s: any) => s.siteId)).toEqual([fx.siteA.id]);
  });

  it("projects twelve months with an 80% band around the expected amount", async () => {
    const res = await callRoute(projectionRoute.GET, { params: { studyId: fx.study.id }, query: { asOf: "2025-12-31" }, userId: sponsorFinance });
    expect(res.status, JSON.stringify(res.json)).toBe(200);
    const eur = (res.json.projection.currencies as any[]).find((c) => c.currency === "EUR");
    expect(eur.months).toHaveLength(12);
    for (const m of eur.months) {
      expect(BigInt(m.lowNetMinor) <= BigInt(m.expectedNetMinor)).toBe(true);
      expect(BigInt(m.expectedNetMinor) <= BigInt(m.highNetMinor)).toBe(true);
    }
  });
});

