"use client";

import { useState } from "react";
import { ApiError } from "@/lib/api/client";
import { useApiAction } from "./use-api-action";

/** CSV import into one site: all or nothing, with every problem listed by row. */
export function ImportSubjectsForm({ sites }: { sites: { id: string; code: string }[] }) {
  const { run, error, pending } = useApiAction();
  const [result, setResult] = useState<string | null>(null);
  const rowErrors = error instanceof ApiError && error.fields ? Object.entries(error.fields) : [];
  return (
    <form
      className="card max-w-3xl space-y-3"
      aria-label="Import subjects from a CSV file"
      onSubmit={async (e) => {
        e.preventDefault();
        setResult(null);
        const f = new FormData(e.currentTarget);
        const file = f.get("file");
        if (!(file instanceof File) || file.size === 0) return;
        const res = await run<{ imported: number; visits: number }>(`/api/v1/sites/${f.get("siteId")}/subjects/import`, { method: "POST", json: { csv: await file.text() } });
        if (res) setResult(`Imported ${res.imported} subjects and ${res.visits} visits.`);
      }}
    >
      <p className="text-sm">
        Columns: row_type, subject_code, site_code, status, consent_date, screening_date, enrolled_date, implant_date, device_serial, screen_fail_reason, withdrawn_reason, visit_code, visit_date, outcome. One
        row per subject (row_type <code>subject</code>) and one per recorded visit (<code>visit</code>). If any row has a problem, nothing is imported.
      </p>
      <div className="flex flex-wrap items-end gap-3">
        <label className="field">
          <span>Site</span>
          <select className="input" name="siteId">
            {sites.map((s) => (
              <option key={s.id} value={s.id}>
                {s.code}
              </option>
            ))}
          </select>
        </label>
        <label className="field">
          <span>CSV file</span>
          <input className="input" type="file" name="file" accept=".csv,text/csv" required />
        </label>
        <button className="btn-secondary" disabled={pending}>
          Import
        </button>
      </div>
      {result && <p role="status">{result}</p>}
      {error && (
        <div role="alert" className="space-y-1 text-sm" data-testid="import-report">
          <p className="text-brick-dark">{error.message}</p>
          {rowErrors.length > 0 && (
            <table className="table-dense">
              <thead>
                <tr>
                  <th>Row · column</th>
                  <th>Problem</th>
                </tr>
              </thead>
              <tbody>
                {rowErrors.map(([where, msgs]) => (
                  <tr key={where}>
                    <td className="font-mono">{where}</td>
                    <td>{msgs.join("; ")}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          )}
        </div>
      )}
    </form>
  );
}
