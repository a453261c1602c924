import "server-only";
import { and, asc, eq } from "drizzle-orm";
import type { Tx } from "@/server/db/client";
import { electronicSignatures, protocolVersions, sites, studies } from "@/server/db/schema";
import { unprocessable } from "@/server/api/errors";
import { buildSignaturePagePdf } from "@/lib/acknowledgements/signature-page-pdf";
import { describeStatus } from "@/lib/acknowledgements";
import { roleLabels, type Role } from "@/lib/auth/roles";
import { listAcknowledgementMatrix } from "./list-matrix";

/** The printable signature page of a version at a site, as PDF bytes. */
export async function signaturePageFor(tx: Tx, { studyId, versionId, siteId, now = new Date() }: { studyId: string; versionId: string; siteId: string; now?: Date }) {
  const [version] = await tx.select().from(protocolVersions).where(and(eq(protocolVersions.id, versionId), eq(protocolVersions.studyId, studyId)));
  if (!version || !version.contentHash) throw unprocessable("No released protocol version with this id in this study.", { versionId: ["Not a released version of this study."] });
  const [site] = await tx.select().from(sites).where(and(eq(sites.id, siteId), eq(sites.studyId, studyId)));
  const [study] = await tx.select().from(studies).where(eq(studies.id, studyId));
  if (!site || !study) throw unprocessable("No such site in this study.", { siteId: ["Not a site of this study."] });
  const signatures = await tx
    .select()
    .from(electronicSignatures)
    .where(and(eq(electronicSignatures.versionId, versionId), eq(electronicSignatures.siteId, siteId)))
    .orderBy(asc(electronicSignatures.signedAt));
  const rows = await listAcknowledgementMatrix(tx, { studyId, siteIds: [siteId], versionId, now });
  const pdf = await buildSignaturePagePdf({
    studyCode: study.code,
    studyTitle: study.title,
    versionLabel: version.versionLabel,
    versionTitle: version.title,
    contentHash: version.contentHash,
    site: { code: site.code, name: site.name, timeZone: site.timeZone },
    signatures: signatures.map((s) => ({
      printedName: s.printedName,
      role: roleLabels[s.role as Role] ?? s.role,
      signedAtUtc: s.signedAt.toISOString().replace("T", " ").replace(/\.\d+Z$/, " UTC"),
      signedAtSiteLocal: s.signedAtSiteLocal,
      meaning: s.meaning,
      contentHash: s.contentHash,
      signatureId: s.id,
    })),
    unsigned: rows.filter((r) => !r.signature).map((r) => ({ name: r.investigatorName, dueOn: r.dueOn, state: describeStatus(r.status) })),
    generatedAt: now.toISOString(),
  });
  return { pdf, fileName: `signature-page-${study.code}-v${version.versionLabel}-${site.code}.pdf` };
}
