import "server-only";
import { and, asc, eq, inArray, sql } from "drizzle-orm";
import type { Tx } from "@/server/db/client";
import { passThroughInvoices, siteStatusEvents, sites, studies } from "@/server/db/schema";
import type { PgColumn } from "drizzle-orm/pg-core";
import { notFound } from "@/server/api/errors";
import { listBudgetVersions } from "@/server/budgets/queries";
import { buildSnapshot } from "@/lib/ledger/build-snapshot";
import { parsePaymentRow, parseVisitRow, paymentRowSql, visitRowSql } from "@/lib/ledger/snapshot-rows";
import { listVersionsInForceAtSites } from "@/server/protocol/in-force";
import { CalendarInputError, computeSubjectCalendar } from "@/lib/visits";
import { localDate, type PaymentScheduleSnapshot, type ProjectionInput } from "@/lib/payment-schedule";
import type { SubjectStatus } from "@/lib/subjects/subject-states";

// Builds the payment-schedule engine's input for one site, some sites or the whole study: a few
// set-based queries (no per-row queries), then the pure engine does the rest.

export type LedgerSite = { id: string; code: string; name: string; currency: string; timeZone: string; status: string };

export interface LoadedSnapshot {
  study: { id: string; code: string; reportingCurrency: string };
  sites: LedgerSite[];
  snapshot: PaymentScheduleSnapshot;
}

const NO_SITE = "00000000-0000-4000-8000-000000000000";

type SubjectRow = { id: string; siteId: string; code: string; status: SubjectStatus; consentDate: string; screeningDate: string | null; enrolmentDate: string | null; implantDate: string | null; endedOn: string | null };

type Queryable = { query: (config: { text: string; values: unknown[]; rowMode: "array" }) => Promise<{ rows: unknown[][] }> };

/**
 * Rows as arrays, straight from pg (no per-row objects keyed by column name, no ORM mapping): the
 * three large reads are 10,000s of rows. Columns come as text (dates cast; uuids arrive as text).
 * Runs on the handle's own client: the pool outside a transaction (so concurrent reads take
 * separate connections), the transaction's connection inside one.
 */
async function arrayRows(tx: Tx, text: string, values: unknown[]): Promise<(string | null)[][]> {
  const client = (tx as unknown as { session?: { client?: Queryable } }).session?.client;
  if (!client || typeof client.query !== "function") throw new Error("loadScheduleSnapshot: the database handle exposes no pg client");
  return (await client.query({ text, values, rowMode: "array" })).rows as (string | null)[][];
}
const ENROLLED_STATES: SubjectStatus[] = ["enrolled", "implanted", "follow_up"];

export async function loadScheduleSnapshot(
  tx: Tx,
  { studyId, siteIds, asOf, projection = false }: { studyId: string; siteIds: "all" | readonly string[]; asOf: string; projection?: boolean },
): Promise<LoadedSnapshot> {
  const [study] = await tx.select({ id: studies.id, code: studies.code, reportingCurrency: studies.reportingCurrency }).from(studies).where(eq(studies.id, studyId)).limit(1);
  if (!study) throw notFound("That study");
  const siteFilter = siteIds === "all" ? undefined : inArray(sites.id, siteIds.length ? [...siteIds] : [NO_SITE]);
  const siteRows = await tx
    .select({ id: sites.id, code: sites.code, name: sites.name, currency: sites.currency, timeZone: sites.timeZone, status: sites.status })
    .from(sites)
    .where(and(eq(sites.studyId, studyId), siteFilter))
    .orderBy(asc(sites.code));
  const ids = siteRows.map((s) => s.id);
  const inSites = (col: PgColumn) => inArray(col, ids.length ? ids : [NO_SITE]);

  const [steps, versions, subjectRows, visitRows, invoices, payments] = await Promise.all([
    tx
      .select({ siteId: siteStatusEvents.siteId, status: siteStatusEvents.toStatus, on: sql<string>`min(${siteStatusEvents.effectiveOn})::text` })
      .from(siteStatusEvents)
      .where(and(inSites(siteStatusEvents.siteId), inArray(siteStatusEvents.toStatus, ["open", "enrolment_closed", "closed_out"])))
      .groupBy(siteStatusEvents.siteId, siteStatusEvents.toStatus),
    listBudgetVersions(tx, { siteIds: ids }),
    // The three large reads skip the query builder: plain rows as arrays, dates as text.
    arrayRows(
      tx,
      `select id, site_id, code, status::text, consent_date::text, screening_date::text, enrolment_date::text, implant_date::text, ended_on::text
        from subjects where study_id = $1 ${siteIds === "all" ? "" : "and site_id = any($2::uuid[])"}
        order by site_id, id`,
      siteIds === "all" ? [studyId] : [studyId, ids],
    ).then((rows) =>
      rows.map((r): SubjectRow => ({ id: r[0]!, siteId: r[1]!, code: r[2]!, status: r[3] as SubjectStatus, consentDate: r[4]!, screeningDate: r[5] ?? null, enrolmentDate: r[6] ?? null, implantDate: r[7] ?? null, endedOn: r[8] ?? null })),
    ),
    // Visits and payments come as one text column per row (src/lib/ledger/snapshot-rows.ts). A missed
    // visit earns nothing and the engine skips it: only the projection reads them. Subjects, visits
    // and payments come grouped by site (visits by subject within it): the engine then reads each
    // site's objects where they lie together in memory, in the order they were made (any order gives
    // the same result, in about twice the time at 150,000 visits).
    arrayRows(
      tx,
      `select ${visitRowSql(projection ? "vr.version_id" : "''")}
        from visit_records vr join subjects su on su.id = vr.subject_id
        where su.study_id = $1 and vr.actual_date is not null ${projection ? "" : "and vr.outcome = 'done'"} ${siteIds === "all" ? "" : "and su.site_id = any($2::uuid[])"}
        order by su.site_id, vr.subject_id`,
      siteIds === "all" ? [studyId] : [studyId, ids],
    ).then((rows) => rows.map((r) => parseVisitRow(r[0] as string))),
    tx.select().from(passThroughInvoices).where(and(eq(passThroughInvoices.studyId, studyId), inSites(passThroughInvoices.siteId))),
    arrayRows(
      tx,
      `select ${paymentRowSql} from payments_recorded where study_id = $1 ${siteIds === "all" ? "" : "and site_id = any($2::uuid[])"} order by site_id`,
      siteIds === "all" ? [studyId] : [studyId, ids],
    ).then((rows) => rows.map((r) => parsePaymentRow(r[0] as string))),
  ]);

  const snapshot: PaymentScheduleSnapshot = buildSnapshot({ asOf, sites: siteRows, siteSteps: steps, versions, invoices, subjects: subjectRows, visits: visitRows, payments });

  if (projection) snapshot.projection = await projectionInput(tx, { siteRows, subjectRows, visitRows, asOf });
  return { study, sites: siteRows, snapshot };
}

