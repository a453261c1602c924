import { notFound } from "next/navigation";
import { getStudyContext } from "@/server/studies/study-context";
import { canSomewhere } from "@/lib/auth/authorize";
import { studyPath } from "@/lib/nav";
import { DocumentsTabs } from "./_components/documents-tabs";

export default async function DocumentsLayout({ children, params }: { children: React.ReactNode; params: Promise<{ studyId: string }> }) {
  const { studyId } = await params;
  const { actor } = await getStudyContext(studyId);
  if (!canSomewhere(actor, "documents.read", studyId)) notFound();
  const base = studyPath(studyId, "documents");
  const tabs = [
    { href: base, label: "Site binder" },
    { href: `${base}/matrix`, label: "All sites" },
    ...(canSomewhere(actor, "documents.review", studyId) ? [{ href: `${base}/review`, label: "To review" }] : []),
    { href: `${base}/types`, label: "Document types" },
    { href: `${base}/files`, label: "All files" },
  ];
  return (
    <div className="space-y-4">
      <h1>Documents</h1>
      <DocumentsTabs tabs={tabs} />
      {children}
    </div>
  );
}
