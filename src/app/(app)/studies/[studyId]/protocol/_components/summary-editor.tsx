"use client";

import type { SummaryRow } from "@/lib/protocol/summary-of-changes";

/** The summary-of-changes table: section, before, after, and the rationale each change needs. */
export function SummaryEditor({ rows, onChange, onPrefill, missing }: { rows: SummaryRow[]; onChange: (rows: SummaryRow[]) => void; onPrefill: () => void; missing: Set<number> }) {
  const set = (i: number, field: keyof SummaryRow, value: string) => onChange(rows.map((r, j) => (j === i ? { ...r, [field]: value } : r)));
  return (
    <div className="space-y-2">
      <div className="flex flex-wrap gap-2">
        <button type="button" className="btn-secondary" onClick={onPrefill}>
          Prefill from the differences
        </button>
        <button type="button" className="btn-secondary" onClick={() => onChange([...rows, { section: "", before: "", after: "", rationale: "" }])}>
          Add a row
        </button>
      </div>
      {rows.length === 0 ? (
        <p className="text-sm">No rows yet. Prefill them from the computed differences, then give the rationale of each change.</p>
      ) : (
        <div className="overflow-x-auto">
          <table className="table-dense" data-testid="summary-editor">
            <thead>
              <tr>
                <th className="w-40">Section</th>
                <th>Before</th>
                <th>After</th>
                <th>Rationale (required)</th>
                <th></th>
              </tr>
            </thead>
            <tbody>
              {rows.map((r, i) => (
                <tr key={i}>
                  <td>
                    <input className="input w-full" aria-label={`Section of row ${i + 1}`} value={r.section} onChange={(e) => set(i, "section", e.target.value)} />
                  </td>
                  <td>
                    <textarea className="input min-h-16 w-full" aria-label={`Before, row ${i + 1}`} value={r.before} onChange={(e) => set(i, "before", e.target.value)} />
                  </td>
                  <td>
                    <textarea className="input min-h-16 w-full" aria-label={`After, row ${i + 1}`} value={r.after} onChange={(e) => set(i, "after", e.target.value)} />
                  </td>
                  <td>
                    <textarea
                      className={`input min-h-16 w-full ${missing.has(i) ? "border-brick" : ""}`}
                      aria-label={`Rationale, row ${i + 1}`}
                      aria-invalid={missing.has(i)}
                      value={r.rationale}
                      onChange={(e) => set(i, "rationale", e.target.value)}
                    />
                    {missing.has(i) && <span className="block text-xs text-brick">Give the rationale of this change</span>}
                  </td>
                  <td>
                    <button type="button" className="btn-secondary px-2" aria-label={`Remove row ${i + 1}`} onClick={() => onChange(rows.filter((_, j) => j !== i))}>
                      Remove
                    </button>
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </div>
  );
}
