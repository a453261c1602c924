import "server-only";
import { eq } from "drizzle-orm";
import type { Tx } from "@/server/db/client";
import { protocolVersions, studies } from "@/server/db/schema";
import { hashProtocolContent } from "@/lib/protocol/content-hash";
import { buildEthicsPackagePdf } from "@/lib/protocol/pdf";
import { amendmentLabel } from "@/lib/protocol/version-label";
import { protocolStatusLabels } from "@/lib/protocol/workflow";
import type { ProtocolVersionDetail } from "./queries";

export type PdfKind = "clean" | "tracked" | "summary" | "package";

/** The ethics-committee PDFs of a version: clean copy, tracked changes against its parent, summary of changes, or all three. */
export async function buildVersionPdf(tx: Tx, { version, kind }: { version: ProtocolVersionDetail; kind: PdfKind }) {
  const [study] = await tx.select().from(studies).where(eq(studies.id, version.studyId));
  const parent = version.parentId ? (await tx.select().from(protocolVersions).where(eq(protocolVersions.id, version.parentId)))[0] : undefined;
  const frozen = version.state === "released" || version.state === "superseded";
  const date = (version.releasedAt ?? version.approvedAt ?? version.updatedAt).toISOString().slice(0, 10);
  const bytes = await buildEthicsPackagePdf({
    studyCode: study!.code,
    studyTitle: study!.title,
    // Not yet released: the state is printed beside the label so no one mistakes it for the released text.
    versionLabel: frozen ? version.versionLabel : `${version.versionLabel} (${protocolStatusLabels[version.state]})`,
    amendmentLabel: amendmentLabel(version.amendmentNumber, version.substantial ?? false),
    date,
    contentHash: version.contentHash ?? hashProtocolContent({ doc: version.content, visitSchedule: version.visitSchedule }),
    doc: version.content,
    visitSchedule: version.visitSchedule,
    parent: parent ? { versionLabel: parent.versionLabel, doc: parent.content, visitSchedule: parent.visitSchedule } : null,
    summaryOfChanges: version.summaryOfChanges,
    parts: kind === "package" ? undefined : [kind],
  });
  const fileName = `${study!.code}-protocol-${version.versionLabel}-${kind}.pdf`;
  return { bytes, fileName };
}
