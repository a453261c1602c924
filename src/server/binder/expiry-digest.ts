import "server-only";
import { and, eq, isNull } from "drizzle-orm";
import type { Tx } from "@/server/db/client";
import { memberships, studies, users } from "@/server/db/schema";
import { enqueueMail } from "@/server/mail/enqueue-mail";
import type { ScheduledJob } from "@/server/jobs/run-scheduled-job";
import { isoWeekKey } from "@/lib/binder/dates";
import { describeItem, type BinderItem } from "@/lib/binder/readiness";
import { loadStudyBinders } from "./study-matrix";

const line = (i: BinderItem) =>
  `- ${describeItem(i)}${i.current?.expiresOn ? ` (valid through ${i.current.expiresOn}${i.daysToExpiry !== null && i.daysToExpiry >= 0 ? `, ${i.daysToExpiry} days left` : ""})` : ""}`;

/**
 * The weekly digest of expired and expiring documents: each site's coordinators and investigators
 * get their site's list, sponsor administrators the whole study's. One message per person, site
 * and ISO week (the outbox key), so a repeated run sends nothing twice.
 */
export async function sendExpiryDigest(tx: Tx, { now, periodKey }: { now: Date; periodKey: string }) {
  let queued = 0;
  const allStudies = await tx.select({ id: studies.id, code: studies.code }).from(studies);
  for (const study of allStudies) {
    const { binders } = await loadStudyBinders(tx, { studyId: study.id, siteIds: "all", now });
    const people = await tx
      .select({ userId: users.id, email: users.email, siteId: memberships.siteId, role: memberships.role })
      .from(memberships)
      .innerJoin(users, eq(users.id, memberships.userId))
      .where(and(eq(memberships.studyId, study.id), isNull(memberships.revokedAt), isNull(users.disabledAt)));
    const summary: string[] = [];
    for (const { site, binder } of binders) {
      const due = binder.items.filter((i) => (i.required || i.current) && (i.state === "expired" || i.state === "expiring"));
      if (due.length === 0) continue;
      const text = due.map(line).join("\n");
      summary.push(`Site ${site.code} ${site.name}\n${text}`);
      const recipients = new Map(people.filter((p) => p.siteId === site.id && (p.role === "coordinator" || p.role === "investigator")).map((p) => [p.userId, p.email]));
      for (const [userId, email] of recipients) {
        const sent = await enqueueMail(tx, {
          dedupeKey: `binder-expiry:${periodKey}:${site.id}:${userId}`,
          to: email,
          subject: `${study.code} site ${site.code}: ${due.length} document${due.length === 1 ? "" : "s"} expired or expiring (${periodKey})`,
          text: `Essential documents of site ${site.code} that have expired or expire within 60 days:\n\n${text}\n\nUpload the renewed documents in Cairn under Documents.`,
        });
        if (sent) queued++;
      }
    }
    if (summary.length === 0) continue;
    const admins = new Map(people.filter((p) => p.role === "sponsor_admin").map((p) => [p.userId, p.email]));
    for (const [userId, email] of admins) {
      const sent = await enqueueMail(tx, {
        dedupeKey: `binder-expiry:${periodKey}:study:${study.id}:${userId}`,
        to: email,
        subject: `${study.code}: expired and expiring essential documents (${periodKey})`,
        text: `${summary.join("\n\n")}\n`,
      });
      if (sent) queued++;
    }
  }
  return { queued };
}

export const expiringDocumentsDigest: ScheduledJob = {
  name: "binder-expiry-digest",
  periodKey: (now) => isoWeekKey(now),
  run: async ({ now, periodKey, tx }) => {
    await sendExpiryDigest(tx, { now, periodKey });
  },
};
