"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { apiFetch, ApiError } from "@/lib/api/client";
import { studyPath } from "@/lib/nav";

/** Start the next version as a copy of the version in force. */
export function NewVersionButton({ studyId, hasReleased }: { studyId: string; hasReleased: boolean }) {
  const router = useRouter();
  const [substantial, setSubstantial] = useState(true);
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  async function start() {
    setBusy(true);
    setError(null);
    try {
      const res = await apiFetch<{ version: { id: string } }>(`/api/v1/studies/${studyId}/protocol/versions`, { method: "POST", json: { substantial } });
      router.push(`${studyPath(studyId, "protocol")}/${res.version.id}/edit`);
    } catch (e) {
      setError(e instanceof ApiError ? e.message : "Could not start a new version.");
      setBusy(false);
    }
  }
  return (
    <div className="flex flex-wrap items-center gap-3">
      {hasReleased && (
        <label className="flex items-center gap-1 text-sm">
          <input type="checkbox" checked={substantial} onChange={(e) => setSubstantial(e.target.checked)} /> Substantial amendment
        </label>
      )}
      <button type="button" className="btn" onClick={start} disabled={busy}>
        {hasReleased ? "Start an amendment" : "Start version 1.0"}
      </button>
      {error && (
        <p role="alert" className="text-sm text-brick">
          {error}
        </p>
      )}
    </div>
  );
}
