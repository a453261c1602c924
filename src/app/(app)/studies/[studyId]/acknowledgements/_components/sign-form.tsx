"use client";

import { useState } from "react";
import { useRouter } from "next/navigation";
import { PenLine } from "lucide-react";
import { apiFetch, ApiError } from "@/lib/api/client";

/** Re-enter the password and sign (the meaning is shown just above, on the page). */
export function SignForm({ studyId, siteId, versionId, meaning }: { studyId: string; siteId: string; versionId: string; meaning: string }) {
  const router = useRouter();
  const [password, setPassword] = useState("");
  const [agreed, setAgreed] = useState(false);
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);

  async function submit(e: React.FormEvent) {
    e.preventDefault();
    setBusy(true);
    setError(null);
    try {
      await apiFetch(`/api/v1/studies/${studyId}/acknowledgements`, { method: "POST", json: { siteId, versionId, password } });
      setPassword("");
      router.refresh();
    } catch (err) {
      const e = err as ApiError;
      setError(e.fields?.password?.[0] ?? e.message);
    } finally {
      setBusy(false);
    }
  }

  return (
    <form onSubmit={submit} className="space-y-3" data-testid="sign-form">
      <label className="flex items-start gap-2 text-sm">
        <input type="checkbox" checked={agreed} onChange={(e) => setAgreed(e.target.checked)} data-testid="sign-agree" className="mt-1" />
        <span>{meaning}</span>
      </label>
      <label className="field max-w-sm">
        <span>Your password (re-entered to sign)</span>
        <input className="input" type="password" autoComplete="current-password" value={password} onChange={(e) => setPassword(e.target.value)} required data-testid="sign-password" />
      </label>
      {error && (
        <p role="alert" className="text-sm text-brick" data-testid="sign-error">
          {error}
        </p>
      )}
      <button className="btn inline-flex items-center gap-1" type="submit" disabled={busy || !agreed || !password} data-testid="sign-submit">
        <PenLine aria-hidden size={14} /> {busy ? "Signing…" : "Sign"}
      </button>
    </form>
  );
}
