"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { apiFetch } from "@/lib/api/client";

/** Approve (a second person, bound to the hash shown) and send (queued for the worker). */
export function RunActions({ runId, state, contentHash, canApprove, isPreparer, canSend }: { runId: string; state: string; contentHash: string; canApprove: boolean; isPreparer: boolean; canSend: boolean }) {
  const router = useRouter();
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const call = async (path: string, json?: unknown) => {
    setBusy(true);
    setError(null);
    try {
      await apiFetch(`/api/v1/payment-runs/${runId}/${path}`, { method: "POST", json: json ?? {} });
      router.refresh();
    } catch (e) {
      setError((e as Error).message);
    } finally {
      setBusy(false);
    }
  };
  if (state !== "prepared" && state !== "approved") return null;
  return (
    <div className="card space-y-2">
      {state === "prepared" && canApprove && (
        <button type="button" className="btn" disabled={busy} onClick={() => call("approve", { contentHash })}>
          Approve run
        </button>
      )}
      {state === "prepared" && isPreparer && <p className="text-sm">You prepared this run. A different sponsor finance person must approve it.</p>}
      {state === "prepared" && canSend && (
        <button type="button" className="btn-secondary" disabled={busy} onClick={() => call("cancel")}>
          Cancel run (its lines become due again)
        </button>
      )}
      {state === "approved" && canSend && (
        <button type="button" className="btn" disabled={busy} onClick={() => call("send")}>
          Send payments
        </button>
      )}
      {error && (
        <p role="alert" className="text-sm text-brick">
          {error}
        </p>
      )}
    </div>
  );
}
