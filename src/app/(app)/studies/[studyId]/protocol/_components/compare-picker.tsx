"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { studyPath } from "@/lib/nav";

/** Pick any two versions to compare. */
export function ComparePicker({ studyId, versions }: { studyId: string; versions: { id: string; label: string }[] }) {
  const router = useRouter();
  const [from, setFrom] = useState(versions[1]?.id ?? "");
  const [to, setTo] = useState(versions[0]?.id ?? "");
  return (
    <form
      className="card flex flex-wrap items-end gap-3"
      onSubmit={(e) => {
        e.preventDefault();
        router.push(`${studyPath(studyId, "protocol")}/compare?from=${from}&to=${to}`);
      }}
    >
      <h2 className="w-full">Compare two versions</h2>
      <label className="field">
        <span>Earlier</span>
        <select className="input" value={from} onChange={(e) => setFrom(e.target.value)} aria-label="Earlier version">
          {versions.map((v) => (
            <option key={v.id} value={v.id}>
              {v.label}
            </option>
          ))}
        </select>
      </label>
      <label className="field">
        <span>Later</span>
        <select className="input" value={to} onChange={(e) => setTo(e.target.value)} aria-label="Later version">
          {versions.map((v) => (
            <option key={v.id} value={v.id}>
              {v.label}
            </option>
          ))}
        </select>
      </label>
      <button type="submit" className="btn-secondary" disabled={!from || !to || from === to}>
        Show redline
      </button>
    </form>
  );
}
