import "server-only";
import { and, asc, desc, eq, inArray, type SQL } from "drizzle-orm";
import type { Tx } from "@/server/db/client";
import { documents, protocolVersions, sites, siteVersionApprovals, users } from "@/server/db/schema";
import { listVersionsInForceAtSites } from "@/server/protocol/in-force";
import { versionInForceOn } from "@/lib/visits/subject-calendar";
import { siteDateAt } from "@/lib/acknowledgements";

export type AdoptionCell = {
  versionId: string;
  approval: { id: string; approvedOn: string; recordedAt: string; recordedByName: string | null; letterDocumentId: string | null; letterFileName: string | null; recordedLate: boolean } | null;
  /** No approval yet, and the version is newer than the one in force at the site. */
  pending: boolean;
  inForceToday: boolean;
};
export type AdoptionSiteRow = { siteId: string; siteCode: string; siteName: string; status: string; timeZone: string; today: string; inForceVersionLabel: string | null; cells: AdoptionCell[] };
export type AdoptionMatrix = { versions: { id: string; versionLabel: string; title: string; state: string; releasedAt: string | null }[]; sites: AdoptionSiteRow[] };

/** Released versions × sites: approval dates, letters, what is pending and what is in force today. */
export async function listAdoptionMatrix(tx: Tx, { studyId, siteIds, now = new Date() }: { studyId: string; siteIds: "all" | string[]; now?: Date }): Promise<AdoptionMatrix> {
  const versions = await tx
    .select({ id: protocolVersions.id, versionLabel: protocolVersions.versionLabel, title: protocolVersions.title, state: protocolVersions.state, releasedAt: protocolVersions.releasedAt })
    .from(protocolVersions)
    .where(and(eq(protocolVersions.studyId, studyId), inArray(protocolVersions.state, ["released", "superseded"])))
    .orderBy(desc(protocolVersions.releasedAt));
  const siteWhere: SQL[] = [eq(sites.studyId, studyId)];
  if (siteIds !== "all") {
    if (siteIds.length === 0) return { versions: versions.map((v) => ({ ...v, releasedAt: v.releasedAt?.toISOString() ?? null })), sites: [] };
    siteWhere.push(inArray(sites.id, siteIds));
  }
  const siteRows = await tx.select().from(sites).where(and(...siteWhere)).orderBy(asc(sites.code));
  const approvals = siteRows.length
    ? await tx
        .select({ a: siteVersionApprovals, recordedByName: users.name, letterFileName: documents.fileName })
        .from(siteVersionApprovals)
        .leftJoin(users, eq(users.id, siteVersionApprovals.recordedBy))
        .leftJoin(documents, eq(documents.id, siteVersionApprovals.letterDocumentId))
        .where(inArray(siteVersionApprovals.siteId, siteRows.map((s) => s.id)))
    : [];
  const inForce = await listVersionsInForceAtSites(tx, { siteIds: siteRows.map((s) => s.id) });
  const releaseRank = new Map(versions.map((v, i) => [v.id, versions.length - i]));

  const out: AdoptionSiteRow[] = siteRows.map((site) => {
    const today = siteDateAt(now, site.timeZone);
    const current = versionInForceOn(inForce.get(site.id) ?? [], today);
    const currentRank = current ? (releaseRank.get(current.versionId) ?? 0) : 0;
    return {
      siteId: site.id,
      siteCode: site.code,
      siteName: site.name,
      status: site.status,
      timeZone: site.timeZone,
      today,
      inForceVersionLabel: current?.versionLabel ?? null,
      cells: versions.map((v) => {
        const hit = approvals.find((x) => x.a.siteId === site.id && x.a.versionId === v.id);
        const approval = hit
          ? {
              id: hit.a.id,
              approvedOn: hit.a.approvedOn,
              recordedAt: hit.a.recordedAt.toISOString(),
              recordedByName: hit.recordedByName,
              letterDocumentId: hit.a.letterDocumentId,
              letterFileName: hit.letterFileName,
              // Recorded on a later site day than the approval: in force from the approval date all the same.
              recordedLate: siteDateAt(hit.a.recordedAt, site.timeZone) > hit.a.approvedOn,
            }
          : null;
        return { versionId: v.id, approval, pending: !approval && (releaseRank.get(v.id) ?? 0) > currentRank, inForceToday: current?.versionId === v.id };
      }),
    };
  });
  return { versions: versions.map((v) => ({ ...v, releasedAt: v.releasedAt?.toISOString() ?? null })), sites: out };
}
