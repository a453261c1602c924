import "server-only";
import { and, eq, inArray } from "drizzle-orm";
import type { Tx } from "@/server/db/client";
import { protocolVersions, sites, subjects, subjectStatusEvents, visitRecords } from "@/server/db/schema";
import { notFound, unprocessable } from "@/server/api/errors";
import type { AuditEntry } from "@/server/audit/record-audit";
import { listVersionsInForceAtSite } from "@/server/protocol/in-force";
import { todayAtSite } from "@/server/sites/site-today";
import { reconcileSubjectDeviations } from "@/server/visits/reconcile-subject-deviations";
import type { Actor } from "@/lib/auth/authorize";
import { parseSubjectImport, type ImportError } from "@/lib/subjects/csv-import";
import { versionInForceOn } from "@/lib/visits/subject-calendar";

export type ImportReport = { imported: number; visits: number; codes: string[] };

function rowErrorFields(errors: ImportError[]) {
  const fields: Record<string, string[]> = {};
  for (const e of errors) (fields[`row ${e.row}${e.column ? ` · ${e.column}` : ""}`] ??= []).push(e.message);
  return fields;
}

/**
 * Imports a CSV of subjects and their recorded visits into one site, all or nothing: every row is
 * checked (file format in src/lib/subjects/csv-import.ts, then against the database) and any
 * problem rejects the whole file with a row-by-row report (422, fields keyed "row N · column").
 */
export async function importSubjects(tx: Tx, { siteId, csv, actor, audit, now = new Date() }: { siteId: string; csv: string; actor: Actor; audit: (e: AuditEntry) => Promise<void>; now?: Date }): Promise<ImportReport> {
  const [site] = await tx.select().from(sites).where(eq(sites.id, siteId));
  if (!site) throw notFound("That site");
  const today = todayAtSite(site.timeZone, now);
  const versions = await listVersionsInForceAtSite(tx, { siteId });
  const study = await tx.select({ schedule: protocolVersions.visitSchedule }).from(protocolVersions).where(and(eq(protocolVersions.studyId, site.studyId), inArray(protocolVersions.state, ["released", "superseded"])));
  const parsed = parseSubjectImport(csv, { schedules: study.map((s) => s.schedule), allowedSiteCodes: [site.code], today });
  if (!parsed.ok) throw unprocessable(`Nothing was imported: ${parsed.errors.length} problem(s) in the file.`, rowErrorFields(parsed.errors));

  const errors: ImportError[] = [];
  const codes = parsed.subjects.map((s) => s.subjectCode);
  const existing = codes.length ? await tx.select({ code: subjects.code }).from(subjects).where(and(eq(subjects.studyId, site.studyId), inArray(subjects.code, codes))) : [];
  const taken = new Set(existing.map((e) => e.code));
  const plans = parsed.subjects.map((s) => {
    if (taken.has(s.subjectCode)) errors.push({ row: s.row, column: "subject_code", message: `Subject ${s.subjectCode} already exists in the study` });
    const consentVersion = versionInForceOn(versions, s.consentDate);
    if (!consentVersion) errors.push({ row: s.row, column: "consent_date", message: `No protocol version was in force at ${site.code} on ${s.consentDate}` });
    const visits = s.visits.map((v) => {
      const version = versionInForceOn(versions, v.visitDate ?? today);
      if (!version) errors.push({ row: v.row, column: "visit_date", message: `No protocol version was in force at ${site.code} on ${v.visitDate}` });
      else if (!version.schedule.some((x) => x.code === v.visitCode)) {
        errors.push({ row: v.row, column: "visit_code", message: `Visit ${v.visitCode} is not in protocol version ${version.versionLabel}, in force on ${v.visitDate ?? today}` });
      }
      return { ...v, versionId: version?.versionId };
    });
    const dates = [s.consentDate, s.screeningDate, s.enrolmentDate, s.implantDate, ...s.visits.map((v) => v.visitDate)].filter((d): d is string => !!d).sort();
    const endedOn = s.status === "screen_failed" || s.status === "withdrawn" || s.status === "completed" ? dates.at(-1)! : null;
    return { s, consentVersionId: consentVersion?.versionId, visits, endedOn };
  });
  if (errors.length > 0) {
    errors.sort((a, b) => a.row - b.row);
    throw unprocessable(`Nothing was imported: ${errors.length} problem(s) in the file.`, rowErrorFields(errors));
  }

  let visitCount = 0;
  for (const { s, consentVersionId, visits, endedOn } of plans) {
    const [row] = await tx
      .insert(subjects)
      .values({
        studyId: site.studyId,
        siteId,
        code: s.subjectCode,
        status: s.status,
        consentDate: s.consentDate,
        consentVersionId: consentVersionId!,
        screeningDate: s.screeningDate,
        enrolmentDate: s.enrolmentDate,
        implantDate: s.implantDate,
        deviceSerial: s.deviceSerial,
        screenFailReason: s.screenFailReason,
        withdrawnReason: s.withdrawnReason,
        endedOn,
        createdBy: actor.userId,
      })
      .returning();
    await tx.insert(subjectStatusEvents).values({
      subjectId: row!.id,
      fromStatus: null,
      toStatus: s.status,
      effectiveOn: endedOn ?? s.implantDate ?? s.enrolmentDate ?? s.screeningDate ?? s.consentDate,
      reason: s.screenFailReason ?? s.withdrawnReason ?? "Imported from a file",
      actorId: actor.userId,
    });
    if (visits.length) {
      await tx.insert(visitRecords).values(
        visits.map((v) => ({ subjectId: row!.id, visitCode: v.visitCode, versionId: v.versionId!, outcome: v.outcome, actualDate: v.visitDate, dataEnteredOn: null, recordedBy: actor.userId })),
      );
      visitCount += visits.length;
    }
    await audit({ action: "subject.import", entityType: "subject", entityId: row!.id, after: { ...row, visits: visits.map((v) => ({ visitCode: v.visitCode, outcome: v.outcome, actualDate: v.visitDate })) } });
    await reconcileSubjectDeviations(tx, { subjectId: row!.id, audit, now });
  }
  return { imported: plans.length, visits: visitCount, codes };
}
