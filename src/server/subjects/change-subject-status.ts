import "server-only";
import { eq } from "drizzle-orm";
import type { Tx } from "@/server/db/client";
import { subjects, subjectStatusEvents, type Subject } from "@/server/db/schema";
import { conflict, unprocessable } from "@/server/api/errors";
import type { AuditEntry } from "@/server/audit/record-audit";
import { todayAtSite } from "@/server/sites/site-today";
import { reconcileSubjectDeviations } from "@/server/visits/reconcile-subject-deviations";
import type { Actor } from "@/lib/auth/authorize";
import { checkSubjectTransition } from "@/lib/subjects/subject-states";
import { loadSubjectForUpdate } from "./load-subject";
import { checkSubjectDates } from "./subject-dates";
import type { SubjectStatusChangeInput } from "./subject-schemas";

/**
 * One step of the subject path. The step's date becomes the enrolment or implant date, or the end
 * date (screen failure, completion, withdrawal); a reason is required for Screen failed and
 * Withdrawn, the device serial for Implanted.
 */
export async function changeSubjectStatus(
  tx: Tx,
  { subjectId, input, actor, audit, now = new Date() }: { subjectId: string; input: SubjectStatusChangeInput; actor: Actor; audit: (e: AuditEntry) => Promise<void>; now?: Date },
): Promise<{ before: Subject; after: Subject }> {
  const { subject: before, site } = await loadSubjectForUpdate(tx, { subjectId });
  const check = checkSubjectTransition(before.status, input.to, { reason: input.reason });
  if (!check.ok) {
    if (check.code === "same_status" || check.code === "final_status") throw conflict(check.message);
    throw unprocessable(check.message, { [check.code.startsWith("reason") ? "reason" : "to"]: [check.message] });
  }
  const today = todayAtSite(site.timeZone, now);
  const on = input.effectiveOn ?? today;
  const reason = input.reason?.trim() || null;
  const next: Subject = { ...before, status: input.to };
  switch (input.to) {
    case "enrolled":
      next.enrolmentDate = on;
      break;
    case "implanted":
      next.implantDate = on;
      next.deviceSerial = input.deviceSerial ?? before.deviceSerial;
      break;
    case "screen_failed":
      next.screenFailReason = reason;
      next.endedOn = on;
      break;
    case "withdrawn":
      next.withdrawnReason = reason;
      next.endedOn = on;
      break;
    case "completed":
      next.endedOn = on;
      break;
    default:
      break;
  }
  if (input.to !== "implanted" && input.deviceSerial) throw unprocessable("A device serial is recorded with the implant.", { deviceSerial: ["Only when moving to Implanted"] });
  const fields = checkSubjectDates(next, today);
  const lastStepDate = [before.consentDate, before.screeningDate, before.enrolmentDate, before.implantDate].filter((d): d is string => !!d).sort().at(-1)!;
  if (on < lastStepDate) (fields.effectiveOn ??= []).push(`Not before the subject's previous step (${lastStepDate})`);
  if (on > today) (fields.effectiveOn ??= []).push(`Not after today at the site (${today})`);
  if (Object.keys(fields).length > 0) throw unprocessable(Object.values(fields)[0]![0]!, fields);
  const { id: _id, createdAt: _c, ...values } = next;
  const [after] = await tx.update(subjects).set({ ...values, updatedAt: now }).where(eq(subjects.id, subjectId)).returning();
  await tx.insert(subjectStatusEvents).values({ subjectId, fromStatus: before.status, toStatus: input.to, effectiveOn: on, reason, actorId: actor.userId });
  await reconcileSubjectDeviations(tx, { subjectId, audit, now });
  return { before, after: after! };
}
