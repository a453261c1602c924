import "server-only";
import { and, eq, inArray } from "drizzle-orm";
import type { Tx } from "@/server/db/client";
import { documents, protocolVersions, sites, siteVersionApprovals } from "@/server/db/schema";
import { AppError, unprocessable } from "@/server/api/errors";
import { isCalendarDate } from "@/lib/visits/calendar-date";
import { siteDateAt } from "@/lib/acknowledgements";

export type RecordApprovalInput = { studyId: string; siteId: string; versionId: string; approvedOn: string; letterDocumentId: string; recordedBy: string; now?: Date };

/**
 * Record a site's ethics-committee approval of a released version (ICH E6(R3) §2.4.2: documented,
 * dated approval). The version is in force at the site from `approvedOn`, even when it is
 * recorded later. Approvals keep release order at a site, so a later version never starts before
 * an earlier one.
 */
export async function recordSiteApproval(tx: Tx, input: RecordApprovalInput) {
  const now = input.now ?? new Date();
  const [site] = await tx.select().from(sites).where(and(eq(sites.id, input.siteId), eq(sites.studyId, input.studyId)));
  if (!site) throw new AppError("not_found", "That site was not found, or you may not see it.");
  const [version] = await tx.select().from(protocolVersions).where(and(eq(protocolVersions.id, input.versionId), eq(protocolVersions.studyId, input.studyId)));
  if (!version || !["released", "superseded"].includes(version.state) || !version.releasedAt) {
    throw unprocessable("Only a released protocol version of this study can be approved at a site.", { versionId: ["Not a released version of this study."] });
  }
  if (!isCalendarDate(input.approvedOn)) throw unprocessable("Give the approval date as YYYY-MM-DD.", { approvedOn: ["Not a calendar date."] });
  const today = siteDateAt(now, site.timeZone);
  if (input.approvedOn > today) throw unprocessable(`The approval date ${input.approvedOn} is after today at the site (${today}).`, { approvedOn: ["In the future."] });

  const [letter] = await tx.select().from(documents).where(eq(documents.id, input.letterDocumentId));
  if (!letter || letter.studyId !== input.studyId || letter.siteId !== input.siteId) {
    throw unprocessable("The approval letter must be a document uploaded for this site.", { letterDocumentId: ["Not a document of this site."] });
  }
  if (letter.state !== "stored") throw unprocessable("The approval letter has not finished uploading and verifying.", { letterDocumentId: ["Upload not verified."] });

  const [existing] = await tx.select().from(siteVersionApprovals).where(and(eq(siteVersionApprovals.siteId, site.id), eq(siteVersionApprovals.versionId, version.id)));
  if (existing) throw new AppError("conflict", `Site ${site.code} already has an approval of version ${version.versionLabel} dated ${existing.approvedOn}.`);

  // Keep release order: earlier-released versions' approvals on or before, later ones on or after.
  const others = await tx
    .select({ label: protocolVersions.versionLabel, releasedAt: protocolVersions.releasedAt, approvedOn: siteVersionApprovals.approvedOn })
    .from(siteVersionApprovals)
    .innerJoin(protocolVersions, eq(protocolVersions.id, siteVersionApprovals.versionId))
    .where(and(eq(siteVersionApprovals.siteId, site.id), inArray(protocolVersions.state, ["released", "superseded"])));
  for (const o of others) {
    if (!o.releasedAt) continue;
    const earlier = o.releasedAt < version.releasedAt;
    if (earlier && o.approvedOn > input.approvedOn) {
      throw unprocessable(`Version ${o.label} was approved at this site on ${o.approvedOn}; version ${version.versionLabel} cannot be in force before it.`, { approvedOn: ["Before the approval of an earlier version."] });
    }
    if (!earlier && o.approvedOn < input.approvedOn) {
      throw unprocessable(`Later version ${o.label} was approved at this site on ${o.approvedOn}; version ${version.versionLabel} cannot start after it.`, { approvedOn: ["After the approval of a later version."] });
    }
  }

  const [row] = await tx
    .insert(siteVersionApprovals)
    .values({ siteId: site.id, versionId: version.id, approvedOn: input.approvedOn, letterDocumentId: letter.id, recordedBy: input.recordedBy, recordedAt: now })
    .returning();
  return { approval: row!, site, version, letter };
}
