import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { CircleCheck, Clock } from "lucide-react";
import { db } from "@/server/db/client";
import { env } from "@/env";
import { getStudyContext } from "@/server/studies/study-context";
import { listAdoptionMatrix } from "@/server/adoption/list-adoption";
import { accessibleSiteIds, can, canSomewhere } from "@/lib/auth/authorize";
import { StatusChip } from "@/components/status-chip";
import { RecordApprovalForm } from "./_components/record-approval-form";
import { LetterLink } from "./_components/letter-link";

export const metadata: Metadata = { title: "Adoption" };

export default async function AdoptionPage({ params }: { params: Promise<{ studyId: string }> }) {
  const { studyId } = await params;
  const { actor } = await getStudyContext(studyId);
  if (!canSomewhere(actor, "adoption.read", studyId)) notFound();
  const matrix = await listAdoptionMatrix(db, { studyId, siteIds: accessibleSiteIds(actor, "adoption.read", studyId) });
  const recordable = matrix.sites.filter((s) => can(actor, "adoption.record", { studyId, siteId: s.siteId }));
  const labels = new Map(matrix.versions.map((v) => [v.id, v.versionLabel]));
  const pendingCount = matrix.sites.reduce((n, s) => n + s.cells.filter((c) => c.pending).length, 0);

  return (
    <div className="space-y-6">
      <header>
        <h1>Adoption</h1>
        <p className="text-sm text-muted">
          A released protocol version is in force at a site from the date its ethics committee approved it there; until then the site keeps the previous version. {pendingCount} approval{pendingCount === 1 ? "" : "s"} pending.
        </p>
      </header>
      <section className="card overflow-x-auto">
        <table className="table-dense" data-testid="adoption-matrix">
          <thead>
            <tr>
              <th scope="col">Site</th>
              <th scope="col">In force today</th>
              {matrix.versions.map((v) => (
                <th scope="col" key={v.id}>
                  Version {v.versionLabel}
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {matrix.sites.map((s) => (
              <tr key={s.siteId}>
                <th scope="row" className="font-mono">
                  {s.siteCode}
                </th>
                <td data-testid={`in-force-${s.siteCode}`}>{s.inForceVersionLabel ?? "—"}</td>
                {s.cells.map((c) => (
                  <td key={c.versionId} data-testid={`adoption-${s.siteCode}-${labels.get(c.versionId)}`}>
                    {c.approval ? (
                      <span className="inline-flex flex-wrap items-center gap-1">
                        <StatusChip tone={c.inForceToday ? "ok" : "neutral"} icon={CircleCheck}>
                          Approved {c.approval.approvedOn}
                        </StatusChip>
                        {c.approval.recordedLate && <span className="text-xs text-muted">recorded {c.approval.recordedAt.slice(0, 10)}</span>}
                        {c.approval.letterDocumentId && <LetterLink documentId={c.approval.letterDocumentId} fileName={c.approval.letterFileName ?? "letter"} />}
                      </span>
                    ) : c.pending ? (
                      <StatusChip tone="attention" icon={Clock}>
                        Pending
                      </StatusChip>
                    ) : (
                      <span className="text-xs text-muted">not approved</span>
                    )}
                  </td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
      </section>
      {recordable.length > 0 && recordable.some((s) => s.cells.some((c) => !c.approval)) && (
        <section className="card" aria-labelledby="record">
          <h2 id="record" className="mb-2">
            Record an ethics-committee approval
          </h2>
          <RecordApprovalForm
            studyId={studyId}
            sites={recordable.map((s) => ({ id: s.siteId, code: s.siteCode, today: s.today, open: s.cells.filter((c) => !c.approval).map((c) => c.versionId) }))}
            versions={matrix.versions.map((v) => ({ id: v.id, versionLabel: v.versionLabel }))}
            maxBytes={env.UPLOAD_MAX_BYTES}
          />
        </section>
      )}
      <p className="governs">
        Cairn records the dates you enter. The ethics committee&apos;s approval letter and its conditions, and the approved protocol, govern which version applies at the site.
      </p>
    </div>
  );
}
