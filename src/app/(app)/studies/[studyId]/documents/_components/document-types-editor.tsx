"use client";

import { useQuery, useQueryClient } from "@tanstack/react-query";
import { useState } from "react";
import { apiFetch, ApiError } from "@/lib/api/client";
import { roleLabels, siteRoles, type Role } from "@/lib/auth/roles";
import { siteStatusLabels, siteStatuses, type SiteStatus } from "@/lib/sites/site-status";

type DocType = {
  id: string;
  code: string;
  name: string;
  holder: "site" | "person";
  appliesToRoles: Role[];
  requiredFrom: SiteStatus | null;
  expires: boolean;
  validityMonths: number | null;
  reference: string;
  retiredAt: string | null;
};

const errorText = (e: unknown) => {
  const err = e as ApiError;
  return err.fields ? `${err.message} ${Object.values(err.fields).flat().join(" ")}` : err.message;
};

export function DocumentTypesEditor({ studyId, canConfigure }: { studyId: string; canConfigure: boolean }) {
  const qc = useQueryClient();
  const key = ["binder-types", studyId];
  const { data, isLoading } = useQuery({ queryKey: key, queryFn: () => apiFetch<{ types: DocType[] }>(`/api/v1/studies/${studyId}/binder/types`) });
  const [error, setError] = useState<string | null>(null);
  const refresh = () => {
    void qc.invalidateQueries({ queryKey: key });
    void qc.invalidateQueries({ queryKey: ["binder", studyId] });
  };

  async function patch(code: string, body: Record<string, unknown>) {
    setError(null);
    try {
      await apiFetch(`/api/v1/studies/${studyId}/binder/types/${code}`, { method: "PATCH", json: body });
      refresh();
    } catch (e) {
      setError(errorText(e));
    }
  }

  if (isLoading) return <p>Loading…</p>;
  return (
    <div className="space-y-4">
      <p className="governs">
        The study&apos;s checklist of essential documents. The defaults follow ICH E6(R3) Appendix C and ISO 14155:2020 Annex E; the approved protocol, the signed
        agreement and the ethics committee&apos;s and regulators&apos; rules govern what a site must hold.
      </p>
      {error && (
        <p role="alert" className="text-sm text-brick-dark">
          {error}
        </p>
      )}
      <table className="table-dense" data-testid="document-types">
        <thead>
          <tr>
            <th>Document</th>
            <th>Held per</th>
            <th>Required from</th>
            <th>Expires</th>
            <th className="text-right">Usual validity (months)</th>
            <th>Source</th>
            {canConfigure && <th>On the list</th>}
          </tr>
        </thead>
        <tbody>
          {(data?.types ?? []).map((t) => (
            <tr key={t.id} data-testid={`type-${t.code}`} className={t.retiredAt ? "text-muted" : ""}>
              <td>{t.name}</td>
              <td>{t.holder === "site" ? "Site" : `Person (${t.appliesToRoles.map((r) => roleLabels[r]).join(", ")})`}</td>
              <td>
                {canConfigure ? (
                  <select
                    className="input"
                    aria-label={`Required from, ${t.name}`}
                    value={t.requiredFrom ?? ""}
                    onChange={(e) => void patch(t.code, { requiredFrom: e.target.value || null })}
                  >
                    <option value="">Optional</option>
                    {siteStatuses.map((s) => (
                      <option key={s} value={s}>
                        {siteStatusLabels[s]}
                      </option>
                    ))}
                  </select>
                ) : t.requiredFrom ? (
                  siteStatusLabels[t.requiredFrom]
                ) : (
                  "Optional"
                )}
              </td>
              <td>
                {canConfigure ? (
                  <input
                    type="checkbox"
                    aria-label={`Expires, ${t.name}`}
                    checked={t.expires}
                    onChange={(e) => void patch(t.code, e.target.checked ? { expires: true } : { expires: false, validityMonths: null })}
                  />
                ) : t.expires ? (
                  "Yes"
                ) : (
                  "No"
                )}
              </td>
              <td className="amount">
                {canConfigure && t.expires ? (
                  <input
                    className="input w-20 text-right"
                    type="number"
                    min={1}
                    max={240}
                    aria-label={`Usual validity in months, ${t.name}`}
                    defaultValue={t.validityMonths ?? ""}
                    onBlur={(e) => {
                      const v = e.target.value ? Number(e.target.value) : null;
                      if (v !== t.validityMonths) void patch(t.code, { validityMonths: v });
                    }}
                  />
                ) : (
                  (t.validityMonths ?? "—")
                )}
              </td>
              <td className="text-xs">{t.reference}</td>
              {canConfigure && (
                <td>
                  <button type="button" className="btn-secondary" onClick={() => void patch(t.code, { retired: !t.retiredAt })}>
                    {t.retiredAt ? "Put back" : "Remove"}
                  </button>
                </td>
              )}
            </tr>
          ))}
        </tbody>
      </table>
      {canConfigure && <AddType studyId={studyId} onAdded={refresh} />}
    </div>
  );
}

