"use client";

import { keepPreviousData, useQuery } from "@tanstack/react-query";
import { useState } from "react";
import { apiFetch } from "@/lib/api/client";

type AuditRow = { id: number; at: string; actorName: string | null; action: string; entityType: string; entityId: string; siteId: string | null; before: unknown; after: unknown };
type AuditPage = { rows: AuditRow[]; total: number; page: number; pageSize: number };

const emptyFilters = { action: "", entityType: "", actor: "", from: "", to: "" };

export function AuditLog({ studyId }: { studyId: string }) {
  const [filters, setFilters] = useState(emptyFilters);
  const [page, setPage] = useState(1);
  const qs = new URLSearchParams({ page: String(page), pageSize: "50", ...Object.fromEntries(Object.entries(filters).filter(([, v]) => v)) });
  const { data, isFetching, error } = useQuery({
    queryKey: ["audit", studyId, qs.toString()],
    queryFn: () => apiFetch<AuditPage>(`/api/v1/studies/${studyId}/audit?${qs}`),
    placeholderData: keepPreviousData,
  });
  const pages = data ? Math.max(1, Math.ceil(data.total / data.pageSize)) : 1;
  const set = (k: keyof typeof emptyFilters) => (e: React.ChangeEvent<HTMLInputElement>) => {
    setPage(1);
    setFilters({ ...filters, [k]: e.target.value });
  };
  return (
    <div className="space-y-3">
      <div className="flex flex-wrap gap-3" role="search" aria-label="Filter the audit trail">
        <label className="field">
          <span>Action</span>
          <input className="input" value={filters.action} onChange={set("action")} placeholder="e.g. role.granted" />
        </label>
        <label className="field">
          <span>Record type</span>
          <input className="input" value={filters.entityType} onChange={set("entityType")} placeholder="e.g. membership" />
        </label>
        <label className="field">
          <span>Person</span>
          <input className="input" value={filters.actor} onChange={set("actor")} />
        </label>
        <label className="field">
          <span>From</span>
          <input className="input" type="date" value={filters.from} onChange={set("from")} />
        </label>
        <label className="field">
          <span>To</span>
          <input className="input" type="date" value={filters.to} onChange={set("to")} />
        </label>
      </div>
      {error && <p role="alert">{(error as Error).message}</p>}
      <table className="table-dense" data-testid="audit-table" aria-busy={isFetching}>
        <thead>
          <tr>
            <th>When (UTC)</th>
            <th>Who</th>
            <th>Action</th>
            <th>Record</th>
            <th>Before</th>
            <th>After</th>
          </tr>
        </thead>
        <tbody>
          {data?.rows.map((r) => (
            <tr key={r.id}>
              <td className="font-mono text-xs whitespace-nowrap">{r.at.slice(0, 19).replace("T", " ")}</td>
              <td>{r.actorName}</td>
              <td className="font-mono text-xs">{r.action}</td>
              <td className="text-xs">
                {r.entityType} <span className="font-mono text-muted">{r.entityId.slice(0, 8)}</span>
              </td>
              <td className="max-w-xs truncate font-mono text-xs" title={JSON.stringify(r.before)}>
                {r.before ? JSON.stringify(r.before) : "—"}
              </td>
              <td className="max-w-xs truncate font-mono text-xs" title={JSON.stringify(r.after)}>
                {r.after ? JSON.stringify(r.after) : "—"}
              </td>
            </tr>
          ))}
          {data && data.rows.length === 0 && (
            <tr>
              <td colSpan={6} className="text-muted">
                No recorded changes match.
              </td>
            </tr>
          )}
        </tbody>
      </table>
      <div className="flex items-center gap-3 text-sm">
        <button className="btn-secondary" disabled={page <= 1} onClick={() => setPage(page - 1)}>
          Previous
        </button>
        <span>
          Page {page} of {pages} · {data?.total ?? 0} events
        </span>
        <button className="btn-secondary" disabled={page >= pages} onClick={() => setPage(page + 1)}>
          Next
        </button>
      </div>
    </div>
  );
}
