"use client";

import { nextSiteStatus, siteStatusLabels, type SiteStatus } from "@/lib/sites/site-status";
import { ErrorNote, useApiAction } from "../../subjects/_components/use-api-action";

/** The next lifecycle step, dated (today at the site unless another date is given). */
export function SiteLifecycleStep({ siteId, status }: { siteId: string; status: SiteStatus }) {
  const { run, error, pending } = useApiAction();
  const next = nextSiteStatus[status];
  if (!next) return <p className="text-sm">The site is closed out: its lifecycle is complete.</p>;
  return (
    <form
      className="flex flex-wrap items-end gap-3"
      onSubmit={async (e) => {
        e.preventDefault();
        const on = String(new FormData(e.currentTarget).get("effectiveOn") ?? "");
        await run(`/api/v1/sites/${siteId}/status`, { method: "POST", json: { to: next, ...(on ? { effectiveOn: on } : {}) } });
      }}
    >
      <label className="field">
        <span>Date of the step (blank: today at the site)</span>
        <input className="input" type="date" name="effectiveOn" />
      </label>
      <button className="btn" disabled={pending}>
        Move to {siteStatusLabels[next]}
      </button>
      <ErrorNote error={error} />
    </form>
  );
}
