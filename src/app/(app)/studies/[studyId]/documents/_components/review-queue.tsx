"use client";

import { useQuery, useQueryClient } from "@tanstack/react-query";
import Link from "next/link";
import { useState } from "react";
import { apiFetch } from "@/lib/api/client";
import { studyPath } from "@/lib/nav";
import { DownloadLink } from "./download-link";

type Pending = { id: string; fileName: string; createdAt: string; issuedOn: string | null; expiresOn: string | null; siteCode: string; typeName: string; uploaderName: string };

export function ReviewQueue({ studyId }: { studyId: string }) {
  const qc = useQueryClient();
  const key = ["binder-review", studyId];
  const { data, isLoading } = useQuery({ queryKey: key, queryFn: () => apiFetch<{ documents: Pending[] }>(`/api/v1/studies/${studyId}/binder/review`) });
  if (isLoading) return <p>Loading…</p>;
  const rows = data?.documents ?? [];
  if (rows.length === 0) return <p>No upload is waiting for a decision.</p>;
  return (
    <table className="table-dense" data-testid="review-queue">
      <thead>
        <tr>
          <th>Site</th>
          <th>Document</th>
          <th>File</th>
          <th>Issued</th>
          <th>Valid through</th>
          <th>Uploaded</th>
          <th>Decision</th>
        </tr>
      </thead>
      <tbody>
        {rows.map((d) => (
          <ReviewRow key={d.id} d={d} studyId={studyId} onDone={() => qc.invalidateQueries({ queryKey: key })} />
        ))}
      </tbody>
    </table>
  );
}

function ReviewRow({ d, studyId, onDone }: { d: Pending; studyId: string; onDone: () => void }) {
  const [reason, setReason] = useState("");
  const [error, setError] = useState<string | null>(null);
  async function decide(decision: "accepted" | "rejected") {
    setError(null);
    try {
      await apiFetch(`/api/v1/documents/${d.id}/review`, { method: "POST", json: { decision, reason } });
      onDone();
    } catch (e) {
      setError((e as Error).message);
    }
  }
  return (
    <tr data-testid={`review-${d.id}`}>
      <td>
        <Link className="font-mono text-slate underline" href={`${studyPath(studyId, "documents")}?site=${d.siteCode}`}>
          {d.siteCode}
        </Link>
      </td>
      <td>{d.typeName}</td>
      <td>
        <DownloadLink documentId={d.id} fileName={d.fileName} />
      </td>
      <td>{d.issuedOn ?? "—"}</td>
      <td>{d.expiresOn ?? "—"}</td>
      <td>
        {d.uploaderName} · {String(d.createdAt).slice(0, 16).replace("T", " ")} UTC
      </td>
      <td className="space-y-1">
        <div className="flex flex-wrap items-center gap-1">
          <button type="button" className="btn" onClick={() => void decide("accepted")}>
            Accept
          </button>
          <input className="input w-48" placeholder="Reason to reject" aria-label="Reason to reject" value={reason} onChange={(e) => setReason(e.target.value)} />
          <button type="button" className="btn-danger" onClick={() => void decide("rejected")}>
            Reject
          </button>
        </div>
        {error && (
          <p role="alert" className="text-xs text-brick-dark">
            {error}
          </p>
        )}
      </td>
    </tr>
  );
}
