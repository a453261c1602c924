import "server-only";
import { and, eq, inArray, isNull } from "drizzle-orm";
import type { Tx } from "@/server/db/client";
import { memberships, protocolVersions, sites, studies, users } from "@/server/db/schema";
import type { Actor } from "@/lib/auth/authorize";
import { requestAcknowledgement } from "./request-acknowledgement";

/** Sites whose investigators follow the protocol: open, and enrolment closed (follow-up goes on). */
export const acknowledgingSiteStatuses = ["open", "enrolment_closed"] as const;

/**
 * Called by the release of a protocol version, inside its transaction: every investigator of every
 * open site gets an acknowledgement task and an e-mail (through the outbox) linking to the version
 * and its redline against the version they last acknowledged. Idempotent per version, site, person.
 */
export async function notifyVersionReleased(tx: Tx, { versionId, actor = null }: { versionId: string; actor?: Pick<Actor, "userId" | "name"> | null }) {
  const [version] = await tx.select().from(protocolVersions).where(eq(protocolVersions.id, versionId));
  if (!version) throw new Error(`Protocol version ${versionId} not found`);
  if (version.state !== "released") throw new Error(`Protocol version ${version.versionLabel} is ${version.state}, not released`);
  const [study] = await tx.select().from(studies).where(eq(studies.id, version.studyId));
  if (!study) throw new Error(`Study ${version.studyId} not found`);

  const rows = await tx
    .select({ site: sites, user: { id: users.id, email: users.email, name: users.name } })
    .from(memberships)
    .innerJoin(sites, eq(sites.id, memberships.siteId))
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(
      and(
        eq(memberships.studyId, study.id),
        eq(memberships.role, "investigator"),
        isNull(memberships.revokedAt),
        isNull(users.disabledAt),
        inArray(sites.status, [...acknowledgingSiteStatuses]),
      ),
    );

  const requestedAt = version.releasedAt ?? new Date();
  let created = 0;
  const seen = new Set<string>();
  for (const { site, user } of rows) {
    const key = `${site.id}:${user.id}`;
    if (seen.has(key)) continue;
    seen.add(key);
    const row = await requestAcknowledgement(
      tx,
      { study, site, version, investigator: user, reason: "release", requestedAt },
      actor,
    );
    if (row) created++;
  }
  return { created };
}
