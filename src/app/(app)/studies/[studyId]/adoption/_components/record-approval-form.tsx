"use client";

import { useState } from "react";
import { useRouter } from "next/navigation";
import { DocumentUpload } from "@/components/document-upload";
import { apiFetch, ApiError } from "@/lib/api/client";

/** Coordinator: the date the site's ethics committee approved a version, with its approval letter. */
export function RecordApprovalForm({
  studyId,
  sites,
  versions,
  maxBytes,
}: {
  studyId: string;
  /** `open`: versions not yet approved at the site. */
  sites: { id: string; code: string; today: string; open: string[] }[];
  versions: { id: string; versionLabel: string }[];
  maxBytes: number;
}) {
  const router = useRouter();
  const firstSite = sites.find((s) => s.open.length) ?? sites[0];
  const [siteId, setSiteId] = useState(firstSite?.id ?? "");
  const openVersions = (id: string) => versions.filter((v) => sites.find((s) => s.id === id)?.open.includes(v.id));
  const [versionId, setVersionId] = useState(openVersions(firstSite?.id ?? "")[0]?.id ?? "");
  const [approvedOn, setApprovedOn] = useState("");
  const [letter, setLetter] = useState<{ id: string; fileName: string } | null>(null);
  const [busy, setBusy] = useState(false);
  const [message, setMessage] = useState<{ ok: boolean; text: string } | null>(null);
  const today = sites.find((s) => s.id === siteId)?.today;
  // After a refresh the recorded version leaves the list: fall back to the first one still open.
  const options = openVersions(siteId);
  const selected = options.some((v) => v.id === versionId) ? versionId : (options[0]?.id ?? "");

  async function submit(e: React.FormEvent) {
    e.preventDefault();
    if (!letter) return;
    setBusy(true);
    setMessage(null);
    try {
      await apiFetch(`/api/v1/studies/${studyId}/adoption`, { method: "POST", json: { siteId, versionId: selected, approvedOn, letterDocumentId: letter.id } });
      setMessage({ ok: true, text: "Approval recorded." });
      setLetter(null);
      setApprovedOn("");
      router.refresh();
    } catch (err) {
      const e = err as ApiError;
      setMessage({ ok: false, text: e.message });
    } finally {
      setBusy(false);
    }
  }

  return (
    <form onSubmit={submit} className="space-y-3" data-testid="record-approval">
      <div className="flex flex-wrap gap-3">
        <label className="field">
          <span>Site</span>
          <select className="input" value={siteId} onChange={(e) => {
              setSiteId(e.target.value);
              setVersionId(openVersions(e.target.value)[0]?.id ?? "");
              setLetter(null);
            }}>
            {sites.map((s) => (
              <option key={s.id} value={s.id}>
                {s.code}
              </option>
            ))}
          </select>
        </label>
        <label className="field">
          <span>Protocol version</span>
          <select className="input" value={selected} onChange={(e) => setVersionId(e.target.value)}>
            {options.map((v) => (
              <option key={v.id} value={v.id}>
                {v.versionLabel}
              </option>
            ))}
          </select>
        </label>
        <label className="field">
          <span>Ethics approval date (site date)</span>
          <input className="input" type="date" value={approvedOn} max={today} onChange={(e) => setApprovedOn(e.target.value)} required />
        </label>
      </div>
      <div className="text-sm">
        {letter ? (
          <p>
            Approval letter: <strong>{letter.fileName}</strong>{" "}
            <button type="button" className="btn-secondary" onClick={() => setLetter(null)}>
              Replace
            </button>
          </p>
        ) : (
          <DocumentUpload key={siteId} studyId={studyId} siteId={siteId} purpose="ethics_approval" maxBytes={maxBytes} label="Upload the approval letter" onUploaded={setLetter} />
        )}
      </div>
      {message && (
        <p role="status" className={`text-sm ${message.ok ? "" : "text-brick"}`}>
          {message.text}
        </p>
      )}
      <button className="btn" type="submit" disabled={busy || !letter || !approvedOn || !selected}>
        {busy ? "Recording…" : "Record approval"}
      </button>
    </form>
  );
}
