import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { getStudyContext } from "@/server/studies/study-context";
import { canSomewhere } from "@/lib/auth/authorize";
import { BinderMatrix } from "../_components/binder-matrix";

export const metadata: Metadata = { title: "All sites · Documents" };

export default async function BinderMatrixPage({ params }: { params: Promise<{ studyId: string }> }) {
  const { studyId } = await params;
  const { actor } = await getStudyContext(studyId);
  if (!canSomewhere(actor, "documents.read", studyId)) notFound();
  return <BinderMatrix studyId={studyId} />;
}
