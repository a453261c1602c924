"use client";

import { useState } from "react";
import { ErrorNote, useApiAction } from "../../subjects/_components/use-api-action";

type SiteValues = { code?: string; name: string; country: string; timeZone: string; currency: string; targetEnrolment: number; contacts: { name: string; role: string; email: string; phone?: string }[] };

/** Add a site (code and all) or edit one (code fixed). Contacts are one per line: name; role; e-mail; phone. */
export function SiteForm({ studyId, siteId, initial }: { studyId: string; siteId?: string; initial?: SiteValues }) {
  const { run, error, pending } = useApiAction();
  const [open, setOpen] = useState(!!siteId);
  const [done, setDone] = useState<string | null>(null);
  if (!open) {
    return (
      <button type="button" className="btn" onClick={() => setOpen(true)}>
        Add a site
      </button>
    );
  }
  const contactsText = (initial?.contacts ?? []).map((c) => [c.name, c.role, c.email, ...(c.phone ? [c.phone] : [])].join("; ")).join("\n");
  return (
    <form
      className="card grid max-w-3xl gap-3 sm:grid-cols-3"
      aria-label={siteId ? "Edit the site" : "Add a site"}
      onSubmit={async (e) => {
        e.preventDefault();
        const f = new FormData(e.currentTarget);
        const contacts = String(f.get("contacts") ?? "")
          .split("\n")
          .map((l) => l.trim())
          .filter(Boolean)
          .map((l) => {
            const [name = "", role = "", email = "", phone] = l.split(";").map((x) => x.trim());
            return { name, role, email, ...(phone ? { phone } : {}) };
          });
        const body = {
          ...(siteId ? {} : { code: String(f.get("code") ?? "") }),
          name: String(f.get("name") ?? ""),
          country: String(f.get("country") ?? ""),
          timeZone: String(f.get("timeZone") ?? ""),
          currency: String(f.get("currency") ?? ""),
          targetEnrolment: Number(f.get("targetEnrolment") ?? 0),
          contacts,
        };
        const res = await run(siteId ? `/api/v1/sites/${siteId}` : `/api/v1/studies/${studyId}/sites`, { method: siteId ? "PATCH" : "POST", json: body });
        if (res) setDone(siteId ? "Saved." : `Site ${body.code} added as Proposed.`);
      }}
    >
      {!siteId && (
        <label className="field">
          <span>Site code</span>
          <input className="input font-mono" name="code" required placeholder="FR01" />
        </label>
      )}
      <label className="field sm:col-span-2">
        <span>Name</span>
        <input className="input" name="name" required defaultValue={initial?.name} />
      </label>
      <label className="field">
        <span>Country (ISO 3166 code)</span>
        <input className="input" name="country" required maxLength={2} defaultValue={initial?.country} />
      </label>
      <label className="field">
        <span>Time zone</span>
        <input className="input" name="timeZone" required defaultValue={initial?.timeZone ?? "Europe/Berlin"} />
      </label>
      <label className="field">
        <span>Currency (ISO 4217)</span>
        <input className="input" name="currency" required maxLength={3} defaultValue={initial?.currency ?? "EUR"} />
      </label>
      <label className="field">
        <span>Target enrolment</span>
        <input className="input" name="targetEnrolment" type="number" min={0} defaultValue={initial?.targetEnrolment ?? 0} />
      </label>
      <label className="field sm:col-span-3">
        <span>Contacts, one per line: name; role; e-mail; phone</span>
        <textarea className="input" name="contacts" rows={3} defaultValue={contactsText} />
      </label>
      <div className="flex items-center gap-3 sm:col-span-3">
        <button className="btn" disabled={pending}>
          {siteId ? "Save" : "Add site"}
        </button>
        {done && <p role="status" className="text-sm">{done}</p>}
      </div>
      <div className="sm:col-span-3">
        <ErrorNote error={error} />
      </div>
    </form>
  );
}
