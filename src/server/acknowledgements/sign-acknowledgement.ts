import "server-only";
import { and, eq, isNull } from "drizzle-orm";
import { db, type Tx } from "@/server/db/client";
import { recordAudit } from "@/server/audit/record-audit";
import { acknowledgementRequests, electronicSignatures, memberships, protocolVersions, sites, studies, users } from "@/server/db/schema";
import { verifyPassword } from "@/server/auth/password";
import { isThrottled, recordAttempt } from "@/server/auth/throttle";
import { AppError, conflict, unprocessable } from "@/server/api/errors";
import { hashProtocolContent } from "@/lib/protocol/content-hash";
import { acknowledgementMeaning, formatSiteLocalTime } from "@/lib/acknowledgements";
import type { Actor } from "@/lib/auth/authorize";

export type SignInput = { studyId: string; siteId: string; versionId: string; password: string; now?: Date; ip?: string | null };

/**
 * Sign an acknowledgement of a protocol version at a site (21 CFR Part 11 §11.50, §11.200(a) as the
 * model): the signer re-enters their password, the record holds printed name, time in UTC and at
 * the site, the meaning and the released content hash. A wrong password records nothing here and
 * counts toward the sign-in throttle (written outside this transaction, so it stays counted).
 */
export async function signAcknowledgement(tx: Tx, actor: Actor, input: SignInput) {
  const now = input.now ?? new Date();
  const [user] = await tx.select().from(users).where(eq(users.id, actor.userId));
  if (!user || user.disabledAt) throw new AppError("forbidden", "This account cannot sign.");
  if (await isThrottled(user.email)) {
    throw new AppError("too_many_requests", "Too many wrong passwords. Wait 15 minutes, then try again.");
  }

  const [row] = await tx
    .select({ request: acknowledgementRequests, version: protocolVersions, site: sites, study: studies })
    .from(acknowledgementRequests)
    .innerJoin(protocolVersions, eq(protocolVersions.id, acknowledgementRequests.versionId))
    .innerJoin(sites, eq(sites.id, acknowledgementRequests.siteId))
    .innerJoin(studies, eq(studies.id, acknowledgementRequests.studyId))
    .where(
      and(
        eq(acknowledgementRequests.studyId, input.studyId),
        eq(acknowledgementRequests.siteId, input.siteId),
        eq(acknowledgementRequests.versionId, input.versionId),
        eq(acknowledgementRequests.userId, actor.userId),
      ),
    );
  if (!row) throw unprocessable("You have no acknowledgement to sign for this protocol version at this site.", { versionId: ["No acknowledgement task for you."] });

  const ok = await verifyPassword(user.passwordHash, input.password);
  if (!ok) {
    // Outside the transaction (which rolls back): the refusal stays counted and on the audit trail.
    await recordAttempt(user.email, false, input.ip ?? null);
    await recordAudit(db, actor, {
      action: "acknowledgement.sign_refused",
      entityType: "acknowledgement_request",
      entityId: row.request.id,
      studyId: input.studyId,
      siteId: input.siteId,
      after: { reason: "wrong password", versionId: input.versionId },
    });
    throw unprocessable("The password is not correct. Nothing was signed.", { password: ["The password is not correct."] });
  }

  const { request, version, site, study } = row;
  const [already] = await tx
    .select({ signedAt: electronicSignatures.signedAt })
    .from(electronicSignatures)
    .where(and(eq(electronicSignatures.versionId, version.id), eq(electronicSignatures.signerId, actor.userId), eq(electronicSignatures.siteId, site.id)));
  if (already) throw conflict(`You already acknowledged protocol version ${version.versionLabel} at site ${site.code} on ${already.signedAt.toISOString()}.`);

  if (!["released", "superseded"].includes(version.state) || !version.contentHash) {
    throw unprocessable(`Protocol version ${version.versionLabel} is not released.`);
  }
  // §11.70: the signature is bound to exactly the released content.
  const hash = hashProtocolContent({ doc: version.content, visitSchedule: version.visitSchedule });
  if (hash !== version.contentHash) throw new AppError("internal", `Content of version ${version.versionLabel} does not match its released hash.`);

  const [membership] = await tx
    .select({ role: memberships.role })
    .from(memberships)
    .where(and(eq(memberships.userId, actor.userId), eq(memberships.siteId, site.id), eq(memberships.role, "investigator"), isNull(memberships.revokedAt)));
  if (!membership) throw new AppError("forbidden", "Only an investigator of this site may acknowledge for it.");

  const [signature] = await tx
    .insert(electronicSignatures)
    .values({
      requestId: request.id,
      studyId: study.id,
      siteId: site.id,
      versionId: version.id,
      signerId: user.id,
      printedName: user.name,
      signerEmail: user.email,
      role: membership.role,
      siteCode: site.code,
      versionLabel: version.versionLabel,
      meaning: acknowledgementMeaning({ versionLabel: version.versionLabel, studyCode: study.code }),
      contentHash: hash,
      signedAt: now,
      siteTimeZone: site.timeZone,
      signedAtSiteLocal: formatSiteLocalTime(now, site.timeZone),
    })
    .returning();
  await recordAttempt(user.email, true, input.ip ?? null);
  return signature!;
}
