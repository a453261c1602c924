import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { db } from "@/server/db/client";
import { getStudyContext } from "@/server/studies/study-context";
import { listSitesForStudy } from "@/server/studies/queries";
import { accessibleSiteIds, canSomewhere } from "@/lib/auth/authorize";
import { env } from "@/env";
import { DocumentList } from "../_components/document-list";

export const metadata: Metadata = { title: "All files · Documents" };

export default async function DocumentFilesPage({ params }: { params: Promise<{ studyId: string }> }) {
  const { studyId } = await params;
  const { actor } = await getStudyContext(studyId);
  if (!canSomewhere(actor, "documents.read", studyId)) notFound();
  const uploadSites = await listSitesForStudy(db, { studyId, siteIds: accessibleSiteIds(actor, "documents.upload", studyId) });
  return (
    <DocumentList
      studyId={studyId}
      uploadSites={uploadSites.map((s) => ({ id: s.id, code: s.code }))}
      canUploadStudyLevel={accessibleSiteIds(actor, "documents.upload", studyId) === "all"}
      maxBytes={env.UPLOAD_MAX_BYTES}
    />
  );
}
