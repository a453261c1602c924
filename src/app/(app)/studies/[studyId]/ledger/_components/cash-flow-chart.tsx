"use client";

import { useQuery } from "@tanstack/react-query";
import { useState } from "react";
import { apiFetch } from "@/lib/api/client";
import { minorPerMajor } from "@/lib/money";
import { fmt } from "./amounts";

type Month = { month: string; paidMinor: string; dueMinor: string; projectedMinor: string; lowMinor: string; highMinor: string };
type ProjectionResponse = { asOf: string; firstProjectedMonth: string; cashFlow: { currency: string; months: Month[] }[] };

const W = 760;
const H = 240;
const PAD = { left: 70, right: 10, top: 10, bottom: 40 };

/**
 * Paid (by month paid), due (outstanding by month due) and projected (expected by month earned,
 * with the 80% band), one currency at a time: amounts in different currencies are never added.
 * Bars carry a pattern as well as a colour, and a table gives the same figures.
 */
export function CashFlowChart({ studyId }: { studyId: string }) {
  const { data, error, isLoading } = useQuery({ queryKey: ["projection", studyId], queryFn: () => apiFetch<ProjectionResponse>(`/api/v1/studies/${studyId}/ledger/projection`) });
  const [currency, setCurrency] = useState<string | null>(null);
  if (isLoading) return <p>Computing the projection…</p>;
  if (error || !data) return <p role="alert">Could not compute the projection: {(error as Error)?.message}</p>;
  if (data.cashFlow.length === 0) return <p>Nothing earned or projected yet.</p>;
  const series = data.cashFlow.find((c) => c.currency === currency) ?? data.cashFlow[0]!;
  const cur = series.currency;
  const unit = Number(minorPerMajor(cur));
  const major = (m: string) => Number(BigInt(m)) / unit;
  const months = series.months;
  const max = Math.max(1, ...months.map((m) => Math.max(major(m.paidMinor) + major(m.dueMinor), major(m.highMinor))));
  const x = (i: number) => PAD.left + (i * (W - PAD.left - PAD.right)) / months.length;
  const bw = (W - PAD.left - PAD.right) / months.length;
  const y = (v: number) => H - PAD.bottom - (v / max) * (H - PAD.top - PAD.bottom);
  const projected = months.map((m, i) => ({ i, m })).filter(({ m }) => m.month >= data.firstProjectedMonth);
  const band =
    projected.length > 0
      ? [...projected.map(({ i, m }) => `${x(i) + bw / 2},${y(major(m.highMinor))}`), ...[...projected].reverse().map(({ i, m }) => `${x(i) + bw / 2},${y(major(m.lowMinor))}`)].join(" ")
      : "";
  return (
    <div className="space-y-2" data-testid="cash-flow">
      <div className="flex items-center gap-3">
        <label className="field">
          <span>Currency</span>
          <select className="input" value={cur} onChange={(e) => setCurrency(e.target.value)}>
            {data.cashFlow.map((c) => (
              <option key={c.currency}>{c.currency}</option>
            ))}
          </select>
        </label>
        <ul className="flex gap-4 text-sm" aria-label="Legend">
          <li><svg width="14" height="10" aria-hidden><rect width="14" height="10" fill="#3E6B5C" /></svg> Paid</li>
          <li><svg width="14" height="10" aria-hidden><rect width="14" height="10" fill="url(#due-hatch)" stroke="#B7802A" /></svg> Due (outstanding)</li>
          <li><svg width="14" height="10" aria-hidden><line x1="0" y1="5" x2="14" y2="5" stroke="#3D5A80" strokeWidth="2" strokeDasharray="3 2" /></svg> Projected, with 80% band</li>
        </ul>
      </div>
      <svg viewBox={`0 0 ${W} ${H}`} className="w-full max-w-4xl" role="img" aria-label={`Cash flow in ${cur}: paid, due and projected by month`}>
        <defs>
          <pattern id="due-hatch" width="6" height="6" patternUnits="userSpaceOnUse" patternTransform="rotate(45)">
            <rect width="6" height="6" fill="#F3E6CF" />
            <line x1="0" y1="0" x2="0" y2="6" stroke="#B7802A" strokeWidth="2" />
          </pattern>
        </defs>
        {[0, 0.5, 1].map((f) => (
          <g key={f}>
            <line x1={PAD.left} x2={W - PAD.right} y1={y(max * f)} y2={y(max * f)} stroke="#C9C4BA" strokeWidth="0.5" />
            <text x={PAD.left - 6} y={y(max * f) + 4} fontSize="10" textAnchor="end" fill="#5B625E">
              {Math.round(max * f).toLocaleString("en")}
            </text>
          </g>
        ))}
        {band ? <polygon points={band} fill="#3D5A80" opacity="0.15" /> : null}
        {months.map((m, i) => {
          const paid = major(m.paidMinor);
          const due = major(m.dueMinor);
          return (
            <g key={m.month}>
              <rect x={x(i) + 2} width={bw - 4} y={y(paid)} height={H - PAD.bottom - y(paid)} fill="#3E6B5C" />
              <rect x={x(i) + 2} width={bw - 4} y={y(paid + due)} height={y(paid) - y(paid + due)} fill="url(#due-hatch)" stroke="#B7802A" strokeWidth="0.5" />
              {i % 3 === 0 ? (
                <text x={x(i) + bw / 2} y={H - PAD.bottom + 14} fontSize="9" textAnchor="middle" fill="#5B625E">
                  {m.month}
                </text>
              ) : null}
            </g>
          );
        })}
        {projected.length > 1 ? (
          <polyline points={projected.map(({ i, m }) => `${x(i) + bw / 2},${y(major(m.projectedMinor))}`).join(" ")} fill="none" stroke="#3D5A80" strokeWidth="2" strokeDasharray="5 3" />
        ) : null}
      </svg>
      <details>
        <summary className="text-sm">The same figures as a table</summary>
        <table className="table-dense" data-testid="cash-flow-table">
          <thead>
            <tr>
              <th>Month</th>
              <th className="text-right">Paid</th>
              <th className="text-right">Due</th>
              <th className="text-right">Projected</th>
              <th className="text-right">80% band, low</th>
              <th className="text-right">80% band, high</th>
            </tr>
          </thead>
          <tbody>
            {months.map((m) => (
              <tr key={m.month}>
                <td>{m.month}</td>
                <td className="amount">{fmt(m.paidMinor, cur)}</td>
                <td className="amount">{fmt(m.dueMinor, cur)}</td>
                <td className="amount">{m.month >= data.firstProjectedMonth ? fmt(m.projectedMinor, cur) : "—"}</td>
                <td className="amount">{m.month >= data.firstProjectedMonth ? fmt(m.lowMinor, cur) : "—"}</td>
                <td className="amount">{m.month >= data.firstProjectedMonth ? fmt(m.highMinor, cur) : "—"}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </details>
      <p className="text-xs text-muted">
        Projected: visits on the calendars of enrolled subjects, plus enrolment forecast per site from its observed rate (Poisson–gamma recruitment model); the band holds the forecast part with 80% probability. An estimate, not a commitment.
      </p>
    </div>
  );
}
