"use client";

import { useState } from "react";
import { useRouter } from "next/navigation";
import { apiFetch, ApiError } from "@/lib/api/client";

/** Sponsor administrator: the number of days investigators have to acknowledge a released version. */
export function DeadlineSetting({ studyId, days }: { studyId: string; days: number }) {
  const router = useRouter();
  const [value, setValue] = useState(String(days));
  const [message, setMessage] = useState<{ ok: boolean; text: string } | null>(null);
  async function save(e: React.FormEvent) {
    e.preventDefault();
    try {
      await apiFetch(`/api/v1/studies/${studyId}/acknowledgements/settings`, { method: "PATCH", json: { ackDeadlineDays: Number(value) } });
      setMessage({ ok: true, text: "Saved. Tasks already issued keep their due dates." });
      router.refresh();
    } catch (err) {
      const e = err as ApiError;
      setMessage({ ok: false, text: e.fields?.ackDeadlineDays?.[0] ?? e.message });
    }
  }
  return (
    <form onSubmit={save} className="flex flex-wrap items-end gap-2">
      <label className="field">
        <span>Days to acknowledge a released version</span>
        <input className="input w-24" type="number" min={1} max={365} value={value} onChange={(e) => setValue(e.target.value)} required />
      </label>
      <button className="btn-secondary" type="submit">
        Save
      </button>
      {message && (
        <p role="status" className={`text-sm ${message.ok ? "" : "text-brick"}`}>
          {message.text}
        </p>
      )}
    </form>
  );
}
