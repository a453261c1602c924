"use client";

import { useState } from "react";
import { subjectStatusLabels, type SubjectStatus } from "@/lib/subjects/subject-states";
import { ErrorNote, useApiAction } from "./use-api-action";

/** The subject's next step, dated; a reason for screen failure or withdrawal, the serial at implant. */
export function SubjectStatusForm({ subjectId, next }: { subjectId: string; next: SubjectStatus[] }) {
  const { run, error, pending } = useApiAction();
  const [to, setTo] = useState<SubjectStatus | "">(next[0] ?? "");
  if (next.length === 0) return null;
  const dateLabel = to === "enrolled" ? "Enrolment date" : to === "implanted" ? "Implant date" : "Date";
  return (
    <form
      className="flex flex-wrap items-end gap-3"
      aria-label="Change the subject's status"
      onSubmit={async (e) => {
        e.preventDefault();
        const f = new FormData(e.currentTarget);
        const on = String(f.get("effectiveOn") ?? "");
        const reason = String(f.get("reason") ?? "").trim();
        const serial = String(f.get("deviceSerial") ?? "").trim();
        await run(`/api/v1/subjects/${subjectId}/status`, {
          method: "POST",
          json: { to, ...(on ? { effectiveOn: on } : {}), ...(reason ? { reason } : {}), ...(serial ? { deviceSerial: serial } : {}) },
        });
      }}
    >
      <label className="field">
        <span>Move to</span>
        <select className="input" name="to" value={to} onChange={(e) => setTo(e.target.value as SubjectStatus)}>
          {next.map((s) => (
            <option key={s} value={s}>
              {subjectStatusLabels[s]}
            </option>
          ))}
        </select>
      </label>
      <label className="field">
        <span>{dateLabel}</span>
        <input className="input" type="date" name="effectiveOn" required />
      </label>
      {to === "implanted" && (
        <label className="field">
          <span>Device serial number</span>
          <input className="input font-mono" name="deviceSerial" required autoComplete="off" />
        </label>
      )}
      {(to === "screen_failed" || to === "withdrawn") && (
        <label className="field min-w-72">
          <span>Reason</span>
          <input className="input" name="reason" required maxLength={500} />
        </label>
      )}
      <button className="btn" disabled={pending}>
        Record
      </button>
      <div className="w-full">
        <ErrorNote error={error} />
      </div>
    </form>
  );
}
