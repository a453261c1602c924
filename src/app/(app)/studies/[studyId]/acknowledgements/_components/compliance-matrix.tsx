"use client";

import { useMemo, useState } from "react";
import Link from "next/link";
import { useQuery } from "@tanstack/react-query";
import type { ColumnDef } from "@tanstack/react-table";
import { Download, FileText } from "lucide-react";
import { DataTable } from "@/components/data-table";
import { apiFetch } from "@/lib/api/client";
import type { AcknowledgementState, AcknowledgementStatus } from "@/lib/acknowledgements/state";
import { AckStatusChip } from "./ack-status-chip";
import { FilterSelect } from "@/components/filter-select";

type Row = {
  requestId: string;
  versionId: string;
  versionLabel: string;
  siteId: string;
  siteCode: string;
  siteName: string;
  investigatorName: string;
  dueOn: string;
  status: AcknowledgementStatus;
  signature: { signedAt: string; signedAtSiteLocal: string } | null;
};

/** Version × site × investigator, filtered by site, version and state; CSV of the same filter. */
export function ComplianceMatrix({
  studyId,
  sites,
  versions,
  initialState,
}: {
  studyId: string;
  sites: { id: string; code: string }[];
  versions: { id: string; versionLabel: string }[];
  initialState?: AcknowledgementState;
}) {
  const [siteId, setSiteId] = useState("");
  const [versionId, setVersionId] = useState("");
  const [state, setState] = useState<string>(initialState ?? "");
  const query = new URLSearchParams(Object.entries({ siteId, versionId, state }).filter(([, v]) => v));
  const { data, isLoading, error } = useQuery({
    queryKey: ["acknowledgements", studyId, siteId, versionId, state],
    queryFn: () => apiFetch<{ rows: Row[]; counts: Record<AcknowledgementState, number> }>(`/api/v1/studies/${studyId}/acknowledgements?${query}`),
  });
  const columns = useMemo<ColumnDef<Row, unknown>[]>(
    () => [
      { header: "Version", accessorKey: "versionLabel" },
      { header: "Site", accessorKey: "siteCode" },
      { header: "Investigator", accessorKey: "investigatorName", cell: ({ row }) => <Link href={`/studies/${studyId}/acknowledgements/${row.original.requestId}`}>{row.original.investigatorName}</Link> },
      { header: "Due (site date)", accessorKey: "dueOn" },
      { header: "State", id: "state", accessorFn: (r) => r.status.state, cell: ({ row }) => <AckStatusChip status={row.original.status} /> },
      { header: "Signed (site time)", id: "signed", accessorFn: (r) => r.signature?.signedAtSiteLocal ?? "", cell: ({ row }) => <span className="font-mono text-xs">{row.original.signature?.signedAtSiteLocal ?? "—"}</span> },
    ],
    [studyId],
  );
  const pairs = useMemo(() => {
    const seen = new Map<string, { versionId: string; siteId: string; label: string }>();
    for (const r of data?.rows ?? []) seen.set(`${r.versionId}:${r.siteId}`, { versionId: r.versionId, siteId: r.siteId, label: `${r.versionLabel} · ${r.siteCode}` });
    return [...seen.values()];
  }, [data]);

  return (
    <div className="space-y-3" data-testid="compliance-matrix">
      <div className="flex flex-wrap items-end gap-3">
        <FilterSelect label="Site" value={siteId} onChange={setSiteId} allLabel="All your sites" options={sites.map((x) => [x.id, x.code] as const)} testId="matrix-site" />
        <FilterSelect label="Version" value={versionId} onChange={setVersionId} allLabel="All versions" options={versions.map((v) => [v.id, v.versionLabel] as const)} />
        <label className="field">
          <span>State</span>
          <select className="input" value={state} onChange={(e) => setState(e.target.value)} data-testid="matrix-state">
            <option value="">Any</option>
            <option value="pending">Pending</option>
            <option value="overdue">Overdue</option>
            <option value="acknowledged">Acknowledged</option>
          </select>
        </label>
        <a className="btn-secondary inline-flex items-center gap-1 no-underline" href={`/api/v1/studies/${studyId}/acknowledgements/export?${query}`} download>
          <Download aria-hidden size={14} /> Export CSV
        </a>
      </div>
      {data && (
        <p className="text-sm" data-testid="matrix-counts">
          {data.counts.acknowledged} acknowledged · {data.counts.pending} pending · {data.counts.overdue} overdue
        </p>
      )}
      {isLoading && <p className="animate-pulse text-sm text-muted">Loading…</p>}
      {error && <p className="text-sm text-brick">{(error as Error).message}</p>}
      {data && <DataTable columns={columns} data={data.rows} filterLabel="Filter by name" emptyText="No acknowledgements match." testId="matrix-table" />}
      {pairs.length > 0 && (
        <details className="text-sm">
          <summary>Signature pages (PDF)</summary>
          <ul className="mt-2 flex flex-wrap gap-3">
            {pairs.map((p) => (
              <li key={`${p.versionId}:${p.siteId}`}>
                <a className="inline-flex items-center gap-1" href={`/api/v1/studies/${studyId}/acknowledgements/signature-page?versionId=${p.versionId}&siteId=${p.siteId}`} target="_blank" rel="noreferrer">
                  <FileText aria-hidden size={14} /> {p.label}
                </a>
              </li>
            ))}
          </ul>
        </details>
      )}
    </div>
  );
}
