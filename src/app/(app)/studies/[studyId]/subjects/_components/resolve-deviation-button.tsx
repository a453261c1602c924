"use client";

import { useState } from "react";
import { ErrorNote, useApiAction } from "./use-api-action";

/** Closes a reported deviation with what was done about it. */
export function ResolveDeviationForm({ deviationId }: { deviationId: string }) {
  const { run, error, pending } = useApiAction();
  const [open, setOpen] = useState(false);
  if (!open) {
    return (
      <button type="button" className="btn-secondary" onClick={() => setOpen(true)}>
        Resolve
      </button>
    );
  }
  return (
    <form
      className="flex flex-wrap items-end gap-2"
      aria-label="Resolve the deviation"
      onSubmit={async (e) => {
        e.preventDefault();
        await run(`/api/v1/deviations/${deviationId}`, { method: "PATCH", json: { resolution: new FormData(e.currentTarget).get("resolution") } });
      }}
    >
      <label className="field">
        <span>How it was resolved</span>
        <input className="input" name="resolution" required minLength={5} maxLength={2000} />
      </label>
      <button className="btn-secondary" disabled={pending}>
        Save
      </button>
      <ErrorNote error={error} />
    </form>
  );
}
