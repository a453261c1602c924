import "server-only";
import { and, eq } from "drizzle-orm";
import type { Tx } from "@/server/db/client";
import { visitRecords, type VisitRecord } from "@/server/db/schema";
import { conflict, unprocessable, type FieldErrors } from "@/server/api/errors";
import type { AuditEntry } from "@/server/audit/record-audit";
import { loadSubjectForUpdate } from "@/server/subjects/load-subject";
import type { Actor } from "@/lib/auth/authorize";
import { loadCalendars } from "./load-calendars";
import { reconcileSubjectDeviations } from "./reconcile-subject-deviations";
import type { RecordVisitInput } from "./visit-schemas";
import type { VersionInForceAtSite } from "@/server/protocol/in-force";
import { versionInForceOn } from "@/lib/visits/subject-calendar";

// A visit is done under the version in force at the site on its date (a late entry of a visit
// done before an amendment keeps the earlier schedule), when that version has the visit.
function versionForNewRecord(versions: readonly VersionInForceAtSite[], actualDate: string | null, visitCode: string): string | null {
  if (!actualDate) return null;
  const v = versionInForceOn(versions, actualDate);
  return v && v.schedule.some((x) => x.code === visitCode) ? v.versionId : null;
}

/**
 * Records (or corrects) a visit as done or missed. A new record follows the version in force at the
 * site on the visit date (else the one the pending visit shows, in force today); a correction keeps
 * the version it was first recorded under. A change of date or outcome clears the monitor's
 * verification. Deviations are reconciled afterwards.
 */
export async function recordVisit(
  tx: Tx,
  { subjectId, input, actor, audit, now = new Date() }: { subjectId: string; input: RecordVisitInput; actor: Actor; audit: (e: AuditEntry) => Promise<void>; now?: Date },
): Promise<{ before: VisitRecord | null; after: VisitRecord; changed: boolean }> {
  const { subject } = await loadSubjectForUpdate(tx, { subjectId });
  if (subject.status === "screen_failed") throw conflict(`Subject ${subject.code} failed screening and has no study visits.`);
  const [loaded] = await loadCalendars(tx, { subjectIds: [subjectId], now });
  const calendar = loaded!.calendar;
  const today = calendar.asOf;
  const [before] = await tx.select().from(visitRecords).where(and(eq(visitRecords.subjectId, subjectId), eq(visitRecords.visitCode, input.visitCode)));
  const entry = calendar.entries.find((e) => e.visitCode === input.visitCode);
  if (!before && !entry) {
    const label = calendar.versionInForce ? `protocol version ${calendar.versionInForce.versionLabel}` : "any protocol version in force at the site";
    throw unprocessable(`Visit ${input.visitCode} is not in the schedule of ${label}.`, { visitCode: ["Not in the schedule in force"] });
  }
  const actualDate = input.actualDate ?? null;
  const dataEnteredOn = input.dataEnteredOn ?? null;
  const fields: FieldErrors = {};
  const add = (k: string, m: string) => (fields[k] ??= []).push(m);
  if (input.outcome === "done" && !actualDate) add("actualDate", "A visit done needs its date");
  if (actualDate && actualDate > today) add("actualDate", `Not after today at the site (${today})`);
  if (actualDate && actualDate < subject.consentDate) add("actualDate", `Not before the consent date (${subject.consentDate})`);
  if (dataEnteredOn && dataEnteredOn > today) add("dataEnteredOn", `Not after today at the site (${today})`);
  if (dataEnteredOn && actualDate && dataEnteredOn < actualDate) add("dataEnteredOn", "Data are entered on or after the visit date");
  if (entry && !before && input.outcome === "done" && entry.anchorDate === null && entry.state === "not_scheduled") {
    add("visitCode", `Visit ${input.visitCode} counts from the ${entry.anchor} date, which is not recorded yet`);
  }
  if (Object.keys(fields).length > 0) throw unprocessable(Object.values(fields)[0]![0]!, fields);

  let after: VisitRecord;
  if (before) {
    const changed = before.outcome !== input.outcome || before.actualDate !== actualDate;
    if (!changed && before.dataEnteredOn === dataEnteredOn) {
      return { before, after: before, changed: false };
    }
    [after] = (await tx
      .update(visitRecords)
      .set({ outcome: input.outcome, actualDate, dataEnteredOn, recordedBy: actor.userId, updatedAt: now, ...(changed ? { verifiedOn: null, verifiedBy: null } : {}) })
      .where(eq(visitRecords.id, before.id))
      .returning()) as [VisitRecord];
  } else {
    [after] = (await tx
      .insert(visitRecords)
      .values({ subjectId, visitCode: input.visitCode, versionId: versionForNewRecord(loaded!.versions, actualDate, input.visitCode) ?? entry!.versionId, outcome: input.outcome, actualDate, dataEnteredOn, recordedBy: actor.userId })
      .returning()) as [VisitRecord];
  }
  await audit({ action: before ? "visit.correct" : "visit.record", entityType: "visit_record", entityId: after.id, before, after: { ...after, subjectCode: subject.code } });
  await reconcileSubjectDeviations(tx, { subjectId, audit, now });
  return { before: before ?? null, after, changed: true };
}
