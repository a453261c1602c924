"use client";

import { useQuery } from "@tanstack/react-query";
import { ChevronDown, ChevronRight } from "lucide-react";
import Link from "next/link";
import { Fragment, useMemo, useState } from "react";
import { apiFetch } from "@/lib/api/client";
import { describeLine, lineKindLabels, lineStateLabels } from "@/lib/ledger/line-labels";
import type { EarnedLine, LineState } from "@/lib/payment-schedule";
import { StatusChip, type Tone } from "@/components/status-chip";
import { fmt } from "./amounts";
import { FilterSelect } from "@/components/filter-select";

// JSON turns bigint into strings: the line as the client receives it.
type Wire<T> = { [K in keyof T]: T[K] extends bigint ? string : T[K] extends bigint | null ? string | null : T[K] };
type Line = Wire<EarnedLine>;
type Ledger = {
  site: { id: string; code: string; name: string; currency: string };
  asOf: string;
  lines: Line[];
  totals: Record<string, string | number> | null;
  holdback: { withheldMinor: string; releasedMinor: string; balanceMinor: string } | null;
  pending: { key: string; serviceDate: string; reason: string; detail: string }[];
};

const stateTone: Record<LineState, Tone> = { paid: "ok", outstanding: "info", overdue: "danger", not_payable: "neutral" };
type SortKey = "triggerDate" | "serviceDate" | "dueDate" | "netMinor" | "kind" | "state";
const sorters: Record<SortKey, (a: Line, b: Line) => number> = {
  triggerDate: (a, b) => a.triggerDate.localeCompare(b.triggerDate),
  serviceDate: (a, b) => a.serviceDate.localeCompare(b.serviceDate),
  dueDate: (a, b) => a.dueDate.localeCompare(b.dueDate),
  netMinor: (a, b) => (BigInt(a.netMinor) < BigInt(b.netMinor) ? -1 : BigInt(a.netMinor) > BigInt(b.netMinor) ? 1 : 0),
  kind: (a, b) => a.kind.localeCompare(b.kind),
  state: (a, b) => a.state.localeCompare(b.state),
};

function sum(lines: Line[], f: "grossMinor" | "overheadMinor" | "holdbackMinor" | "netMinor" | "paidMinor" | "outstandingMinor") {
  return lines.reduce((a, l) => a + BigInt(l[f]), 0n);
}

