import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { getStudyContext } from "@/server/studies/study-context";
import { canSomewhere } from "@/lib/auth/authorize";
import { DocumentTypesEditor } from "../_components/document-types-editor";

export const metadata: Metadata = { title: "Document types · Documents" };

export default async function DocumentTypesPage({ params }: { params: Promise<{ studyId: string }> }) {
  const { studyId } = await params;
  const { actor } = await getStudyContext(studyId);
  if (!canSomewhere(actor, "documents.read", studyId)) notFound();
  return <DocumentTypesEditor studyId={studyId} canConfigure={canSomewhere(actor, "documents.configure", studyId)} />;
}
