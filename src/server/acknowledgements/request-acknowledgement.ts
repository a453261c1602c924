import "server-only";
import { and, desc, eq } from "drizzle-orm";
import { env } from "@/env";
import type { Tx } from "@/server/db/client";
import { acknowledgementRequests, electronicSignatures } from "@/server/db/schema";
import { enqueueMail } from "@/server/mail/enqueue-mail";
import { recordAudit } from "@/server/audit/record-audit";
import { acknowledgementDueOn, acknowledgementPath, protocolVersionPath, redlinePath } from "@/lib/acknowledgements";
import type { Actor } from "@/lib/auth/authorize";

export type RequestTarget = {
  study: { id: string; code: string; ackDeadlineDays: number };
  site: { id: string; code: string; name: string; timeZone: string };
  version: { id: string; versionLabel: string; title: string; parentId?: string | null };
  investigator: { id: string; email: string; name: string };
  reason: "release" | "joined";
  /** When the clock starts (the release, or now for someone who joined later). */
  requestedAt: Date;
};

/** The version this person last acknowledged at the site, if any (for the redline link). */
export async function lastAcknowledgedVersionId(tx: Tx, { userId, siteId }: { userId: string; siteId: string }): Promise<string | null> {
  const [row] = await tx
    .select({ versionId: electronicSignatures.versionId })
    .from(electronicSignatures)
    .where(and(eq(electronicSignatures.signerId, userId), eq(electronicSignatures.siteId, siteId)))
    .orderBy(desc(electronicSignatures.signedAt))
    .limit(1);
  return row?.versionId ?? null;
}

/**
 * Create one acknowledgement task and queue its e-mail, in the caller's transaction. Idempotent:
 * an existing task for the same version, site and person is left as it is (returns null).
 */
export async function requestAcknowledgement(tx: Tx, t: RequestTarget, actor: Pick<Actor, "userId" | "name"> | null = null) {
  const compareTo = await lastAcknowledgedVersionId(tx, { userId: t.investigator.id, siteId: t.site.id });
  const dueOn = acknowledgementDueOn(t.requestedAt, t.site.timeZone, t.study.ackDeadlineDays);
  const [row] = await tx
    .insert(acknowledgementRequests)
    .values({
      studyId: t.study.id,
      siteId: t.site.id,
      versionId: t.version.id,
      userId: t.investigator.id,
      reason: t.reason,
      compareToVersionId: compareTo === t.version.id ? null : compareTo,
      requestedAt: t.requestedAt,
      dueOn,
    })
    .onConflictDoNothing()
    .returning();
  if (!row) return null;

  const base = env.NEXTAUTH_URL;
  const lines = [
    `Dear ${t.investigator.name},`,
    "",
    t.reason === "release"
      ? `Protocol version ${t.version.versionLabel} of study ${t.study.code} ("${t.version.title}") has been released.`
      : `You have joined site ${t.site.code} of study ${t.study.code}; protocol version ${t.version.versionLabel} is in force there.`,
    `Please read it and acknowledge it with your electronic signature for site ${t.site.code} (${t.site.name}) by ${dueOn} (site time, ${t.site.timeZone}).`,
    "",
    `Acknowledge: ${base}${acknowledgementPath(t.study.id, row.id)}`,
    `Read the version: ${base}${protocolVersionPath(t.study.id, t.version.id)}`,
    row.compareToVersionId
      ? `Changes since the version you last acknowledged: ${base}${redlinePath(t.study.id, row.compareToVersionId, t.version.id)}`
      : t.version.parentId
        ? `You have not acknowledged an earlier version at this site. Changes from the version this one amends: ${base}${redlinePath(t.study.id, t.version.parentId, t.version.id)}`
        : "This is the first version of the protocol: there is no earlier version to compare with.",
    "",
    "The approved protocol and your ethics committee's decisions govern; this message is a reminder of the task in Cairn.",
  ];
  await enqueueMail(tx, {
    dedupeKey: `ack-request:${row.id}`,
    to: t.investigator.email,
    subject: `[${t.study.code}] Acknowledge protocol version ${t.version.versionLabel} by ${dueOn}`,
    text: lines.join("\n"),
  });
  await recordAudit(tx, actor, {
    action: "acknowledgement.requested",
    entityType: "acknowledgement_request",
    entityId: row.id,
    studyId: t.study.id,
    siteId: t.site.id,
    after: { versionId: t.version.id, versionLabel: t.version.versionLabel, userId: t.investigator.id, reason: t.reason, dueOn },
  });
  return row;
}
