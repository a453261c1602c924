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
  sites: { id: string; code: string; today: string }[];
  versions: { id: string; versionLabel: string }[];
  maxBytes: number;
}) {
  const router = useRouter();
  const [siteId, setSiteId] = useState(sites[0]?.id ?? "");
  const [versionId, setVersionId] = useState(versions[0]?.id ?? "");
  const [approvedOn, setApprovedOn] = useState("");
  const [letter, setLetter] = useState<{ id: string; fileName: string } | null>(null);
  const [busy, setBusy] = useState(false);
  const [message, setMessage] = useState<{ ok: boolean; text: string } | null>(null);
  const today = sites.find((s) => s.id === siteId)?.today;

  async function submit(e: React.FormEvent) {
    e.preventDefault();
    if (!letter) return;
    setBusy(true);
    setMessage(null);
    try {
      await apiFetch(`/api/v1/studies/${studyId}/adoption`, { method: "POST", json: { siteId, versionId, approvedOn, letterDocumentId: letter.id } });
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
          <select className="input" value={siteId} onChange={(e) => { setSiteId(e.target.value); setLetter(null); }}>
            {sites.map((s) => (
              <option key={s.id} value={s.id}>
                {s.code}
              </option>
            ))}
          </select>
        </label>
        <label className="field">
          <span>Protocol version</span>
          <select className="input" value={versionId} onChange={(e) => setVersionId(e.target.value)}>
            {versions.map((v) => (
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
      <button className="btn" type="submit" disabled={busy || !letter || !approvedOn}>
        {busy ? "Recording…" : "Record approval"}
      </button>
    </form>
  );
}
