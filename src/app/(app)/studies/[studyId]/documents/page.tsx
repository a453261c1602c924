import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { db } from "@/server/db/client";
import { getStudyContext } from "@/server/studies/study-context";
import { listSitesForStudy } from "@/server/studies/queries";
import { accessibleSiteIds, can, canSomewhere } from "@/lib/auth/authorize";
import { env } from "@/env";
import { SiteBinderView } from "./_components/site-binder-view";

export const metadata: Metadata = { title: "Site binder · Documents" };

export default async function SiteBinderPage({ params, searchParams }: { params: Promise<{ studyId: string }>; searchParams: Promise<{ site?: string }> }) {
  const { studyId } = await params;
  const { site: siteCode } = await searchParams;
  const { actor } = await getStudyContext(studyId);
  if (!canSomewhere(actor, "documents.read", studyId)) notFound();
  const sites = await listSitesForStudy(db, { studyId, siteIds: accessibleSiteIds(actor, "documents.read", studyId) });
  if (sites.length === 0) return <p>You have no site whose documents you may see.</p>;
  const site = sites.find((s) => s.code === siteCode) ?? sites[0]!;
  return (
    <SiteBinderView
      key={site.id}
      studyId={studyId}
      site={{ id: site.id, code: site.code, name: site.name }}
      sites={sites.map((s) => ({ code: s.code, name: s.name }))}
      canUpload={can(actor, "documents.upload", { studyId, siteId: site.id })}
      canReview={can(actor, "documents.review", { studyId, siteId: site.id })}
      maxBytes={env.UPLOAD_MAX_BYTES}
    />
  );
}
