import "server-only";
import { and, eq, inArray, isNull } from "drizzle-orm";
import { env } from "@/env";
import type { Tx } from "@/server/db/client";
import { memberships, studies, users } from "@/server/db/schema";
import { enqueueMail } from "@/server/mail/enqueue-mail";
import { acknowledgementPath, describeStatus, reminderDue, siteDateAt } from "@/lib/acknowledgements";
import type { ScheduledJob } from "@/server/jobs/run-scheduled-job";
import { listAcknowledgementMatrix, type MatrixRow } from "./list-matrix";
import { requestForJoinedInvestigators } from "./joined-investigators";

/** Days before the due date when the reminder goes out (common practice: a few days' notice). */
export const REMINDER_DAYS_BEFORE = 3;
/** Roles that receive the overdue digest: the sponsor's people who own the protocol. */
export const DIGEST_ROLES = ["sponsor_admin", "medical_reviewer"] as const;

const utcDay = (now: Date) => now.toISOString().slice(0, 10);

/** Reminders to investigators whose acknowledgement falls due within a few days; one per task. */
export async function sendAcknowledgementReminders(tx: Tx, { now }: { now: Date }) {
  await requestForJoinedInvestigators(tx, { now });
  let sent = 0;
  for (const study of await tx.select().from(studies)) {
    const pending = await listAcknowledgementMatrix(tx, { studyId: study.id, siteIds: "all", state: "pending", now });
    for (const r of pending) {
      if (r.status.state !== "pending") continue;
      if (!reminderDue({ dueOn: r.dueOn, today: siteDateAt(now, r.timeZone), daysBefore: REMINDER_DAYS_BEFORE })) continue;
      const queued = await enqueueMail(tx, {
        dedupeKey: `ack-reminder:${r.requestId}`,
        to: r.investigatorEmail,
        subject: `[${study.code}] Reminder: acknowledge protocol version ${r.versionLabel} by ${r.dueOn}`,
        text: [
          `Dear ${r.investigatorName},`,
          "",
          `Your acknowledgement of protocol version ${r.versionLabel} for site ${r.siteCode} is due on ${r.dueOn} (site time, ${r.timeZone}): ${describeStatus(r.status)}.`,
          `Acknowledge: ${env.NEXTAUTH_URL}${acknowledgementPath(study.id, r.requestId)}`,
        ].join("\n"),
      });
      if (queued) sent++;
    }
  }
  return { sent };
}

/** One digest a day per sponsor person listing every overdue acknowledgement of their study. */
export async function sendOverdueDigests(tx: Tx, { now, periodKey }: { now: Date; periodKey: string }) {
  let sent = 0;
  for (const study of await tx.select().from(studies)) {
    const overdue = await listAcknowledgementMatrix(tx, { studyId: study.id, siteIds: "all", state: "overdue", now });
    if (overdue.length === 0) continue;
    const recipients = await tx
      .selectDistinct({ id: users.id, email: users.email, name: users.name })
      .from(memberships)
      .innerJoin(users, eq(users.id, memberships.userId))
      .where(and(eq(memberships.studyId, study.id), isNull(memberships.siteId), isNull(memberships.revokedAt), isNull(users.disabledAt), inArray(memberships.role, [...DIGEST_ROLES])));
    const bySite = new Map<string, MatrixRow[]>();
    for (const r of overdue) bySite.set(r.siteCode, [...(bySite.get(r.siteCode) ?? []), r]);
    const lines = [`${overdue.length} overdue protocol acknowledgement${overdue.length === 1 ? "" : "s"} in study ${study.code} on ${periodKey}:`, ""];
    for (const [site, rows] of [...bySite.entries()].sort()) {
      lines.push(`Site ${site}`);
      for (const r of rows) lines.push(`  - ${r.investigatorName}: version ${r.versionLabel}, due ${r.dueOn}, ${describeStatus(r.status)}`);
    }
    lines.push("", `Compliance matrix: ${env.NEXTAUTH_URL}/studies/${study.id}/acknowledgements?state=overdue`);
    for (const p of recipients) {
      const queued = await enqueueMail(tx, {
        dedupeKey: `ack-overdue-digest:${study.id}:${p.id}:${periodKey}`,
        to: p.email,
        subject: `[${study.code}] ${overdue.length} overdue protocol acknowledgement${overdue.length === 1 ? "" : "s"} (${periodKey})`,
        text: [`Dear ${p.name},`, "", ...lines].join("\n"),
      });
      if (queued) sent++;
    }
  }
  return { sent };
}

export const acknowledgementReminderJob: ScheduledJob = {
  name: "acknowledgement-reminders",
  periodKey: utcDay,
  run: async ({ now, tx }) => {
    await sendAcknowledgementReminders(tx, { now });
  },
};

export const overdueAcknowledgementDigestJob: ScheduledJob = {
  name: "acknowledgement-overdue-digest",
  periodKey: utcDay,
  run: async ({ now, periodKey, tx }) => {
    await sendOverdueDigests(tx, { now, periodKey });
  },
};
