"use client";

import { useQuery } from "@tanstack/react-query";
import Link from "next/link";
import { useState } from "react";
import { apiFetch } from "@/lib/api/client";
import { itemStateLabels, itemStates, type ItemState } from "@/lib/binder/readiness";
import { studyPath } from "@/lib/nav";
import { siteStatusLabels, type SiteStatus } from "@/lib/sites/site-status";
import { SiteStatusChip } from "@/components/site-status-chip";
import { BinderStateChip } from "./binder-state-chip";

type Counts = Record<ItemState, number>;
type Matrix = {
  types: { id: string; code: string; name: string; holder: string; requiredFrom: SiteStatus | null }[];
  rows: { siteId: string; code: string; name: string; status: SiteStatus; totals: Counts; readyCount: number; requiredCount: number; cells: { typeId: string; required: boolean; counts: Counts }[] }[];
};

// Worst state first: a cell shows the count of its worst state and the rest on hover.
const severity: ItemState[] = ["expired", "rejected", "missing", "awaiting_review", "expiring", "complete"];

function Cell({ counts, required }: { counts: Counts; required: boolean }) {
  const total = itemStates.reduce((n, s) => n + counts[s], 0);
  if (total === 0) return <span className="text-muted">{required ? "—" : "n/a"}</span>;
  const title = severity.filter((s) => counts[s] > 0).map((s) => `${itemStateLabels[s]}: ${counts[s]}`).join(", ");
  return (
    <span title={title} className="flex flex-col items-start gap-0.5">
      {severity
        .filter((s) => counts[s] > 0)
        .map((s) => (
          <span key={s} data-state={s} className="whitespace-nowrap">
            <BinderStateChip state={s} /> <span className="font-mono">{counts[s]}</span>
          </span>
        ))}
    </span>
  );
}

export function BinderMatrix({ studyId }: { studyId: string }) {
  const [state, setState] = useState<ItemState | "">("");
  const [site, setSite] = useState("");
  const qs = new URLSearchParams({ ...(state ? { state } : {}), ...(site ? { site } : {}) });
  const { data, isLoading, error } = useQuery({
    queryKey: ["binder-matrix", studyId, state, site],
    queryFn: () => apiFetch<Matrix>(`/api/v1/studies/${studyId}/binder/matrix?${qs}`),
  });
  const csvHref = `/api/v1/studies/${studyId}/binder/matrix?${new URLSearchParams({ ...Object.fromEntries(qs), format: "csv" })}`;
  return (
    <div className="space-y-3">
      <div className="flex flex-wrap items-end gap-3">
        <label className="field">
          <span>Sites with an item that is</span>
          <select className="input" value={state} onChange={(e) => setState(e.target.value as ItemState | "")} name="state">
            <option value="">any state</option>
            {itemStates.map((s) => (
              <option key={s} value={s}>
                {itemStateLabels[s]}
              </option>
            ))}
          </select>
        </label>
        <label className="field">
          <span>Site code contains</span>
          <input className="input w-28" value={site} onChange={(e) => setSite(e.target.value)} name="site" />
        </label>
        <a className="btn-secondary" href={csvHref} download>
          Export CSV
        </a>
      </div>
      {isLoading && <p>Loading…</p>}
      {error && <p role="alert">{(error as Error).message}</p>}
      {data && (
        <div className="overflow-x-auto">
          <table className="table-dense" data-testid="binder-matrix">
            <thead>
              <tr>
                <th>Site</th>
                <th>Status</th>
                <th className="text-right">Ready</th>
                {data.types.map((t) => (
                  <th key={t.id} title={t.requiredFrom ? `Required from ${siteStatusLabels[t.requiredFrom]}` : "Optional"} className="min-w-28 align-bottom">
                    {t.name}
                  </th>
                ))}
              </tr>
            </thead>
            <tbody>
              {data.rows.length === 0 && (
                <tr>
                  <td colSpan={data.types.length + 3}>No site matches.</td>
                </tr>
              )}
              {data.rows.map((r) => (
                <tr key={r.siteId} data-testid={`matrix-row-${r.code}`}>
                  <td>
                    <Link className="font-mono text-slate underline" href={`${studyPath(studyId, "documents")}?site=${r.code}`}>
                      {r.code}
                    </Link>
                  </td>
                  <td>
                    <SiteStatusChip status={r.status} />
                  </td>
                  <td className="amount" data-testid="matrix-ready">
                    {r.readyCount}/{r.requiredCount}
                  </td>
                  {data.types.map((t) => {
                    const cell = r.cells.find((c) => c.typeId === t.id);
                    return (
                      <td key={t.id} data-testid={`matrix-cell-${r.code}-${t.code}`}>
                        {cell ? <Cell counts={cell.counts} required={cell.required} /> : null}
                      </td>
                    );
                  })}
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </div>
  );
}
