"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { apiFetch } from "@/lib/api/client";

/** Site finance records the payment as the bank shows it: date, amount, bank reference. */
export function ConfirmReceipt({ siteId, transferId, currency, amount }: { siteId: string; transferId: string; currency: string; amount: string }) {
  const router = useRouter();
  const [open, setOpen] = useState(false);
  const [receivedOn, setReceivedOn] = useState(new Date().toISOString().slice(0, 10));
  const [value, setValue] = useState(amount);
  const [bankReference, setBankReference] = useState("");
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  if (!open)
    return (
      <button type="button" className="btn-secondary" onClick={() => setOpen(true)}>
        Confirm receipt
      </button>
    );
  const submit = async (e: React.FormEvent) => {
    e.preventDefault();
    setBusy(true);
    setError(null);
    try {
      await apiFetch(`/api/v1/sites/${siteId}/payment-confirmations`, { method: "POST", json: { transferId, receivedOn, amount: value, bankReference } });
      setOpen(false);
      router.refresh();
    } catch (err) {
      setError((err as Error).message);
    } finally {
      setBusy(false);
    }
  };
  return (
    <form onSubmit={submit} className="flex flex-wrap items-end gap-2" aria-label="Confirm receipt">
      <label className="field">
        <span>Received on</span>
        <input className="input" type="date" value={receivedOn} onChange={(e) => setReceivedOn(e.target.value)} required />
      </label>
      <label className="field">
        <span>Amount ({currency})</span>
        <input className="input" inputMode="decimal" value={value} onChange={(e) => setValue(e.target.value)} required />
      </label>
      <label className="field">
        <span>Bank reference</span>
        <input className="input" value={bankReference} onChange={(e) => setBankReference(e.target.value)} required />
      </label>
      <button type="submit" className="btn" disabled={busy}>
        Save confirmation
      </button>
      {error && (
        <p role="alert" className="text-sm text-brick">
          {error}
        </p>
      )}
    </form>
  );
}
