"use client";

import { useRouter } from "next/navigation";
import { ErrorNote, useApiAction } from "./use-api-action";

/** Screen a new subject: pseudonymous code (or the next number), consent and screening dates. No names, no birth dates. */
export function ScreenSubjectForm({ studyId, sites }: { studyId: string; sites: { id: string; code: string }[] }) {
  const { run, error, pending } = useApiAction();
  const router = useRouter();
  return (
    <form
      className="card grid max-w-3xl gap-3 sm:grid-cols-4"
      aria-label="Screen a subject"
      onSubmit={async (e) => {
        e.preventDefault();
        const f = new FormData(e.currentTarget);
        const code = String(f.get("subjectCode") ?? "").trim();
        const screening = String(f.get("screeningDate") ?? "");
        const res = await run<{ subject: { id: string } }>(`/api/v1/sites/${f.get("siteId")}/subjects`, {
          method: "POST",
          json: { ...(code ? { subjectCode: code } : {}), consentDate: String(f.get("consentDate") ?? ""), ...(screening ? { screeningDate: screening } : {}) },
        });
        if (res) router.push(`/studies/${studyId}/subjects/${res.subject.id}`);
      }}
    >
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
        <span>Subject code (blank: next number)</span>
        <input className="input font-mono" name="subjectCode" placeholder={`${sites[0]?.code ?? "DE01"}-007`} autoComplete="off" />
      </label>
      <label className="field">
        <span>Consent date</span>
        <input className="input" type="date" name="consentDate" required />
      </label>
      <label className="field">
        <span>Screening date</span>
        <input className="input" type="date" name="screeningDate" />
      </label>
      <p className="text-xs text-muted sm:col-span-4">
        Cairn holds pseudonymous codes only: never enter a name, initials or a birth date. The subject is consented on the protocol version in force at the site on the consent date.
      </p>
      <div className="sm:col-span-4">
        <button className="btn" disabled={pending}>
          Screen subject
        </button>
      </div>
      <div className="sm:col-span-4">
        <ErrorNote error={error} />
      </div>
    </form>
  );
}