/** Upcoming calendar visits of enrolled subjects, and the visit plan of a newly enrolled subject. */
async function projectionInput(
  tx: Tx,
  {
    siteRows,
    subjectRows,
    visitRows,
    asOf,
  }: {
    siteRows: LedgerSite[];
    subjectRows: { id: string; siteId: string; code: string; status: SubjectStatus; consentDate: string; enrolmentDate: string | null; implantDate: string | null; endedOn: string | null }[];
    visitRows: { subjectId: string; visitCode: string; versionId: string; outcome: "done" | "missed"; actualDate: string | null; dataEnteredOn: string | null; verifiedOn: string | null }[];
    asOf: string;
  },
): Promise<ProjectionInput> {
  const inForce = await listVersionsInForceAtSites(tx, { siteIds: siteRows.map((s) => s.id) });
  const zone = new Map(siteRows.map((s) => [s.id, s.timeZone]));
  const visitsBySubject = new Map<string, typeof visitRows>();
  for (const v of visitRows) {
    const list = visitsBySubject.get(v.subjectId) ?? [];
    list.push(v);
    visitsBySubject.set(v.subjectId, list);
  }
  const scheduledVisits: ProjectionInput["scheduledVisits"] = [];
  const gaps: number[] = [];
  for (const s of subjectRows) {
    if (s.enrolmentDate && s.implantDate) gaps.push((Date.parse(s.implantDate) - Date.parse(s.enrolmentDate)) / 86_400_000);
    if (!ENROLLED_STATES.includes(s.status)) continue;
    const versions = inForce.get(s.siteId) ?? [];
    if (versions.length === 0) continue;
    let calendar: ReturnType<typeof computeSubjectCalendar>;
    // A subject whose records the calendar cannot place is left out of the projection, not fatal.
    try {
      calendar = computeSubjectCalendar({
      subjectCode: s.code,
      status: s.status,
      endedOn: s.endedOn,
      anchors: { consentDate: s.consentDate, enrolmentDate: s.enrolmentDate, implantDate: s.implantDate },
      versions,
      recordedVisits: (visitsBySubject.get(s.id) ?? []).map((v) => ({ visitCode: v.visitCode, versionId: v.versionId, actualDate: v.actualDate, status: v.outcome, dataEnteredOn: v.dataEnteredOn, verifiedOn: v.verifiedOn })),
      asOf: localDate(asOf, zone.get(s.siteId) ?? "UTC"),
      dueSoonDays: 0,
      });
    } catch (err) {
      if (err instanceof CalendarInputError) continue;
      throw err;
    }
    for (const e of calendar.entries) {
      if (!e.recorded && e.targetDate && (e.state === "upcoming" || e.state === "due" || e.state === "overdue")) scheduledVisits.push({ subjectId: s.id, visitCode: e.visitCode, targetDate: e.targetDate });
    }
  }
  // A new subject follows the newest schedule in force anywhere; implant-anchored visits are placed
  // after enrolment by the median enrolment-to-implant gap observed in the study.
  gaps.sort((a, b) => a - b);
  const implantGap = gaps.length ? Math.round(gaps[Math.floor(gaps.length / 2)]!) : 0;
  let newest: { inForceFrom: string; schedule: { code: string; anchor: string; dayOffset: number }[] } | null = null;
  for (const list of inForce.values()) for (const v of list) if (!newest || v.inForceFrom > newest.inForceFrom) newest = v;
  const newSubjectVisitPlan = (newest?.schedule ?? []).map((v) => ({
    visitCode: v.code,
    dayOffset: Math.max(0, v.dayOffset + (v.anchor === "implant" ? implantGap : 0)),
  }));
  return { scheduledVisits, newSubjectVisitPlan, horizonMonths: 12 };
}
