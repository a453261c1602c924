import type { Metadata } from "next";
import Link from "next/link";
import { notFound, redirect } from "next/navigation";
import { db } from "@/server/db/client";
import { getStudyContext } from "@/server/studies/study-context";
import { getProtocolVersion } from "@/server/protocol/queries";
import { canSomewhere } from "@/lib/auth/authorize";
import { idSchema } from "@/lib/api/schemas";
import { studyPath } from "@/lib/nav";
import { ProtocolStyles } from "../../_components/protocol-styles";
import { DraftEditor } from "../../_components/draft-editor";

export const metadata: Metadata = { title: "Edit protocol draft" };

export default async function EditProtocolVersionPage({ params }: { params: Promise<{ studyId: string; versionId: string }> }) {
  const { studyId, versionId } = await params;
  const { actor } = await getStudyContext(studyId);
  if (!canSomewhere(actor, "protocol.write", studyId) || !idSchema.safeParse(versionId).success) notFound();
  const version = await getProtocolVersion(db, { versionId }).catch(() => null);
  if (!version || version.studyId !== studyId) notFound();
  const base = studyPath(studyId, "protocol");
  if (version.state !== "draft") redirect(`${base}/${version.id}`);
  const parent = version.parentId ? await getProtocolVersion(db, { versionId: version.parentId }) : null;
  return (
    <div className="space-y-4">
      <ProtocolStyles />
      <p className="text-sm">
        <Link href={base}>Protocol</Link> / <Link href={`${base}/${version.id}`}>Version {version.versionLabel}</Link> / edit
      </p>
      <DraftEditor
        studyId={studyId}
        initial={JSON.parse(JSON.stringify(version))}
        parent={parent ? { id: parent.id, versionLabel: parent.versionLabel, content: parent.content, visitSchedule: parent.visitSchedule } : null}
      />
    </div>
  );
}
