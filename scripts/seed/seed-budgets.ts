// Demo budgets of KESTREL-VP: one per site in its currency (JP01 in JPY, whole yen), an amendment
// at DE01 effective from its ethics approval of protocol 2.0, screen-failure caps met and exceeded,
// a pass-through invoice, exchange rates, and payments recorded for most lines that fell due.
// CH01 is closed out, so its holdback comes back as a release line. Every figure is invented.
import { createHash, randomUUID } from "node:crypto";
import { HeadBucketCommand, PutObjectCommand, S3Client } from "@aws-sdk/client-s3";
import { and, eq, inArray } from "drizzle-orm";
import {
  budgetItems,
  budgetVersions,
  documents,
  exchangeRates,
  memberships,
  passThroughInvoices,
  paymentsRecorded,
  protocolVersions,
  siteBudgets,
  sites,
  siteStatusEvents,
  siteVersionApprovals,
  studies,
  subjects,
  users,
  visitRecords,
} from "../../src/server/db/schema";
import { buildSnapshot } from "../../src/lib/ledger/build-snapshot";
import { computePaymentSchedule, addDays } from "../../src/lib/payment-schedule";
import { parseMajorToMinor } from "../../src/lib/money";
import { demoStudy } from "./demo-data";
import { tinyPdf } from "./seed-binder";
import type { SeedContext } from "./context";

const DEMO_TODAY = "2026-12-01";

type Terms = { overheadBps: number; holdbackBps: number; cycle: "monthly" | "quarterly"; netDays: number; trigger: "visit_completed" | "data_entered" | "monitor_verified" };
// Fees in major units of EUR; other currencies scale them (invented round figures).
const EUR_FEES = { startup: 8000, activated: 2000, firstImplant: 3000, fifth: 1500, closeOut: 2500, screenFailure: 350 };
const EUR_VISITS: Record<string, number> = { SCR: 450, IMP: 2800, W1: 180, M1: 650, M3: 520, M6: 520, M12: 780, M24: 900 };
const siteTerms: Record<string, { scale: number; terms: Terms }> = {
  DE01: { scale: 1, terms: { overheadBps: 2500, holdbackBps: 1000, cycle: "quarterly", netDays: 45, trigger: "data_entered" } },
  NL01: { scale: 1, terms: { overheadBps: 2200, holdbackBps: 1000, cycle: "monthly", netDays: 30, trigger: "visit_completed" } },
  GB01: { scale: 0.85, terms: { overheadBps: 3000, holdbackBps: 500, cycle: "quarterly", netDays: 30, trigger: "visit_completed" } },
  JP01: { scale: 160, terms: { overheadBps: 3000, holdbackBps: 1000, cycle: "quarterly", netDays: 45, trigger: "visit_completed" } },
  US01: { scale: 1.1, terms: { overheadBps: 2800, holdbackBps: 1000, cycle: "monthly", netDays: 30, trigger: "monitor_verified" } },
  CH01: { scale: 0.95, terms: { overheadBps: 2000, holdbackBps: 800, cycle: "quarterly", netDays: 30, trigger: "visit_completed" } },
  ES01: { scale: 1, terms: { overheadBps: 2500, holdbackBps: 1000, cycle: "quarterly", netDays: 45, trigger: "monitor_verified" } },
  SE01: { scale: 11, terms: { overheadBps: 2500, holdbackBps: 1000, cycle: "quarterly", netDays: 30, trigger: "data_entered" } },
};
// Rates into EUR entered by sponsor finance (invented).
const RATES: [string, string, string][] = [
  ["GBP", "1.1630", "2026-11-27"],
  ["JPY", "0.00615", "2026-11-27"],
  ["USD", "0.9210", "2026-11-27"],
  ["CHF", "1.0560", "2026-11-27"],
  ["SEK", "0.0874", "2026-11-27"],
  ["JPY", "0.00598", "2026-06-30"],
];

/** Round a scaled fee to a tidy amount in the currency (whole units; tens for large-unit currencies). */
function fee(eur: number, scale: number, currency: string): bigint {
  const x = eur * scale;
  const step = x >= 10_000 ? 100 : x >= 1000 ? 10 : 1;
  return parseMajorToMinor(String(Math.round(x / step) * step), currency);
}

