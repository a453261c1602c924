import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { db } from "@/server/db/client";
import { getStudyContext } from "@/server/studies/study-context";
import { getSiteDetail } from "@/server/sites/get-site";
import { can } from "@/lib/auth/authorize";
import { idSchema } from "@/lib/api/schemas";
import { studyPath } from "@/lib/nav";
import { siteStatusLabels } from "@/lib/sites/site-status";
import { SiteStatusChip } from "@/components/site-status-chip";
import { SiteForm } from "../_components/site-form";
import { SiteLifecycleStep } from "../_components/site-lifecycle";

export const metadata: Metadata = { title: "Site" };

export default async function SitePage({ params }: { params: Promise<{ studyId: string; siteId: string }> }) {
  const { studyId, siteId } = await params;
  const { actor } = await getStudyContext(studyId);
  if (!idSchema.safeParse(siteId).success || !can(actor, "sites.read", { studyId, siteId })) notFound();
  const detail = await getSiteDetail(db, { siteId }).catch(() => null);
  if (!detail || detail.site.studyId !== studyId) notFound();
  const { site, history } = detail;
  const canManage = can(actor, "sites.manage", { studyId });
  return (
    <div className="space-y-6">
      <header className="space-y-1">
        <p className="text-sm">
          <Link className="underline" href={studyPath(studyId, "sites")}>
            Sites
          </Link>
        </p>
        <h1 className="flex items-center gap-3">
          <span className="font-mono">{site.code}</span> {site.name} <SiteStatusChip status={site.status} />
        </h1>
        <p className="text-sm text-muted">
          {site.country} · {site.timeZone} · {site.currency} · target enrolment {site.targetEnrolment}
        </p>
        <p className="text-sm">
          {can(actor, "subjects.read", { studyId, siteId }) && (
            <Link className="underline" href={`${studyPath(studyId, "subjects")}?siteId=${site.id}`}>
              Subjects at this site
            </Link>
          )}{" "}
          {can(actor, "calendar.read", { studyId, siteId }) && (
            <Link className="ml-3 underline" href={`${studyPath(studyId, "visits")}?siteId=${site.id}`}>
              Visits to plan
            </Link>
          )}
        </p>
      </header>
      <section className="card space-y-3" aria-labelledby="lifecycle-heading">
        <h2 id="lifecycle-heading">Lifecycle</h2>
        <table className="table-dense" data-testid="site-history">
          <thead>
            <tr>
              <th>Step</th>
              <th>Date at the site</th>
              <th>By</th>
              <th>Recorded (UTC)</th>
            </tr>
          </thead>
          <tbody>
            {history.map((h) => (
              <tr key={h.id}>
                <td>{siteStatusLabels[h.toStatus]}</td>
                <td className="font-mono">{h.effectiveOn}</td>
                <td>{h.actorName ?? "—"}</td>
                <td className="font-mono text-xs">{h.at.toISOString().slice(0, 16).replace("T", " ")}</td>
              </tr>
            ))}
          </tbody>
        </table>
        {canManage && <SiteLifecycleStep siteId={site.id} status={site.status} />}
      </section>
      <section className="card space-y-2" aria-labelledby="contacts-heading">
        <h2 id="contacts-heading">Contacts</h2>
        {site.contacts.length === 0 ? (
          <p className="text-sm">No contacts recorded.</p>
        ) : (
          <ul className="text-sm">
            {site.contacts.map((c) => (
              <li key={c.email}>
                {c.name} ({c.role}) · {c.email}
                {c.phone ? ` · ${c.phone}` : ""}
              </li>
            ))}
          </ul>
        )}
      </section>
      {canManage && (
        <section className="space-y-2" aria-labelledby="edit-heading">
          <h2 id="edit-heading">Edit the site</h2>
          <SiteForm studyId={studyId} siteId={site.id} initial={site} />
        </section>
      )}
    </div>
  );
}
