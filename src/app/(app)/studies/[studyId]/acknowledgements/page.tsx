import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { db } from "@/server/db/client";
import { listProtocolVersions } from "@/server/protocol/queries";
import { getStudyContext } from "@/server/studies/study-context";
import { listSitesForStudy } from "@/server/studies/queries";
import { listMyAcknowledgements } from "@/server/acknowledgements/list-matrix";
import { accessibleSiteIds, can, canSomewhere } from "@/lib/auth/authorize";
import { acknowledgementStates, type AcknowledgementState } from "@/lib/acknowledgements/state";
import { AckStatusChip } from "./_components/ack-status-chip";
import { ComplianceMatrix } from "./_components/compliance-matrix";
import { DeadlineSetting } from "./_components/deadline-setting";

export const metadata: Metadata = { title: "Acknowledgements" };

export default async function AcknowledgementsPage({ params, searchParams }: { params: Promise<{ studyId: string }>; searchParams: Promise<{ state?: string }> }) {
  const { studyId } = await params;
  const { state } = await searchParams;
  const { actor, study } = await getStudyContext(studyId);
  if (!canSomewhere(actor, "acknowledgement.read", studyId)) notFound();
  const signs = canSomewhere(actor, "acknowledgement.sign", studyId);
  const mine = signs ? await listMyAcknowledgements(db, { studyId, userId: actor.userId }) : [];
  const sites = await listSitesForStudy(db, { studyId, siteIds: accessibleSiteIds(actor, "acknowledgement.read", studyId) });
  const versions = (await listProtocolVersions(db, { studyId, audience: "published" })).map((v) => ({ id: v.id, versionLabel: v.versionLabel }));

  return (
    <div className="space-y-6">
      <header>
        <h1>Acknowledgements</h1>
        <p className="text-sm text-muted">
          Investigators acknowledge each released protocol version with an electronic signature within {study.ackDeadlineDays} days (site calendar).
        </p>
      </header>
      {signs && (
        <section className="card" aria-labelledby="my-acks">
          <h2 id="my-acks" className="mb-2">
            Your acknowledgements
          </h2>
          {mine.length === 0 ? (
            <p className="text-sm">Nothing to acknowledge.</p>
          ) : (
            <ul className="flex flex-col gap-2 text-sm" data-testid="my-acknowledgements">
              {mine.map((r) => (
                <li key={r.requestId} className="flex flex-wrap items-center gap-2">
                  <AckStatusChip status={r.status} />
                  <span>
                    Protocol version <strong>{r.versionLabel}</strong> at site <span className="font-mono">{r.siteCode}</span>, due {r.dueOn}
                  </span>
                  <Link href={`/studies/${studyId}/acknowledgements/${r.requestId}`} className={r.signature ? "" : "btn no-underline"}>
                    {r.signature ? "View signature" : "Read and sign"}
                  </Link>
                </li>
              ))}
            </ul>
          )}
        </section>
      )}
      <section className="card" aria-labelledby="matrix">
        <h2 id="matrix" className="mb-2">
          Compliance matrix
        </h2>
        <ComplianceMatrix
          studyId={studyId}
          sites={sites.map((s) => ({ id: s.id, code: s.code }))}
          versions={versions}
          initialState={acknowledgementStates.includes(state as AcknowledgementState) ? (state as AcknowledgementState) : undefined}
        />
      </section>
      {can(actor, "study.manage", { studyId }) && (
        <section className="card" aria-labelledby="deadline">
          <h2 id="deadline" className="mb-2">
            Deadline
          </h2>
          <DeadlineSetting studyId={studyId} days={study.ackDeadlineDays} />
        </section>
      )}
      <p className="governs">
        Due dates are counted in each site&apos;s calendar. The approved protocol, the signed agreement and the ethics committee&apos;s and regulators&apos; rules govern what must be acknowledged and by when.
      </p>
    </div>
  );
}
