"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { apiFetch } from "@/lib/api/client";

/** Raise a query on a payment or one of its lines (the other side is told by e-mail). */
export function RaiseQuery({ siteId, transferId, lineKey, label = "Raise a query" }: { siteId: string; transferId?: string; lineKey?: string; label?: string }) {
  const router = useRouter();
  const [open, setOpen] = useState(false);
  const [subject, setSubject] = useState("");
  const [message, setMessage] = useState("");
  const [error, setError] = useState<string | null>(null);
  if (!open)
    return (
      <button type="button" className={lineKey ? "text-xs underline" : "btn-secondary"} onClick={() => setOpen(true)}>
        {label}
      </button>
    );
  const submit = async (e: React.FormEvent) => {
    e.preventDefault();
    setError(null);
    try {
      await apiFetch(`/api/v1/sites/${siteId}/payment-queries`, { method: "POST", json: { transferId: transferId ?? null, lineKey: lineKey ?? null, subject, message } });
      setOpen(false);
      router.refresh();
    } catch (err) {
      setError((err as Error).message);
    }
  };
  return (
    <form onSubmit={submit} className="space-y-1" aria-label="Raise a query">
      <input className="input w-full" placeholder="Subject" value={subject} onChange={(e) => setSubject(e.target.value)} aria-label="Subject" required />
      <textarea className="input w-full" rows={3} placeholder="Question" value={message} onChange={(e) => setMessage(e.target.value)} aria-label="Question" required />
      <button type="submit" className="btn">
        Send query
      </button>
      {error && (
        <p role="alert" className="text-sm text-brick">
          {error}
        </p>
      )}
    </form>
  );
}