async function storage() {
  const client = new S3Client({
    region: process.env.S3_REGION ?? "us-east-1",
    endpoint: process.env.S3_ENDPOINT ?? "http://127.0.0.1:4569",
    forcePathStyle: (process.env.S3_FORCE_PATH_STYLE ?? "true") === "true",
    credentials: { accessKeyId: process.env.S3_ACCESS_KEY_ID ?? "S3RVER", secretAccessKey: process.env.S3_SECRET_ACCESS_KEY ?? "S3RVER" },
    requestChecksumCalculation: "WHEN_REQUIRED",
    responseChecksumValidation: "WHEN_REQUIRED",
    maxAttempts: 1,
  });
  const bucket = process.env.S3_BUCKET ?? "cairn-documents";
  try {
    await client.send(new HeadBucketCommand({ Bucket: bucket }), { abortSignal: AbortSignal.timeout(3000) });
    return async (key: string, body: Buffer) => void (await client.send(new PutObjectCommand({ Bucket: bucket, Key: key, Body: body, ContentType: "application/pdf" })));
  } catch {
    return null;
  }
}

export async function seedBudgets({ db, log }: SeedContext) {
  const [study] = await db.select().from(studies).where(eq(studies.code, demoStudy.code));
  if (!study) return;
  const existing = await db.select({ id: siteBudgets.id }).from(siteBudgets).where(eq(siteBudgets.studyId, study.id)).limit(1);
  if (existing.length) return log("budgets: already seeded");

  const siteRows = await db.select().from(sites).where(eq(sites.studyId, study.id));
  const ids = siteRows.map((s) => s.id);
  const steps = await db.select({ siteId: siteStatusEvents.siteId, status: siteStatusEvents.toStatus, on: siteStatusEvents.effectiveOn }).from(siteStatusEvents).where(inArray(siteStatusEvents.siteId, ids));
  const [v2] = await db.select().from(protocolVersions).where(and(eq(protocolVersions.studyId, study.id), eq(protocolVersions.versionLabel, "2.0")));
  const subjectRows = await db.select().from(subjects).where(eq(subjects.studyId, study.id));
  const finance = await db
    .select({ id: users.id })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(and(eq(memberships.studyId, study.id), eq(memberships.role, "sponsor_finance")))
    .limit(1);
  const actor = finance[0]?.id ?? null;

  // The site with the most screen failures gets a flat maximum of one, so some go over the cap.
  const sfBySite = new Map<string, number>();
  for (const s of subjectRows) if (s.status === "screen_failed") sfBySite.set(s.siteId, (sfBySite.get(s.siteId) ?? 0) + 1);
  const tightSite = [...sfBySite.entries()].filter(([, n]) => n >= 2).sort((a, b) => b[1] - a[1])[0]?.[0] ?? null;

  await db.transaction(async (tx) => {
    for (const site of siteRows) {
      const spec = siteTerms[site.code];
      if (!spec) continue;
      const startUp = steps.filter((s) => s.siteId === site.id && s.status === "start_up").map((s) => s.on).sort()[0] ?? "2026-11-15";
      const [budget] = await tx.insert(siteBudgets).values({ studyId: study.id, siteId: site.id, currency: site.currency, createdBy: actor }).returning();
      const addVersion = async (n: number, effectiveFrom: string, visits: Record<string, number>, extra: Partial<typeof budgetVersions.$inferInsert>) => {
        const [v] = await tx
          .insert(budgetVersions)
          .values({
            budgetId: budget!.id,
            siteId: site.id,
            versionNumber: n,
            effectiveFrom,
            screenFailureCapPerEnrolled: site.id === tightSite ? null : 4,
            screenFailureCapMax: site.id === tightSite ? 1 : null,
            ...spec.terms,
            createdBy: actor,
            ...extra,
          })
          .returning();
        const c = site.currency;
        await tx.insert(budgetItems).values([
          { budgetVersionId: v!.id, kind: "startup", amountMinor: fee(EUR_FEES.startup, spec.scale, c) },
          { budgetVersionId: v!.id, kind: "screen_failure", amountMinor: fee(EUR_FEES.screenFailure, spec.scale, c) },
          { budgetVersionId: v!.id, kind: "milestone", milestone: "site_activated", amountMinor: fee(EUR_FEES.activated, spec.scale, c) },
          { budgetVersionId: v!.id, kind: "milestone", milestone: "first_implant", amountMinor: fee(EUR_FEES.firstImplant, spec.scale, c) },
          { budgetVersionId: v!.id, kind: "milestone", milestone: "nth_enrolled", n: 5, amountMinor: fee(EUR_FEES.fifth, spec.scale, c) },
          { budgetVersionId: v!.id, kind: "milestone", milestone: "close_out", amountMinor: fee(EUR_FEES.closeOut, spec.scale, c) },
          ...Object.entries(visits).map(([code, eur]) => ({ budgetVersionId: v!.id, kind: "visit" as const, visitCode: code, amountMinor: fee(eur, spec.scale, c) })),
        ]);
        return v!;
      };
      await addVersion(1, startUp, EUR_VISITS, { reason: "Clinical trial agreement signed" });
      if (site.code === "DE01" && v2) {
        const [approval] = await tx.select().from(siteVersionApprovals).where(and(eq(siteVersionApprovals.siteId, site.id), eq(siteVersionApprovals.versionId, v2.id)));
        if (approval) {
          // Protocol 2.0 adds the month-18 visit and a safety MRI at month 12.
          await addVersion(2, approval.approvedOn, { ...EUR_VISITS, M12: 1100, M18: 650 }, { protocolVersionId: v2.id, reason: "Amendment 1 to the agreement: protocol 2.0 adds M18 and a safety MRI at M12" });
        }
      }
    }

    const de01 = siteRows.find((s) => s.code === "DE01");
    if (de01) {
      const put = await storage();
      const body = tinyPdf("Ethics committee fee invoice - site DE01");
      const storageKey = `${study.id}/${de01.id}/invoice/${randomUUID()}`;
      if (put) await put(storageKey, body);
      const [doc] = await tx
        .insert(documents)
        .values({ studyId: study.id, siteId: de01.id, purpose: "invoice", storageKey, fileName: "ethics-committee-fee-invoice.pdf", contentType: "application/pdf", sizeBytes: body.length, sha256: createHash("sha256").update(body).digest("hex"), state: "stored", uploaderId: actor! })
        .returning();
      await tx.insert(passThroughInvoices).values({ studyId: study.id, siteId: de01.id, documentId: doc!.id, description: "Ethics committee review fee", amountMinor: 120000n, approvedOn: "2025-03-12", approvedBy: actor });
    }
    await tx.insert(exchangeRates).values(RATES.map(([currency, rate, rateDate]) => ({ studyId: study.id, currency, reportingCurrency: study.reportingCurrency, rate, rateDate, source: "Invented demo rate", enteredBy: actor })));
  });

  // Payments: every line due by the end of October is paid five days before its due date, except
  // GB01's latest cycle (left overdue) and one US01 line paid in part.
  const versions = await db.select().from(budgetVersions).where(inArray(budgetVersions.siteId, ids));
  const items = await db.select().from(budgetItems).where(inArray(budgetItems.budgetVersionId, versions.map((v) => v.id)));
  const visitRows = await db
    .select({ id: visitRecords.id, subjectId: visitRecords.subjectId, visitCode: visitRecords.visitCode, outcome: visitRecords.outcome, actualDate: visitRecords.actualDate, dataEnteredOn: visitRecords.dataEnteredOn, verifiedOn: visitRecords.verifiedOn })
    .from(visitRecords)
    .innerJoin(subjects, eq(subjects.id, visitRecords.subjectId))
    .where(eq(subjects.studyId, study.id));
  const invoices = await db.select().from(passThroughInvoices).where(eq(passThroughInvoices.studyId, study.id));
  const schedule = computePaymentSchedule(
    buildSnapshot({
      asOf: DEMO_TODAY,
      sites: siteRows,
      siteSteps: steps,
      versions: versions.map((v) => ({ ...v, items: items.filter((i) => i.budgetVersionId === v.id) })),
      invoices,
      subjects: subjectRows,
      visits: visitRows,
      payments: [],
    }),
  );
  const code = new Map(siteRows.map((s) => [s.id, s.code]));
  const gbLatestDue = schedule.lines.filter((l) => code.get(l.siteId) === "GB01" && l.dueDate <= "2026-10-31").map((l) => l.dueDate).sort().pop();
  let partial = false;
  const rows: (typeof paymentsRecorded.$inferInsert)[] = [];
  for (const l of schedule.lines) {
    if (l.netMinor <= 0n || l.dueDate > "2026-10-31") continue;
    if (code.get(l.siteId) === "GB01" && l.dueDate === gbLatestDue) continue;
    let amount = l.netMinor;
    if (!partial && code.get(l.siteId) === "US01" && l.kind === "visit") {
      amount = l.netMinor / 2n;
      partial = true;
    }
    rows.push({ studyId: study.id, siteId: l.siteId, lineKey: l.key, amountMinor: amount, paidOn: addDays(l.dueDate, -5), reference: `KVP-${code.get(l.siteId)}-${l.cycle.label}`, recordedBy: actor });
  }
  for (let i = 0; i < rows.length; i += 500) await db.insert(paymentsRecorded).values(rows.slice(i, i + 500));
  const over = schedule.lines.filter((l) => l.overCap).length;
  log(`budgets: ${versions.length} budget versions, ${schedule.lines.length} earned lines (${over} screen failures over the cap), ${rows.length} payments recorded`);
}
