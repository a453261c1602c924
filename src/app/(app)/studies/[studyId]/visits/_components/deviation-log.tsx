"use client";

import { useQuery } from "@tanstack/react-query";
import { useState } from "react";
import { apiFetch } from "@/lib/api/client";
import { StatusChip } from "@/components/status-chip";

type Row = {
  id: string;
  siteCode: string;
  subjectId: string;
  subjectCode: string;
  source: "automatic" | "manual";
  category: string;
  visitCode: string | null;
  versionLabel: string | null;
  occurredOn: string;
  daysOutside: number | null;
  description: string;
  status: "open" | "resolved";
};
const categories = ["visit out of window", "consent", "eligibility", "procedure not done", "device handling", "other"];

/** The deviation log with filters; the same filters export as CSV. */
export function DeviationLog({ studyId, sites }: { studyId: string; sites: { id: string; code: string }[] }) {
  const [filter, setFilter] = useState<Record<string, string>>({});
  const qs = new URLSearchParams(Object.entries(filter).filter(([, v]) => v !== ""));
  const url = `/api/v1/studies/${studyId}/deviations?${qs}`;
  const { data, isLoading, error } = useQuery({ queryKey: ["deviations", studyId, qs.toString()], queryFn: () => apiFetch<{ deviations: Row[] }>(url) });
  const set = (k: string) => (e: React.ChangeEvent<HTMLInputElement | HTMLSelectElement>) => setFilter((f) => ({ ...f, [k]: e.target.value }));
  const csv = new URLSearchParams(qs);
  csv.set("format", "csv");
  return (
    <div className="space-y-3">
      <div className="flex flex-wrap items-end gap-2" role="group" aria-label="Filter deviations">
        <label className="field">
          <span>Site</span>
          <select className="input" onChange={set("siteId")}>
            <option value="">All</option>
            {sites.map((s) => (
              <option key={s.id} value={s.id}>
                {s.code}
              </option>
            ))}
          </select>
        </label>
        <label className="field">
          <span>State</span>
          <select className="input" onChange={set("status")}>
            <option value="">All</option>
            <option value="open">Open</option>
            <option value="resolved">Resolved</option>
          </select>
        </label>
        <label className="field">
          <span>Category</span>
          <select className="input" onChange={set("category")}>
            <option value="">All</option>
            {categories.map((c) => (
              <option key={c}>{c}</option>
            ))}
          </select>
        </label>
        <label className="field">
          <span>Subject</span>
          <input className="input font-mono" onChange={set("subject")} placeholder="DE01-0" />
        </label>
        <label className="field">
          <span>From</span>
          <input className="input" type="date" onChange={set("from")} />
        </label>
        <label className="field">
          <span>To</span>
          <input className="input" type="date" onChange={set("to")} />
        </label>
        <a className="btn-secondary" href={`/api/v1/studies/${studyId}/deviations?${csv}`} download>
          Export CSV
        </a>
      </div>
      {isLoading ? (
        <p>Loading deviations…</p>
      ) : error ? (
        <p role="alert">{(error as Error).message}</p>
      ) : (
        <table className="table-dense" data-testid="deviation-log">
          <thead>
            <tr>
              <th>Date</th>
              <th>Site</th>
              <th>Subject</th>
              <th>Category</th>
              <th>Visit</th>
              <th className="text-right">Days outside</th>
              <th>Description</th>
              <th>State</th>
            </tr>
          </thead>
          <tbody>
            {(data?.deviations ?? []).map((d) => (
              <tr key={d.id}>
                <td className="whitespace-nowrap font-mono">{d.occurredOn}</td>
                <td className="font-mono">{d.siteCode}</td>
                <td className="whitespace-nowrap">
                  <a className="font-mono underline" href={`/studies/${studyId}/subjects/${d.subjectId}`}>
                    {d.subjectCode}
                  </a>
                </td>
                <td>{d.category}</td>
                <td className="font-mono">{d.visitCode ?? ""}</td>
                <td className="amount">{d.daysOutside ?? ""}</td>
                <td className="max-w-md">{d.description}</td>
                <td>{d.status === "open" ? <StatusChip tone="attention">Open</StatusChip> : <StatusChip tone="ok">Resolved</StatusChip>}</td>
              </tr>
            ))}
            {data?.deviations.length === 0 && (
              <tr>
                <td colSpan={8}>No deviations match.</td>
              </tr>
            )}
          </tbody>
        </table>
      )}
    </div>
  );
}