/** A site's ledger: every earned line, filterable by cycle, kind, state and text; grouped by cycle or flat. */
export function SiteLedger({ studyId, siteId }: { studyId: string; siteId: string }) {
  const { data, error, isLoading } = useQuery({ queryKey: ["ledger", siteId], queryFn: () => apiFetch<Ledger>(`/api/v1/sites/${siteId}/ledger`) });
  const [cycle, setCycle] = useState("");
  const [kind, setKind] = useState("");
  const [state, setState] = useState("");
  const [text, setText] = useState("");
  const [grouped, setGrouped] = useState(true);
  const [period, setPeriod] = useState({ from: "", to: "" });
  const [sort, setSort] = useState<{ key: SortKey; dir: 1 | -1 }>({ key: "triggerDate", dir: 1 });
  const [open, setOpen] = useState<string | null>(null);

  const cycles = useMemo(() => [...new Set((data?.lines ?? []).map((l) => l.cycle.label))].sort(), [data]);
  const lines = useMemo(() => {
    const t = text.trim().toLowerCase();
    const out = (data?.lines ?? []).filter(
      (l) => (!cycle || l.cycle.label === cycle) && (!kind || l.kind === kind) && (!state || l.state === state) && (!t || `${describeLine(l as unknown as EarnedLine)} ${l.key}`.toLowerCase().includes(t)),
    );
    return out.sort((a, b) => sort.dir * sorters[sort.key](a, b));
  }, [data, cycle, kind, state, text, sort]);

  if (isLoading) return <p>Loading the ledger…</p>;
  if (error || !data) return <p role="alert">Could not load the ledger: {(error as Error)?.message}</p>;
  const cur = data.site.currency;
  const groups = grouped ? cycles.filter((c) => lines.some((l) => l.cycle.label === c)).map((c) => ({ label: c, lines: lines.filter((l) => l.cycle.label === c) })) : [{ label: "", lines }];
  // A statement covers the chosen period when one is given, else the cycle filtered on (or everything).
  const byPeriod = Boolean(period.from || period.to);
  const statementQs = (format: string) =>
    new URLSearchParams({ format, ...(byPeriod ? { ...(period.from ? { from: period.from } : {}), ...(period.to ? { to: period.to } : {}) } : cycle ? { cycle } : {}) }).toString();
  const statementLabel = byPeriod ? ` ${period.from || "start"} to ${period.to || "today"}` : cycle ? ` ${cycle}` : "";
  const th = (key: SortKey, label: string, right = false) => (
    <th className={right ? "text-right" : undefined} aria-sort={sort.key === key ? (sort.dir === 1 ? "ascending" : "descending") : undefined}>
      <button type="button" className="font-semibold" onClick={() => setSort({ key, dir: sort.key === key ? (sort.dir === 1 ? -1 : 1) : 1 })}>
        {label}
        {sort.key === key ? (sort.dir === 1 ? " ↑" : " ↓") : ""}
      </button>
    </th>
  );
  const totalRow = (ls: Line[], label: string, testId?: string) => (
    <tr className="font-semibold" data-testid={testId}>
      <td colSpan={6}>{label}</td>
      <td className="amount" data-testid={testId ? `${testId}-gross` : undefined}>{fmt(sum(ls, "grossMinor"), cur, false)}</td>
      <td className="amount">{fmt(sum(ls, "overheadMinor"), cur, false)}</td>
      <td className="amount">{fmt(sum(ls, "holdbackMinor"), cur, false)}</td>
      <td className="amount" data-testid={testId ? `${testId}-net` : undefined}>{fmt(sum(ls, "netMinor"), cur, false)}</td>
      <td className="amount" data-testid={testId ? `${testId}-paid` : undefined}>{fmt(sum(ls, "paidMinor"), cur, false)}</td>
      <td className="amount" data-testid={testId ? `${testId}-outstanding` : undefined}>{fmt(sum(ls, "outstandingMinor"), cur, false)}</td>
      <td />
    </tr>
  );

  return (
    <div className="space-y-3" data-testid="site-ledger">
      <div className="flex flex-wrap items-end gap-3" role="search" aria-label="Filter the ledger">
        <FilterSelect label="Cycle" value={cycle} onChange={setCycle} allLabel="All cycles" options={cycles} testId="ledger-cycle-filter" />
        <FilterSelect label="Kind" value={kind} onChange={setKind} allLabel="All kinds" options={Object.entries(lineKindLabels)} />
        <FilterSelect label="State" value={state} onChange={setState} allLabel="All states" options={Object.entries(lineStateLabels)} />
        <label className="field">
          <span>Search</span>
          <input className="input" value={text} onChange={(e) => setText(e.target.value)} placeholder="Subject, visit, milestone" />
        </label>
        <label className="flex items-center gap-2 text-sm">
          <input type="checkbox" checked={grouped} onChange={(e) => setGrouped(e.target.checked)} /> Group by cycle
        </label>
        <fieldset className="ml-auto flex items-end gap-2">
          <legend className="sr-only">Statement period (optional)</legend>
          <label className="field">
            <span>Statement from</span>
            <input className="input" type="date" value={period.from} onChange={(e) => setPeriod({ ...period, from: e.target.value })} />
          </label>
          <label className="field">
            <span>to</span>
            <input className="input" type="date" value={period.to} onChange={(e) => setPeriod({ ...period, to: e.target.value })} />
          </label>
          <a className="btn-secondary" href={`/api/v1/sites/${siteId}/statement?${statementQs("csv")}`} download data-testid="statement-csv">
            Statement (CSV){statementLabel}
          </a>
          <a className="btn-secondary" href={`/api/v1/sites/${siteId}/statement?${statementQs("pdf")}`} download>
            Statement (PDF){statementLabel}
          </a>
        </fieldset>
      </div>
      <p className="text-sm text-muted">
        As of {data.asOf} (site&apos;s local date). Amounts in {cur}. {lines.length} of {data.lines.length} lines shown.
      </p>
      <div className="overflow-x-auto">
        <table className="table-dense" data-testid="ledger-table">
          <thead>
            <tr>
              <th aria-label="Details" />
              {th("triggerDate", "Earned on")}
              {th("kind", "Kind")}
              <th>Source</th>
              <th>Cycle</th>
              {th("dueDate", "Due")}
              <th className="text-right">Fee</th>
              <th className="text-right">Overhead</th>
              <th className="text-right">Held back</th>
              {th("netMinor", "Net", true)}
              <th className="text-right">Paid</th>
              <th className="text-right">Outstanding</th>
              {th("state", "State")}
            </tr>
          </thead>
          <tbody>
            {groups.map((g) => (
              <Fragment key={g.label || "all"}>
                {grouped ? (
                  <tr className="bg-paper">
                    <th colSpan={13} className="text-left">
                      Cycle {g.label} · due {g.lines[0]?.dueDate}
                    </th>
                  </tr>
                ) : null}
                {g.lines.map((l) => (
                  <Fragment key={l.key}>
                    <tr data-testid="ledger-line">
                      <td>
                        <button type="button" aria-expanded={open === l.key} aria-label={`Details of ${describeLine(l as unknown as EarnedLine)}`} onClick={() => setOpen(open === l.key ? null : l.key)}>
                          {open === l.key ? <ChevronDown size={14} aria-hidden /> : <ChevronRight size={14} aria-hidden />}
                        </button>
                      </td>
                      <td>{l.triggerDate}</td>
                      <td>{lineKindLabels[l.kind]}</td>
                      <td>{describeLine(l as unknown as EarnedLine)}</td>
                      <td>{l.cycle.label}</td>
                      <td>{l.dueDate}</td>
                      <td className="amount">{fmt(l.grossMinor, cur, false)}</td>
                      <td className="amount">{fmt(l.overheadMinor, cur, false)}</td>
                      <td className="amount">{fmt(l.holdbackMinor, cur, false)}</td>
                      <td className="amount">{fmt(l.netMinor, cur, false)}</td>
                      <td className="amount">{fmt(l.paidMinor, cur, false)}</td>
                      <td className="amount">{fmt(l.outstandingMinor, cur, false)}</td>
                      <td>
                        <StatusChip tone={stateTone[l.state]}>
                          {lineStateLabels[l.state]}
                          {l.partiallyPaid ? " (part paid)" : ""}
                        </StatusChip>
                      </td>
                    </tr>
                    {open === l.key ? (
                      <tr>
                        <td />
                        <td colSpan={12}>
                          <dl className="grid grid-cols-2 gap-x-6 gap-y-1 text-sm sm:grid-cols-4">
                            <dt className="text-muted">Source event</dt>
                            <dd>
                              {l.source.event.replace("_", " ")} · record <span className="font-mono">{l.source.id}</span>
                              {l.source.subjectId ? (
                                <>
                                  {" "}
                                  ·{" "}
                                  <Link className="underline" href={`/studies/${studyId}/subjects/${l.source.subjectId}`}>
                                    open subject {l.source.subjectCode}
                                  </Link>
                                </>
                              ) : null}
                            </dd>
                            <dt className="text-muted">Line key</dt>
                            <dd className="font-mono">{l.key}</dd>
                            <dt className="text-muted">Service date</dt>
                            <dd>{l.serviceDate}</dd>
                            <dt className="text-muted">Earned by</dt>
                            <dd>{l.trigger === "event_date" ? "the event itself" : l.trigger.replace("_", " ")} on {l.triggerDate}</dd>
                            <dt className="text-muted">Budget version</dt>
                            <dd>{l.budgetVersionNumber}</dd>
                            <dt className="text-muted">Last paid</dt>
                            <dd>{l.lastPaidOn ?? "—"}</dd>
                            {l.cappedFeeMinor !== null ? (
                              <>
                                <dt className="text-muted">Fee without the cap</dt>
                                <dd className="amount">{fmt(l.cappedFeeMinor, cur)}</dd>
                              </>
                            ) : null}
                            {l.capLiftedOn ? (
                              <>
                                <dt className="text-muted">Cap lifted</dt>
                                <dd>{l.capLiftedOn} by a later enrolment</dd>
                              </>
                            ) : null}
                          </dl>
                        </td>
                      </tr>
                    ) : null}
                  </Fragment>
                ))}
                {grouped && g.lines.length > 0 ? totalRow(g.lines, `Cycle ${g.label}: ${g.lines.length} lines`) : null}
              </Fragment>
            ))}
          </tbody>
          <tfoot>{totalRow(lines, `Total of the lines shown (${lines.length})`, "ledger-total")}</tfoot>
        </table>
      </div>
      {data.holdback ? (
        <p className="text-sm" data-testid="holdback-ledger">
          Holdback: withheld {fmt(data.holdback.withheldMinor, cur)}, released {fmt(data.holdback.releasedMinor, cur)}, still held {fmt(data.holdback.balanceMinor, cur)}.
        </p>
      ) : null}
      {data.pending.length > 0 ? (
        <details className="text-sm">
          <summary>{data.pending.length} recorded events not (yet) earned</summary>
          <ul className="list-disc pl-6">
            {data.pending.slice(0, 200).map((p) => (
              <li key={p.key}>
                {p.serviceDate}: {p.detail}
              </li>
            ))}
          </ul>
        </details>
      ) : null}
    </div>
  );
}
