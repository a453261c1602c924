import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { getStudyContext } from "@/server/studies/study-context";
import { can } from "@/lib/auth/authorize";
import { AuditLog } from "./_components/audit-log";

export const metadata: Metadata = { title: "Audit" };

export default async function AuditPage({ params }: { params: Promise<{ studyId: string }> }) {
  const { studyId } = await params;
  const { actor } = await getStudyContext(studyId);
  if (!can(actor, "audit.read", { studyId })) notFound();
  return (
    <div className="space-y-4">
      <h1>Audit</h1>
      <p className="text-sm text-muted">Every change of state, who made it and when, with the values before and after. Records can be added, never changed or removed.</p>
      <AuditLog studyId={studyId} />
    </div>
  );
}
