import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { db } from "@/server/db/client";
import { getStudyContext } from "@/server/studies/study-context";
import { getSubjectDetail } from "@/server/subjects/get-subject";
import { can } from "@/lib/auth/authorize";
import { idSchema } from "@/lib/api/schemas";
import { studyPath } from "@/lib/nav";
import { subjectStatusLabels } from "@/lib/subjects/subject-states";
import { protocolGovernsNotice } from "@/lib/visits/ical";
import { StatusChip } from "@/components/status-chip";
import { CorrectDatesForm } from "../_components/correct-dates-form";
import { ReportDeviationForm } from "../_components/report-deviation-form";
import { ResolveDeviationForm } from "../_components/resolve-deviation-button";
import { SubjectStatusChip } from "../_components/subject-status-chip";
import { SubjectStatusForm } from "../_components/subject-status-form";
import { VisitCalendar } from "../_components/visit-calendar";

export const metadata: Metadata = { title: "Subject" };

export default async function SubjectPage({ params }: { params: Promise<{ studyId: string; subjectId: string }> }) {
  const { studyId, subjectId } = await params;
  const { actor } = await getStudyContext(studyId);
  if (!idSchema.safeParse(subjectId).success) notFound();
  const detail = await getSubjectDetail(db, { subjectId }).catch(() => null);
  if (!detail || detail.subject.studyId !== studyId) notFound();
  const scope = { studyId, siteId: detail.subject.siteId };
  if (!can(actor, "subjects.read", scope)) notFound();
  const { subject, site, calendar, history, deviations, consentVersion, versionsAtSite, nextStatuses } = detail;
  const canWrite = can(actor, "subjects.write", scope);
  const canDeviations = can(actor, "deviations.write", scope);
  return (
    <div className="space-y-6">
      <header className="space-y-1">
        <p className="text-sm">
          <Link className="underline" href={`${studyPath(studyId, "subjects")}?siteId=${site.id}`}>
            Subjects at {site.code}
          </Link>
        </p>
        <h1 className="flex items-center gap-3">
          <span className="font-mono" data-testid="subject-code">
            {subject.code}
          </span>
          <SubjectStatusChip status={subject.status} />
        </h1>
        <dl className="grid max-w-3xl grid-cols-2 gap-x-6 gap-y-1 text-sm sm:grid-cols-4" data-testid="subject-facts">
          <dt className="text-muted">Site</dt>
          <dd>
            {site.code} ({site.timeZone})
          </dd>
          <dt className="text-muted">Consent</dt>
          <dd>
            {subject.consentDate} on protocol {consentVersion?.versionLabel ?? "?"}
          </dd>
          <dt className="text-muted">Screening</dt>
          <dd>{subject.screeningDate ?? "—"}</dd>
          <dt className="text-muted">Enrolment</dt>
          <dd>{subject.enrolmentDate ?? "—"}</dd>
          <dt className="text-muted">Implant</dt>
          <dd>{subject.implantDate ?? "—"}</dd>
          <dt className="text-muted">Device serial</dt>
          <dd className="font-mono">{subject.deviceSerial ?? "—"}</dd>
          {subject.screenFailReason && (
            <>
              <dt className="text-muted">Screen failure</dt>
              <dd>{subject.screenFailReason}</dd>
            </>
          )}
          {subject.withdrawnReason && (
            <>
              <dt className="text-muted">Withdrawn</dt>
              <dd>
                {subject.endedOn}: {subject.withdrawnReason}
              </dd>
            </>
          )}
        </dl>
      </header>
      {canWrite && nextStatuses.length > 0 && (
        <section className="card" aria-labelledby="status-heading">
          <h2 id="status-heading" className="mb-2">
            Next step
          </h2>
          <SubjectStatusForm subjectId={subject.id} next={nextStatuses} />
        </section>
      )}
      <section className="space-y-2" aria-labelledby="calendar-heading">
        <h2 id="calendar-heading">Visit calendar</h2>
        <p className="text-sm">
          As of {calendar.asOf} at the site. Pending visits follow protocol {calendar.versionInForce?.versionLabel ?? "— (none approved at the site yet)"}; visits already recorded keep
          the version they were done under.{" "}
          {versionsAtSite.length > 0 && <>In force at {site.code}: {versionsAtSite.map((v) => `${v.versionLabel} from ${v.inForceFrom}`).join(", ")}.</>}
        </p>
        <p className="governs">{protocolGovernsNotice} The ethics committee&apos;s and regulators&apos; rules also govern.</p>
        <VisitCalendar subjectId={subject.id} entries={calendar.entries} canRecord={can(actor, "visits.record", scope)} canVerify={can(actor, "visits.verify", scope)} />
      </section>
      <section className="space-y-2" aria-labelledby="deviations-heading">
        <h2 id="deviations-heading">Deviations</h2>
        {deviations.length === 0 ? (
          <p className="text-sm">No deviations recorded.</p>
        ) : (
          <table className="table-dense" data-testid="subject-deviations">
            <thead>
              <tr>
                <th>Date</th>
                <th>Category</th>
                <th>Visit</th>
                <th>Description</th>
                <th>State</th>
                {canDeviations && <th />}
              </tr>
            </thead>
            <tbody>
              {deviations.map((d) => (
                <tr key={d.id}>
                  <td className="font-mono">{d.occurredOn}</td>
                  <td>{d.category}</td>
                  <td className="font-mono">{d.visitCode ?? ""}</td>
                  <td>{d.description}</td>
                  <td>
                    {d.status === "open" ? <StatusChip tone="attention">Open</StatusChip> : <StatusChip tone="ok">Resolved</StatusChip>}
                    {d.resolution && <p className="text-xs">{d.resolution}</p>}
                  </td>
                  {canDeviations && <td>{d.status === "open" && d.source === "manual" && <ResolveDeviationForm deviationId={d.id} />}</td>}
                </tr>
              ))}
            </tbody>
          </table>
        )}
        {canDeviations && (
          <details>
            <summary className="cursor-pointer text-sm font-semibold">Report another deviation</summary>
            <ReportDeviationForm subjectId={subject.id} visitCodes={calendar.entries.map((e) => e.visitCode)} />
          </details>
        )}
      </section>
      {canWrite && subject.status !== "screen_failed" && (
        <details>
          <summary className="cursor-pointer text-sm font-semibold">Correct recorded dates</summary>
          <CorrectDatesForm subjectId={subject.id} dates={subject} />
        </details>
      )}
      <section className="space-y-2" aria-labelledby="history-heading">
        <h2 id="history-heading">Status history</h2>
        <table className="table-dense">
          <thead>
            <tr>
              <th>Date</th>
              <th>Status</th>
              <th>Reason</th>
              <th>By</th>
            </tr>
          </thead>
          <tbody>
            {history.map((h, i) => (
              <tr key={i}>
                <td className="font-mono">{h.effectiveOn}</td>
                <td>{subjectStatusLabels[h.toStatus]}</td>
                <td>{h.reason ?? ""}</td>
                <td>{h.actorName ?? "—"}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </section>
    </div>
  );
}
