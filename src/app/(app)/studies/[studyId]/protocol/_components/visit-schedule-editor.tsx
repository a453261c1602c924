"use client";

import { anchorEvents, scheduledVisitSchema, type ScheduledVisit } from "@/lib/protocol/visit-schedule";

// Editable schedule of visits. Rows hold the raw field texts so a half-typed number is kept;
// each row is checked with the same zod schema the API uses.

export type VisitRow = { key: string; code: string; label: string; anchor: string; dayOffset: string; windowBefore: string; windowAfter: string; procedures: string };

let counter = 0;
const newKey = () => `row-${++counter}`;

export function toRows(visits: readonly ScheduledVisit[]): VisitRow[] {
  return visits.map((v) => ({
    key: newKey(),
    code: v.code,
    label: v.label,
    anchor: v.anchor,
    dayOffset: String(v.dayOffset),
    windowBefore: String(v.windowBefore),
    windowAfter: String(v.windowAfter),
    procedures: v.procedures.join("; "),
  }));
}

const num = (s: string) => (/^-?\d+$/.test(s.trim()) ? Number(s.trim()) : Number.NaN);

/** The schedule, or the errors per row and field. */
export function parseRows(rows: VisitRow[]): { ok: true; visits: ScheduledVisit[] } | { ok: false; errors: Record<string, Record<string, string>> } {
  const errors: Record<string, Record<string, string>> = {};
  const visits: ScheduledVisit[] = [];
  const seen = new Set<string>();
  for (const r of rows) {
    const parsed = scheduledVisitSchema.safeParse({
      code: r.code,
      label: r.label,
      anchor: r.anchor,
      dayOffset: num(r.dayOffset),
      windowBefore: num(r.windowBefore),
      windowAfter: num(r.windowAfter),
      procedures: r.procedures
        .split(/[;\n]/)
        .map((p) => p.trim())
        .filter(Boolean),
    });
    if (!parsed.success) {
      errors[r.key] = Object.fromEntries(parsed.error.issues.map((i) => [String(i.path[0]), i.message.startsWith("Invalid input: expected number") ? "Enter a whole number" : i.message]));
      continue;
    }
    if (seen.has(parsed.data.code)) errors[r.key] = { code: `Visit code ${parsed.data.code} is used twice` };
    seen.add(parsed.data.code);
    visits.push(parsed.data);
  }
  return Object.keys(errors).length ? { ok: false, errors } : { ok: true, visits };
}

export function VisitScheduleEditor({ rows, onChange, errors }: { rows: VisitRow[]; onChange: (rows: VisitRow[]) => void; errors: Record<string, Record<string, string>> }) {
  const set = (key: string, field: keyof VisitRow, value: string) => onChange(rows.map((r) => (r.key === key ? { ...r, [field]: value } : r)));
  const move = (i: number, d: -1 | 1) => {
    const next = rows.slice();
    const [r] = next.splice(i, 1);
    next.splice(i + d, 0, r!);
    onChange(next);
  };
  const cell = (r: VisitRow, field: keyof VisitRow, label: string, cls = "w-full") => (
    <td>
      <input
        className={`input ${cls} ${errors[r.key]?.[field] ? "border-brick" : ""}`}
        aria-label={`${label} of visit ${r.code || "(new)"}`}
        aria-invalid={Boolean(errors[r.key]?.[field])}
        value={r[field]}
        onChange={(e) => set(r.key, field, e.target.value)}
      />
      {errors[r.key]?.[field] && <span className="block text-xs text-brick">{errors[r.key]![field]}</span>}
    </td>
  );
  return (
    <div className="space-y-2">
      <div className="overflow-x-auto">
        <table className="table-dense" data-testid="visit-schedule-editor">
          <thead>
            <tr>
              <th>Code</th>
              <th>Visit</th>
              <th>Anchor</th>
              <th>Day</th>
              <th>Before</th>
              <th>After</th>
              <th>Procedures (separate with ;)</th>
              <th></th>
            </tr>
          </thead>
          <tbody>
            {rows.map((r, i) => (
              <tr key={r.key} data-visit={r.code}>
                {cell(r, "code", "Code", "w-20 font-mono")}
                {cell(r, "label", "Label", "w-44")}
                <td>
                  <select className="input" aria-label={`Anchor of visit ${r.code || "(new)"}`} value={r.anchor} onChange={(e) => set(r.key, "anchor", e.target.value)}>
                    {anchorEvents.map((a) => (
                      <option key={a} value={a}>
                        {a}
                      </option>
                    ))}
                  </select>
                </td>
                {cell(r, "dayOffset", "Day", "w-20 text-right")}
                {cell(r, "windowBefore", "Window before", "w-16 text-right")}
                {cell(r, "windowAfter", "Window after", "w-16 text-right")}
                {cell(r, "procedures", "Procedures", "w-72")}
                <td className="whitespace-nowrap">
                  <button type="button" className="btn-secondary px-2" aria-label={`Move ${r.code} up`} disabled={i === 0} onClick={() => move(i, -1)}>
                    ↑
                  </button>{" "}
                  <button type="button" className="btn-secondary px-2" aria-label={`Move ${r.code} down`} disabled={i === rows.length - 1} onClick={() => move(i, 1)}>
                    ↓
                  </button>{" "}
                  <button type="button" className="btn-secondary px-2" aria-label={`Remove visit ${r.code}`} onClick={() => onChange(rows.filter((x) => x.key !== r.key))}>
                    Remove
                  </button>
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <button
        type="button"
        className="btn-secondary"
        onClick={() => onChange([...rows, { key: newKey(), code: "", label: "", anchor: "implant", dayOffset: "0", windowBefore: "0", windowAfter: "0", procedures: "" }])}
      >
        Add a visit
      </button>
    </div>
  );
}
