import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { db } from "@/server/db/client";
import { getStudyContext } from "@/server/studies/study-context";
import { audienceFor, getProtocolVersion, permittedActions } from "@/server/protocol/queries";
import { accessibleSiteIds, canSomewhere } from "@/lib/auth/authorize";
import { idSchema } from "@/lib/api/schemas";
import { renderProtocolArticle } from "@/lib/protocol/render";
import { amendmentLabel } from "@/lib/protocol/version-label";
import { studyPath } from "@/lib/nav";
import { ProtocolStateChip } from "../_components/protocol-state-chip";
import { ProtocolStyles } from "../_components/protocol-styles";
import { VisitScheduleTable } from "../_components/visit-schedule-table";
import { WorkflowActions } from "../_components/workflow-actions";

export const metadata: Metadata = { title: "Protocol version" };

const stamp = (d: Date | null) => (d ? `${d.toISOString().slice(0, 16).replace("T", " ")} UTC` : "—");

export default async function ProtocolVersionPage({ params }: { params: Promise<{ studyId: string; versionId: string }> }) {
  const { studyId, versionId } = await params;
  const { actor } = await getStudyContext(studyId);
  if (!canSomewhere(actor, "protocol.read", studyId) || !idSchema.safeParse(versionId).success) notFound();
  const version = await getProtocolVersion(db, { versionId, audience: audienceFor(accessibleSiteIds(actor, "protocol.read", studyId)) }).catch(() => null);
  if (!version || version.studyId !== studyId) notFound();
  const actions = permittedActions(version, actor);
  const base = studyPath(studyId, "protocol");
  const canEdit = version.state === "draft" && canSomewhere(actor, "protocol.write", studyId);
  const pdf = (kind: string) => `/api/v1/protocol-versions/${version.id}/pdf?kind=${kind}`;
  return (
    <div className="space-y-4">
      <ProtocolStyles />
      <header className="space-y-1">
        <p className="text-sm">
          <Link href={base}>Protocol</Link> /
        </p>
        <div className="flex flex-wrap items-center gap-3">
          <h1>
            {version.title} — version {version.versionLabel}
          </h1>
          <ProtocolStateChip state={version.state} />
        </div>
        <p className="text-sm text-muted">
          {amendmentLabel(version.amendmentNumber, version.substantial ?? false)}
          {version.parentLabel ? ` · amends version ${version.parentLabel}` : ""} · written by {version.authorName}
          {version.approverName ? ` · approved by ${version.approverName} ${stamp(version.approvedAt)}` : ""}
          {version.releaserName ? ` · released by ${version.releaserName} ${stamp(version.releasedAt)}` : ""}
        </p>
        {version.contentHash && (
          <p className="text-sm">
            Content SHA-256 (RFC 8785 canonical JSON): <code className="break-all font-mono text-xs" data-testid="content-hash">{version.contentHash}</code>
          </p>
        )}
        {version.substantialReason && <p className="text-sm">Why {version.substantial ? "substantial" : "non-substantial"}: {version.substantialReason}</p>}
      </header>

      <nav className="flex flex-wrap gap-2 text-sm" aria-label="Version actions">
        {canEdit && (
          <Link className="btn" href={`${base}/${version.id}/edit`}>
            Edit draft
          </Link>
        )}
        {version.parentId && (
          <Link className="btn-secondary" href={`${base}/compare?from=${version.parentId}&to=${version.id}`}>
            Redline against {version.parentLabel}
          </Link>
        )}
        <a className="btn-secondary" href={pdf("clean")}>
          PDF: clean copy
        </a>
        {version.parentId && (
          <a className="btn-secondary" href={pdf("tracked")}>
            PDF: tracked changes
          </a>
        )}
        {version.parentId && (
          <a className="btn-secondary" href={pdf("summary")}>
            PDF: summary of changes
          </a>
        )}
      </nav>

      {actions.length > 0 && <WorkflowActions versionId={version.id} versionLabel={version.versionLabel} actions={actions} />}

      {version.reviewComments.length > 0 && (
        <section className="card space-y-2" aria-labelledby="review-comments">
          <h2 id="review-comments">Reviewer&apos;s comments</h2>
          <ul className="space-y-2 text-sm" data-testid="review-comments">
            {version.reviewComments.map((c, i) => (
              <li key={i} className="border-l-4 border-ochre pl-3">
                <p className="whitespace-pre-wrap">{c.text}</p>
                <p className="text-xs text-muted">
                  {c.byName}, {c.at.slice(0, 16).replace("T", " ")} UTC
                </p>
              </li>
            ))}
          </ul>
        </section>
      )}

      {version.summaryOfChanges.length > 0 && (
        <section className="card overflow-x-auto" aria-labelledby="soc">
          <h2 id="soc" className="mb-2">
            Summary of changes
          </h2>
          <table className="table-dense">
            <thead>
              <tr>
                <th>Section</th>
                <th>Before</th>
                <th>After</th>
                <th>Rationale</th>
              </tr>
            </thead>
            <tbody>
              {version.summaryOfChanges.map((r, i) => (
                <tr key={i}>
                  <td>{r.section}</td>
                  <td className="whitespace-pre-wrap">{r.before}</td>
                  <td className="whitespace-pre-wrap">{r.after}</td>
                  <td className="whitespace-pre-wrap">{r.rationale}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </section>
      )}

      <section className="card" aria-labelledby="schedule">
        <h2 id="schedule" className="mb-2">
          Schedule of visits
        </h2>
        <VisitScheduleTable visits={version.visitSchedule} />
        <p className="governs mt-3">Visit days and windows here are what this protocol version says; the protocol approved by the ethics committee governs.</p>
      </section>

      <article className="card" aria-label="Protocol text" data-testid="protocol-text">
        {/* Rendered on the server through the whitelist: nothing executable reaches the page. */}
        <div dangerouslySetInnerHTML={{ __html: renderProtocolArticle(version.content) }} />
      </article>
    </div>
  );
}
