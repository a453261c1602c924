import "server-only";
import { and, eq } from "drizzle-orm";
import type { Tx } from "@/server/db/client";
import { acknowledgementRequests, electronicSignatures, protocolVersions, sites, studies } from "@/server/db/schema";
import { acknowledgementMeaning, acknowledgementStatus, siteDateAt } from "@/lib/acknowledgements";

/** One acknowledgement task with what the signing page shows; null when absent from the study. */
export async function getAcknowledgementRequest(tx: Tx, { studyId, requestId, now = new Date() }: { studyId: string; requestId: string; now?: Date }) {
  const [row] = await tx
    .select({ request: acknowledgementRequests, version: protocolVersions, site: sites, study: studies, signature: electronicSignatures })
    .from(acknowledgementRequests)
    .innerJoin(protocolVersions, eq(protocolVersions.id, acknowledgementRequests.versionId))
    .innerJoin(sites, eq(sites.id, acknowledgementRequests.siteId))
    .innerJoin(studies, eq(studies.id, acknowledgementRequests.studyId))
    .leftJoin(electronicSignatures, eq(electronicSignatures.requestId, acknowledgementRequests.id))
    .where(and(eq(acknowledgementRequests.id, requestId), eq(acknowledgementRequests.studyId, studyId)));
  if (!row) return null;
  const { request, version, site, study, signature } = row;
  let compareTo: { id: string; versionLabel: string } | null = null;
  if (request.compareToVersionId) {
    const [c] = await tx.select({ id: protocolVersions.id, versionLabel: protocolVersions.versionLabel }).from(protocolVersions).where(eq(protocolVersions.id, request.compareToVersionId));
    compareTo = c ?? null;
  }
  // Never acknowledged anything here: offer what changed from the version this one amends.
  let parent: { id: string; versionLabel: string } | null = null;
  if (!compareTo && version.parentId) {
    const [pv] = await tx.select({ id: protocolVersions.id, versionLabel: protocolVersions.versionLabel }).from(protocolVersions).where(eq(protocolVersions.id, version.parentId));
    parent = pv ?? null;
  }
  return {
    request,
    version: { id: version.id, versionLabel: version.versionLabel, title: version.title, contentHash: version.contentHash, releasedAt: version.releasedAt, state: version.state },
    site: { id: site.id, code: site.code, name: site.name, timeZone: site.timeZone },
    study: { id: study.id, code: study.code },
    compareTo,
    parent,
    meaning: acknowledgementMeaning({ versionLabel: version.versionLabel, studyCode: study.code }),
    status: acknowledgementStatus({ dueOn: request.dueOn, today: siteDateAt(now, site.timeZone), signedOn: signature ? siteDateAt(signature.signedAt, site.timeZone) : null }),
    signature,
  };
}
