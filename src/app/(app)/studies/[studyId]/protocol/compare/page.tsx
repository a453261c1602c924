import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { getStudyContext } from "@/server/studies/study-context";
import { canSomewhere } from "@/lib/auth/authorize";
import { idSchema } from "@/lib/api/schemas";
import { studyPath } from "@/lib/nav";
import { ProtocolStyles } from "../_components/protocol-styles";
import { CompareVersions } from "../_components/compare-versions";

export const metadata: Metadata = { title: "Compare protocol versions" };

export default async function ComparePage({ params, searchParams }: { params: Promise<{ studyId: string }>; searchParams: Promise<{ from?: string; to?: string }> }) {
  const { studyId } = await params;
  const { from, to } = await searchParams;
  const { actor } = await getStudyContext(studyId);
  if (!canSomewhere(actor, "protocol.read", studyId)) notFound();
  if (!idSchema.safeParse(from).success || !idSchema.safeParse(to).success) notFound();
  return (
    <div className="space-y-4">
      <ProtocolStyles />
      <p className="text-sm">
        <Link href={studyPath(studyId, "protocol")}>Protocol</Link> / compare
      </p>
      <CompareVersions studyId={studyId} from={from!} to={to!} />
    </div>
  );
}
