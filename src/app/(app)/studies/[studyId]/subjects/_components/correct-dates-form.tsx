"use client";

import { ErrorNote, useApiAction } from "./use-api-action";

type Dates = { consentDate: string; screeningDate: string | null; enrolmentDate: string | null; implantDate: string | null; deviceSerial: string | null };

/** Corrects dates already recorded (a data-entry error); windows and deviations follow. */
export function CorrectDatesForm({ subjectId, dates }: { subjectId: string; dates: Dates }) {
  const { run, error, pending } = useApiAction();
  return (
    <form
      className="grid max-w-3xl gap-3 sm:grid-cols-5"
      aria-label="Correct the subject's dates"
      onSubmit={async (e) => {
        e.preventDefault();
        const f = new FormData(e.currentTarget);
        const body: Record<string, string | null> = {};
        for (const k of ["consentDate", "screeningDate", "enrolmentDate", "implantDate", "deviceSerial"] as const) {
          if (!f.has(k)) continue;
          const v = String(f.get(k) ?? "").trim() || null;
          if (v !== dates[k]) body[k] = v;
        }
        if (Object.keys(body).length > 0) await run(`/api/v1/subjects/${subjectId}`, { method: "PATCH", json: body });
      }}
    >
      <label className="field">
        <span>Consent date</span>
        <input className="input" type="date" name="consentDate" required defaultValue={dates.consentDate} />
      </label>
      <label className="field">
        <span>Screening date</span>
        <input className="input" type="date" name="screeningDate" defaultValue={dates.screeningDate ?? ""} />
      </label>
      {dates.enrolmentDate && (
        <label className="field">
          <span>Enrolment date</span>
          <input className="input" type="date" name="enrolmentDate" required defaultValue={dates.enrolmentDate} />
        </label>
      )}
      {dates.implantDate && (
        <>
          <label className="field">
            <span>Implant date</span>
            <input className="input" type="date" name="implantDate" required defaultValue={dates.implantDate} />
          </label>
          <label className="field">
            <span>Device serial</span>
            <input className="input font-mono" name="deviceSerial" required defaultValue={dates.deviceSerial ?? ""} />
          </label>
        </>
      )}
      <div className="sm:col-span-5">
        <button className="btn-secondary" disabled={pending}>
          Save corrections
        </button>
      </div>
      <div className="sm:col-span-5">
        <ErrorNote error={error} />
      </div>
    </form>
  );
}
