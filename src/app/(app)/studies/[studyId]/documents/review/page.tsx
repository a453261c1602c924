import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { getStudyContext } from "@/server/studies/study-context";
import { canSomewhere } from "@/lib/auth/authorize";
import { ReviewQueue } from "../_components/review-queue";

export const metadata: Metadata = { title: "To review · Documents" };

export default async function BinderReviewPage({ params }: { params: Promise<{ studyId: string }> }) {
  const { studyId } = await params;
  const { actor } = await getStudyContext(studyId);
  if (!canSomewhere(actor, "documents.review", studyId)) notFound();
  return <ReviewQueue studyId={studyId} />;
}