function AddType({ studyId, onAdded }: { studyId: string; onAdded: () => void }) {
  const [name, setName] = useState("");
  const [code, setCode] = useState("");
  const [holder, setHolder] = useState<"site" | "person">("site");
  const [role, setRole] = useState<Role>("investigator");
  const [requiredFrom, setRequiredFrom] = useState<SiteStatus | "">("start_up");
  const [expires, setExpires] = useState(false);
  const [validity, setValidity] = useState("");
  const [reference, setReference] = useState("");
  const [error, setError] = useState<string | null>(null);
  async function add(e: React.FormEvent) {
    e.preventDefault();
    setError(null);
    try {
      await apiFetch(`/api/v1/studies/${studyId}/binder/types`, {
        method: "POST",
        json: {
          code,
          name,
          holder,
          appliesToRoles: holder === "person" ? [role] : [],
          requiredFrom: requiredFrom || null,
          expires,
          validityMonths: expires && validity ? Number(validity) : null,
          reference,
        },
      });
      setName("");
      setCode("");
      onAdded();
    } catch (err) {
      setError(errorText(err));
    }
  }
  return (
    <form className="card flex flex-wrap items-end gap-3" onSubmit={add}>
      <h2 className="w-full">Add a document type</h2>
      <label className="field">
        <span>Name</span>
        <input className="input" value={name} onChange={(e) => setName(e.target.value)} required />
      </label>
      <label className="field">
        <span>Short code (a–z, 0–9, _)</span>
        <input className="input w-40" value={code} onChange={(e) => setCode(e.target.value)} required pattern="[a-z][a-z0-9_]{1,48}" />
      </label>
      <label className="field">
        <span>Held per</span>
        <select className="input" value={holder} onChange={(e) => setHolder(e.target.value as "site" | "person")}>
          <option value="site">Site</option>
          <option value="person">Person</option>
        </select>
      </label>
      {holder === "person" && (
        <label className="field">
          <span>Whose</span>
          <select className="input" value={role} onChange={(e) => setRole(e.target.value as Role)}>
            {siteRoles.map((r) => (
              <option key={r} value={r}>
                {roleLabels[r]}
              </option>
            ))}
          </select>
        </label>
      )}
      <label className="field">
        <span>Required from</span>
        <select className="input" value={requiredFrom} onChange={(e) => setRequiredFrom(e.target.value as SiteStatus | "")}>
          <option value="">Optional</option>
          {siteStatuses.map((s) => (
            <option key={s} value={s}>
              {siteStatusLabels[s]}
            </option>
          ))}
        </select>
      </label>
      <label className="flex items-center gap-1">
        <input type="checkbox" checked={expires} onChange={(e) => setExpires(e.target.checked)} /> Expires
      </label>
      {expires && (
        <label className="field">
          <span>Usual validity (months)</span>
          <input className="input w-24" type="number" min={1} max={240} value={validity} onChange={(e) => setValidity(e.target.value)} />
        </label>
      )}
      <label className="field flex-1">
        <span>Source (standard and clause)</span>
        <input className="input" value={reference} onChange={(e) => setReference(e.target.value)} />
      </label>
      <button className="btn" type="submit">
        Add
      </button>
      {error && (
        <p role="alert" className="w-full text-sm text-brick-dark">
          {error}
        </p>
      )}
    </form>
  );
}
