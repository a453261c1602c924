import "server-only";
import { and, asc, eq, inArray } from "drizzle-orm";
import type { Tx } from "@/server/db/client";
import { protocolVersions, siteVersionApprovals } from "@/server/db/schema";
import type { ProtocolVersionAtSite } from "@/lib/visits/subject-calendar";

// The protocol versions a site has adopted: each released (or since superseded) version with the
// date its ethics committee approved it there. Feed for versionInForceOn / computeSubjectCalendar.

export type VersionInForceAtSite = ProtocolVersionAtSite;

/** Oldest approval first; a version is in force from `inForceFrom` until a later one's date. */
export async function listVersionsInForceAtSite(tx: Tx, { siteId }: { siteId: string }): Promise<VersionInForceAtSite[]> {
  const rows = await tx
    .select({
      versionId: protocolVersions.id,
      versionLabel: protocolVersions.versionLabel,
      inForceFrom: siteVersionApprovals.approvedOn,
      schedule: protocolVersions.visitSchedule,
    })
    .from(siteVersionApprovals)
    .innerJoin(protocolVersions, eq(protocolVersions.id, siteVersionApprovals.versionId))
    .where(and(eq(siteVersionApprovals.siteId, siteId), inArray(protocolVersions.state, ["released", "superseded"])))
    .orderBy(asc(siteVersionApprovals.approvedOn), asc(protocolVersions.releasedAt));
  return rows;
}

/** The same for many sites at once (one query), keyed by site id. */
export async function listVersionsInForceAtSites(tx: Tx, { siteIds }: { siteIds: readonly string[] }): Promise<Map<string, VersionInForceAtSite[]>> {
  const out = new Map<string, VersionInForceAtSite[]>();
  if (siteIds.length === 0) return out;
  const rows = await tx
    .select({
      siteId: siteVersionApprovals.siteId,
      versionId: protocolVersions.id,
      versionLabel: protocolVersions.versionLabel,
      inForceFrom: siteVersionApprovals.approvedOn,
      schedule: protocolVersions.visitSchedule,
    })
    .from(siteVersionApprovals)
    .innerJoin(protocolVersions, eq(protocolVersions.id, siteVersionApprovals.versionId))
    .where(and(inArray(siteVersionApprovals.siteId, [...siteIds]), inArray(protocolVersions.state, ["released", "superseded"])))
    .orderBy(asc(siteVersionApprovals.approvedOn), asc(protocolVersions.releasedAt));
  // Schedules are shared objects per version so the calendar library indexes each once.
  const scheduleByVersion = new Map<string, VersionInForceAtSite["schedule"]>();
  for (const { siteId, ...v } of rows) {
    const schedule = scheduleByVersion.get(v.versionId) ?? v.schedule;
    scheduleByVersion.set(v.versionId, schedule);
    const list = out.get(siteId) ?? [];
    list.push({ ...v, schedule });
    out.set(siteId, list);
  }
  return out;
}
