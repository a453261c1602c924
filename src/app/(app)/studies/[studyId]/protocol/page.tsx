import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { db } from "@/server/db/client";
import { getStudyContext } from "@/server/studies/study-context";
import { audienceFor, listProtocolVersions } from "@/server/protocol/queries";
import { accessibleSiteIds, canSomewhere } from "@/lib/auth/authorize";
import { amendmentLabel } from "@/lib/protocol/version-label";
import { studyPath } from "@/lib/nav";
import { ProtocolStateChip } from "./_components/protocol-state-chip";
import { NewVersionButton } from "./_components/new-version-button";
import { ComparePicker } from "./_components/compare-picker";

export const metadata: Metadata = { title: "Protocol" };

const day = (d: Date | null) => (d ? d.toISOString().slice(0, 10) : "—");

export default async function ProtocolPage({ params }: { params: Promise<{ studyId: string }> }) {
  const { studyId } = await params;
  const { actor } = await getStudyContext(studyId);
  if (!canSomewhere(actor, "protocol.read", studyId)) notFound();
  const versions = await listProtocolVersions(db, { studyId, audience: audienceFor(accessibleSiteIds(actor, "protocol.read", studyId)) });
  const canWrite = canSomewhere(actor, "protocol.write", studyId);
  const open = versions.find((v) => ["draft", "in_review", "returned", "approved"].includes(v.state));
  const base = studyPath(studyId, "protocol");
  return (
    <div className="space-y-4">
      <header className="flex flex-wrap items-center justify-between gap-2">
        <h1>Protocol</h1>
        {canWrite && !open && <NewVersionButton studyId={studyId} hasReleased={versions.some((v) => v.state === "released")} />}
      </header>
      {canWrite && open && (
        <p className="text-sm">
          Version {open.versionLabel} is being worked on; a new version can start once it is released.
        </p>
      )}
      <section className="card overflow-x-auto">
        <table className="table-dense" data-testid="protocol-versions">
          <thead>
            <tr>
              <th>Version</th>
              <th>Amendment</th>
              <th>State</th>
              <th>Author</th>
              <th>Approved</th>
              <th>Released</th>
              <th>Content SHA-256</th>
              <th></th>
            </tr>
          </thead>
          <tbody>
            {versions.map((v) => (
              <tr key={v.id} data-version={v.versionLabel}>
                <td>
                  <Link href={`${base}/${v.id}`} className="font-semibold">
                    {v.versionLabel}
                  </Link>
                </td>
                <td>{amendmentLabel(v.amendmentNumber, v.substantial ?? false)}</td>
                <td>
                  <ProtocolStateChip state={v.state} />
                </td>
                <td>{v.authorName}</td>
                <td>{v.approvedAt ? `${day(v.approvedAt)} · ${v.approverName ?? ""}` : "—"}</td>
                <td>{v.releasedAt ? `${day(v.releasedAt)} · ${v.releaserName ?? ""}` : "—"}</td>
                <td className="font-mono text-xs" title={v.contentHash ?? undefined}>
                  {v.contentHash ? `${v.contentHash.slice(0, 12)}…` : "—"}
                </td>
                <td className="whitespace-nowrap">
                  {v.parentId && (
                    <Link href={`${base}/compare?from=${v.parentId}&to=${v.id}`}>Redline vs parent</Link>
                  )}
                </td>
              </tr>
            ))}
            {versions.length === 0 && (
              <tr>
                <td colSpan={8}>No protocol version yet.</td>
              </tr>
            )}
          </tbody>
        </table>
      </section>
      {versions.length > 1 && <ComparePicker studyId={studyId} versions={versions.map((v) => ({ id: v.id, label: `${v.versionLabel} (${v.state.replace("_", " ")})` }))} />}
      <p className="governs">
        Cairn keeps the versions and their history. The protocol approved by each site&apos;s ethics committee, and the competent authority&apos;s
        rules, govern what applies at a site and from when.
      </p>
    </div>
  );
}
