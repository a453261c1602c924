import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { db } from "@/server/db/client";
import { getStudyContext } from "@/server/studies/study-context";
import { getAcknowledgementRequest } from "@/server/acknowledgements/get-request";
import { can } from "@/lib/auth/authorize";
import { idSchema } from "@/lib/api/schemas";
import { protocolVersionPath, redlinePath } from "@/lib/acknowledgements/links";
import { roleLabels, type Role } from "@/lib/auth/roles";
import { AckStatusChip } from "../_components/ack-status-chip";
import { SignForm } from "../_components/sign-form";

export const metadata: Metadata = { title: "Acknowledge a protocol version" };

export default async function AcknowledgementPage({ params }: { params: Promise<{ studyId: string; requestId: string }> }) {
  const { studyId, requestId } = await params;
  const { actor } = await getStudyContext(studyId);
  if (!idSchema.safeParse(requestId).success) notFound();
  const ack = await getAcknowledgementRequest(db, { studyId, requestId });
  if (!ack || !can(actor, "acknowledgement.read", { studyId, siteId: ack.site.id })) notFound();
  const own = ack.request.userId === actor.userId && can(actor, "acknowledgement.sign", { studyId, siteId: ack.site.id });
  const s = ack.signature;

  return (
    <div className="space-y-4">
      <p className="text-sm">
        <Link href={`/studies/${studyId}/acknowledgements`}>Acknowledgements</Link> / version {ack.version.versionLabel} · site {ack.site.code}
      </p>
      <header className="flex flex-wrap items-center gap-3">
        <h1>
          Protocol version {ack.version.versionLabel}: {ack.version.title}
        </h1>
        <AckStatusChip status={ack.status} />
      </header>
      <section className="card space-y-2 text-sm">
        <p>
          Site <span className="font-mono">{ack.site.code}</span> — {ack.site.name} ({ack.site.timeZone}). Due {ack.request.dueOn} (site date).
        </p>
        <p>
          Released content SHA-256: <span className="break-all font-mono text-xs">{ack.version.contentHash}</span>
        </p>
        <ul className="flex flex-wrap gap-4">
          <li>
            <Link href={protocolVersionPath(studyId, ack.version.id)} data-testid="read-version">
              Read version {ack.version.versionLabel}
            </Link>
          </li>
          {ack.compareTo && (
            <li>
              <Link href={redlinePath(studyId, ack.compareTo.id, ack.version.id)} data-testid="open-redline">
                Changes since version {ack.compareTo.versionLabel} (the version you last acknowledged)
              </Link>
            </li>
          )}
          {!ack.compareTo && ack.parent && (
            <li>
              <Link href={redlinePath(studyId, ack.parent.id, ack.version.id)} data-testid="open-redline">
                Changes from version {ack.parent.versionLabel} (the version this one amends)
              </Link>
            </li>
          )}
        </ul>
      </section>
      {s ? (
        <section className="card space-y-1 text-sm" data-testid="signature-record">
          <h2>Electronic signature</h2>
          <p>
            <strong>{s.printedName}</strong> ({roleLabels[s.role as Role]}), site {s.siteCode}
          </p>
          <p>
            Signed {s.signedAt.toISOString().replace("T", " ").replace(/\.\d+Z$/, " UTC")} · site time {s.signedAtSiteLocal} ({s.siteTimeZone})
          </p>
          <p>Meaning: {s.meaning}</p>
          <p>
            Signed content SHA-256: <span className="break-all font-mono text-xs">{s.contentHash}</span>
          </p>
          <p>
            <a href={`/api/v1/studies/${studyId}/acknowledgements/signature-page?versionId=${ack.version.id}&siteId=${ack.site.id}`} target="_blank" rel="noreferrer">
              Signature page (PDF)
            </a>
          </p>
        </section>
      ) : own ? (
        <section className="card space-y-3">
          <h2>Sign</h2>
          <p className="text-sm text-muted">
            Your signature records your printed name, the date and time (UTC and {ack.site.timeZone}), the meaning below and the content hash above. It cannot be changed or withdrawn.
          </p>
          <SignForm studyId={studyId} siteId={ack.site.id} versionId={ack.version.id} meaning={ack.meaning} />
        </section>
      ) : (
        <p className="text-sm text-muted">Not yet signed. Only the investigator asked can sign this acknowledgement.</p>
      )}
      <p className="governs">The protocol approved by the ethics committee governs; this acknowledgement records that you have read it.</p>
    </div>
  );
}
