import "server-only";
import { and, asc, desc, eq, inArray, type SQL } from "drizzle-orm";
import type { Tx } from "@/server/db/client";
import { acknowledgementRequests, electronicSignatures, protocolVersions, sites, users } from "@/server/db/schema";
import { acknowledgementStatus, siteDateAt, type AcknowledgementState, type AcknowledgementStatus } from "@/lib/acknowledgements";

export type MatrixRow = {
  requestId: string;
  versionId: string;
  versionLabel: string;
  siteId: string;
  siteCode: string;
  siteName: string;
  timeZone: string;
  userId: string;
  investigatorName: string;
  investigatorEmail: string;
  reason: "release" | "joined";
  requestedAt: string;
  dueOn: string;
  compareToVersionId: string | null;
  status: AcknowledgementStatus;
  signature: { id: string; signedAt: string; signedAtSiteLocal: string; contentHash: string; printedName: string } | null;
};

export type MatrixFilter = {
  studyId: string;
  /** Sites the reader may see. */
  siteIds: "all" | string[];
  siteId?: string;
  versionId?: string;
  userId?: string;
  state?: AcknowledgementState;
  now?: Date;
};

/** Version × site × investigator, each with its state computed at the site's today. */
export async function listAcknowledgementMatrix(tx: Tx, f: MatrixFilter): Promise<MatrixRow[]> {
  if (f.siteIds !== "all" && f.siteIds.length === 0) return [];
  const now = f.now ?? new Date();
  const where: SQL[] = [eq(acknowledgementRequests.studyId, f.studyId)];
  if (f.siteIds !== "all") where.push(inArray(acknowledgementRequests.siteId, f.siteIds));
  if (f.siteId) where.push(eq(acknowledgementRequests.siteId, f.siteId));
  if (f.versionId) where.push(eq(acknowledgementRequests.versionId, f.versionId));
  if (f.userId) where.push(eq(acknowledgementRequests.userId, f.userId));
  const rows = await tx
    .select({ r: acknowledgementRequests, v: { label: protocolVersions.versionLabel, releasedAt: protocolVersions.releasedAt }, s: { code: sites.code, name: sites.name, timeZone: sites.timeZone }, u: { name: users.name, email: users.email }, sig: electronicSignatures })
    .from(acknowledgementRequests)
    .innerJoin(protocolVersions, eq(protocolVersions.id, acknowledgementRequests.versionId))
    .innerJoin(sites, eq(sites.id, acknowledgementRequests.siteId))
    .innerJoin(users, eq(users.id, acknowledgementRequests.userId))
    .leftJoin(electronicSignatures, eq(electronicSignatures.requestId, acknowledgementRequests.id))
    .where(and(...where))
    .orderBy(desc(protocolVersions.releasedAt), asc(sites.code), asc(users.name));
  const out: MatrixRow[] = [];
  for (const { r, v, s, u, sig } of rows) {
    const today = siteDateAt(now, s.timeZone);
    const status = acknowledgementStatus({ dueOn: r.dueOn, today, signedOn: sig ? siteDateAt(sig.signedAt, s.timeZone) : null });
    if (f.state && status.state !== f.state) continue;
    out.push({
      requestId: r.id,
      versionId: r.versionId,
      versionLabel: v.label,
      siteId: r.siteId,
      siteCode: s.code,
      siteName: s.name,
      timeZone: s.timeZone,
      userId: r.userId,
      investigatorName: u.name,
      investigatorEmail: u.email,
      reason: r.reason,
      requestedAt: r.requestedAt.toISOString(),
      dueOn: r.dueOn,
      compareToVersionId: r.compareToVersionId,
      status,
      signature: sig ? { id: sig.id, signedAt: sig.signedAt.toISOString(), signedAtSiteLocal: sig.signedAtSiteLocal, contentHash: sig.contentHash, printedName: sig.printedName } : null,
    });
  }
  return out;
}

/** Counts by state, for home panels and the matrix header. */
export function countByState(rows: readonly MatrixRow[]) {
  const counts = { pending: 0, overdue: 0, acknowledged: 0 };
  for (const r of rows) counts[r.status.state]++;
  return counts;
}

/** The signed-in investigator's own tasks: overdue and pending first (soonest due), then done. */
export async function listMyAcknowledgements(tx: Tx, { studyId, userId, now }: { studyId: string; userId: string; now?: Date }) {
  const rows = await listAcknowledgementMatrix(tx, { studyId, siteIds: "all", userId, now });
  const rank = (r: MatrixRow) => (r.status.state === "overdue" ? 0 : r.status.state === "pending" ? 1 : 2);
  return rows.sort((a, b) => rank(a) - rank(b) || a.dueOn.localeCompare(b.dueOn));
}
