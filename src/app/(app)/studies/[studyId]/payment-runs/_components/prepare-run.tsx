"use client";

import { useQuery } from "@tanstack/react-query";
import { useRouter } from "next/navigation";
import { useMemo, useState } from "react";
import { apiFetch } from "@/lib/api/client";
import { formatMinor } from "@/lib/money";
import { studyPath } from "@/lib/nav";
import { FilterSelect } from "@/components/filter-select";

type DueLine = { key: string; siteId: string; currency: string; kind: string; description: string; serviceDate: string; dueDate: string; cycle: string; amountMinor: string; overdue: boolean };

/** Select due lines by cycle, site and currency, and freeze them into a run. */
export function PrepareRun({ studyId, sites }: { studyId: string; sites: { id: string; code: string; currency: string }[] }) {
  const router = useRouter();
  const [cycle, setCycle] = useState("");
  const [currency, setCurrency] = useState("");
  const [siteId, setSiteId] = useState("");
  const [excluded, setExcluded] = useState<Set<string>>(new Set());
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const qs = new URLSearchParams({ ...(cycle ? { cycle } : {}), ...(currency ? { currency } : {}), ...(siteId ? { siteId } : {}) }).toString();
  const due = useQuery({
    queryKey: ["due-lines", studyId, qs],
    queryFn: () => apiFetch<{ lines: DueLine[]; cycles: string[] }>(`/api/v1/studies/${studyId}/payment-runs/due-lines${qs ? `?${qs}` : ""}`),
  });
  const lines = useMemo(() => due.data?.lines ?? [], [due.data]);
  const chosen = lines.filter((l) => !excluded.has(l.key));
  const totals = new Map<string, bigint>();
  for (const l of chosen) totals.set(l.currency, (totals.get(l.currency) ?? 0n) + BigInt(l.amountMinor));
  const code = (id: string) => sites.find((s) => s.id === id)?.code ?? id;
  const currencies = [...new Set(sites.map((s) => s.currency))].sort();

  const prepare = async () => {
    setBusy(true);
    setError(null);
    try {
      const { run } = await apiFetch<{ run: { id: string } }>(`/api/v1/studies/${studyId}/payment-runs`, {
        method: "POST",
        json: { cycle: cycle || null, currency: currency || null, siteIds: siteId ? [siteId] : null, lineKeys: chosen.map((l) => l.key) },
      });
      router.push(studyPath(studyId, `payment-runs/${run.id}`));
    } catch (e) {
      setError((e as Error).message);
      setBusy(false);
    }
  };

  return (
    <section className="card space-y-3" aria-labelledby="prepare-heading">
      <h2 id="prepare-heading">Prepare a run</h2>
      <div className="flex flex-wrap gap-3">
        <FilterSelect label="Cycle" value={cycle} onChange={setCycle} allLabel="All due" options={due.data?.cycles ?? []} />
        <FilterSelect label="Site" value={siteId} onChange={setSiteId} allLabel="All sites" options={sites.map((x) => [x.id, x.code] as const)} />
        <label className="field">
          <span>Currency</span>
          <select className="input" value={currency} onChange={(e) => setCurrency(e.target.value)} aria-label="Currency">
            <option value="">All currencies</option>
            {currencies.map((c) => (
              <option key={c}>{c}</option>
            ))}
          </select>
        </label>
      </div>
      {due.isLoading && <p className="text-sm">Computing due lines…</p>}
      {due.error && <p className="text-sm text-brick">{(due.error as Error).message}</p>}
      {due.data && lines.length === 0 && <p className="text-sm">No due lines match this selection.</p>}
      {lines.length > 0 && (
        <div className="max-h-96 overflow-auto">
          <table className="table-dense" data-testid="due-lines">
            <thead>
              <tr>
                <th>
                  <input
                    type="checkbox"
                    aria-label="Include all lines"
                    checked={excluded.size === 0}
                    onChange={(e) => setExcluded(e.target.checked ? new Set() : new Set(lines.map((l) => l.key)))}
                  />
                </th>
                <th>Site</th>
                <th>Line</th>
                <th>Service date</th>
                <th>Cycle</th>
                <th>Due</th>
                <th className="text-right">Amount</th>
              </tr>
            </thead>
            <tbody>
              {lines.map((l) => (
                <tr key={l.key}>
                  <td>
                    <input
                      type="checkbox"
                      aria-label={`Include ${l.description}`}
                      checked={!excluded.has(l.key)}
                      onChange={(e) => {
                        const next = new Set(excluded);
                        if (e.target.checked) next.delete(l.key);
                        else next.add(l.key);
                        setExcluded(next);
                      }}
                    />
                  </td>
                  <td className="font-mono">{code(l.siteId)}</td>
                  <td>{l.description}</td>
                  <td>{l.serviceDate}</td>
                  <td>{l.cycle}</td>
                  <td>
                    {l.dueDate} {l.overdue && <span className="text-xs font-semibold text-brick">overdue</span>}
                  </td>
                  <td className="amount">{formatMinor(BigInt(l.amountMinor), l.currency)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
      <div className="flex flex-wrap items-center gap-3">
        <button type="button" className="btn" disabled={busy || chosen.length === 0} onClick={prepare}>
          Prepare run of {chosen.length} line{chosen.length === 1 ? "" : "s"}
        </button>
        <span className="text-sm amount">{[...totals].map(([c, m]) => formatMinor(m, c)).join(" · ")}</span>
      </div>
      {error && (
        <p role="alert" className="text-sm text-brick">
          {error}
        </p>
      )}
    </section>
  );
}
