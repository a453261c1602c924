"use client";

import { ErrorNote, useApiAction } from "./use-api-action";

const categories = ["consent", "eligibility", "procedure not done", "device handling", "other"] as const;

/** A deviation other than a visit out of window (those are recorded automatically). */
export function ReportDeviationForm({ subjectId, visitCodes }: { subjectId: string; visitCodes: string[] }) {
  const { run, error, pending } = useApiAction();
  return (
    <form
      className="grid max-w-3xl gap-3 sm:grid-cols-3"
      aria-label="Report a deviation"
      onSubmit={async (e) => {
        e.preventDefault();
        const form = e.currentTarget;
        const f = new FormData(form);
        const visit = String(f.get("visitCode") ?? "");
        const res = await run(`/api/v1/subjects/${subjectId}/deviations`, {
          method: "POST",
          json: { category: f.get("category"), occurredOn: f.get("occurredOn"), description: f.get("description"), ...(visit ? { visitCode: visit } : {}) },
        });
        if (res) form.reset();
      }}
    >
      <label className="field">
        <span>Category</span>
        <select className="input" name="category">
          {categories.map((c) => (
            <option key={c} value={c}>
              {c}
            </option>
          ))}
        </select>
      </label>
      <label className="field">
        <span>Date</span>
        <input className="input" type="date" name="occurredOn" required />
      </label>
      <label className="field">
        <span>Visit (optional)</span>
        <select className="input" name="visitCode">
          <option value="">—</option>
          {visitCodes.map((c) => (
            <option key={c}>{c}</option>
          ))}
        </select>
      </label>
      <label className="field sm:col-span-3">
        <span>What happened</span>
        <textarea className="input" name="description" rows={2} required minLength={10} />
      </label>
      <div className="sm:col-span-3">
        <button className="btn-secondary" disabled={pending}>
          Report deviation
        </button>
      </div>
      <div className="sm:col-span-3">
        <ErrorNote error={error} />
      </div>
    </form>
  );
}
