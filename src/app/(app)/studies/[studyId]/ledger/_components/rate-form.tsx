"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { ApiError, apiFetch } from "@/lib/api/client";

/** Sponsor finance enters the rate of one currency into the reporting currency, with its date. */
export function RateForm({ studyId, currencies, reportingCurrency }: { studyId: string; currencies: string[]; reportingCurrency: string }) {
  const router = useRouter();
  const [v, setV] = useState({ currency: currencies[0] ?? "", rate: "", rateDate: "", source: "" });
  const [msg, setMsg] = useState<string | null>(null);
  async function submit(e: React.FormEvent) {
    e.preventDefault();
    try {
      await apiFetch(`/api/v1/studies/${studyId}/exchange-rates`, { method: "POST", json: v });
      setMsg("Rate saved.");
      router.refresh();
    } catch (err) {
      setMsg(err instanceof ApiError ? `${err.message}${err.fields ? ` ${Object.values(err.fields).flat().join(" ")}` : ""}` : "Could not save the rate.");
    }
  }
  const set = (k: keyof typeof v) => (e: React.ChangeEvent<HTMLInputElement | HTMLSelectElement>) => setV({ ...v, [k]: e.target.value });
  return (
    <form onSubmit={submit} className="flex flex-wrap items-end gap-2" aria-label="Enter an exchange rate">
      <label className="field">
        <span>Currency</span>
        <select className="input" value={v.currency} onChange={set("currency")}>
          {currencies.map((c) => (
            <option key={c}>{c}</option>
          ))}
        </select>
      </label>
      <label className="field">
        <span>{reportingCurrency} per unit</span>
        <input className="input amount" inputMode="decimal" value={v.rate} onChange={set("rate")} placeholder="0.0061" />
      </label>
      <label className="field">
        <span>Rate date</span>
        <input className="input" type="date" value={v.rateDate} onChange={set("rateDate")} />
      </label>
      <label className="field">
        <span>Source</span>
        <input className="input" value={v.source} onChange={set("source")} placeholder="e.g. bank fixing" />
      </label>
      <button className="btn" type="submit">
        Save rate
      </button>
      {msg ? <span role="status" className="text-sm">{msg}</span> : null}
    </form>
  );
}
