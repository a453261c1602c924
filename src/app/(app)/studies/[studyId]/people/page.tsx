import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { getStudyContext } from "@/server/studies/study-context";
import { db } from "@/server/db/client";
import { listSitesForStudy } from "@/server/studies/queries";
import { can, canSomewhere } from "@/lib/auth/authorize";
import { PeopleManager } from "./_components/people-manager";

export const metadata: Metadata = { title: "People" };

export default async function PeoplePage({ params }: { params: Promise<{ studyId: string }> }) {
  const { studyId } = await params;
  const { actor } = await getStudyContext(studyId);
  if (!canSomewhere(actor, "people.read", studyId)) notFound();
  const sites = await listSitesForStudy(db, { studyId, siteIds: "all" });
  return (
    <div className="space-y-4">
      <h1>People</h1>
      <PeopleManager
        studyId={studyId}
        canManage={can(actor, "people.manage", { studyId })}
        sites={sites.map((s) => ({ id: s.id, code: s.code, name: s.name }))}
      />
    </div>
  );
}
