import "server-only";
import { and, eq, inArray, isNull } from "drizzle-orm";
import type { Tx } from "@/server/db/client";
import { acknowledgementRequests, memberships, protocolVersions, sites, studies, users } from "@/server/db/schema";
import { listVersionsInForceAtSites } from "@/server/protocol/in-force";
import { versionInForceOn } from "@/lib/visits/subject-calendar";
import { siteDateAt } from "@/lib/acknowledgements";
import { acknowledgingSiteStatuses } from "./on-release";
import { requestAcknowledgement } from "./request-acknowledgement";

/**
 * An investigator who joins a site after a release is asked for the version in force at the site
 * today. Idempotent (one task per version, site, person); run by the daily reminder job.
 */
export async function requestForJoinedInvestigators(tx: Tx, { now, studyId }: { now: Date; studyId?: string }) {
  const conds = [eq(memberships.role, "investigator"), isNull(memberships.revokedAt), isNull(users.disabledAt), inArray(sites.status, [...acknowledgingSiteStatuses])];
  if (studyId) conds.push(eq(memberships.studyId, studyId));
  const people = await tx
    .select({ site: sites, study: studies, user: { id: users.id, email: users.email, name: users.name } })
    .from(memberships)
    .innerJoin(sites, eq(sites.id, memberships.siteId))
    .innerJoin(studies, eq(studies.id, memberships.studyId))
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(and(...conds));
  if (people.length === 0) return { created: 0 };

  const inForce = await listVersionsInForceAtSites(tx, { siteIds: [...new Set(people.map((p) => p.site.id))] });
  const existing = await tx
    .select({ versionId: acknowledgementRequests.versionId, siteId: acknowledgementRequests.siteId, userId: acknowledgementRequests.userId })
    .from(acknowledgementRequests)
    .where(inArray(acknowledgementRequests.userId, [...new Set(people.map((p) => p.user.id))]));
  const have = new Set(existing.map((e) => `${e.versionId}:${e.siteId}:${e.userId}`));

  let created = 0;
  for (const { site, study, user } of people) {
    const current = versionInForceOn(inForce.get(site.id) ?? [], siteDateAt(now, site.timeZone));
    if (!current || have.has(`${current.versionId}:${site.id}:${user.id}`)) continue;
    const [version] = await tx.select().from(protocolVersions).where(eq(protocolVersions.id, current.versionId));
    if (!version) continue;
    const row = await requestAcknowledgement(tx, { study, site, version, investigator: user, reason: "joined", requestedAt: now });
    have.add(`${current.versionId}:${site.id}:${user.id}`);
    if (row) created++;
  }
  return { created };
}
