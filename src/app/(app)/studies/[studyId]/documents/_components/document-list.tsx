"use client";

import { useQuery, useQueryClient } from "@tanstack/react-query";
import type { ColumnDef } from "@tanstack/react-table";
import { useState } from "react";
import { DataTable } from "@/components/data-table";
import { DocumentUpload } from "@/components/document-upload";
import { apiFetch } from "@/lib/api/client";

type Doc = { id: string; fileName: string; contentType: string; sizeBytes: number; sha256: string; siteId: string | null; purpose: string; createdAt: string };

async function download(id: string) {
  const { url } = await apiFetch<{ url: string }>(`/api/v1/documents/${id}/download`);
  window.location.assign(url);
}

const columns: ColumnDef<Doc, unknown>[] = [
  { accessorKey: "fileName", header: "File", cell: ({ row }) => <button type="button" className="text-slate underline" onClick={() => void download(row.original.id)}>{row.original.fileName}</button> },
  { accessorKey: "purpose", header: "Purpose" },
  { accessorKey: "sizeBytes", header: "Size (bytes)", meta: { align: "right" } },
  { accessorKey: "sha256", header: "SHA-256", cell: ({ getValue }) => <span className="font-mono text-xs">{String(getValue()).slice(0, 16)}…</span> },
  { accessorKey: "createdAt", header: "Uploaded (UTC)", cell: ({ getValue }) => String(getValue()).slice(0, 16).replace("T", " ") },
];

export function DocumentList({ studyId, uploadSites, canUploadStudyLevel, maxBytes }: { studyId: string; uploadSites: { id: string; code: string }[]; canUploadStudyLevel: boolean; maxBytes: number }) {
  const qc = useQueryClient();
  const [siteId, setSiteId] = useState<string>(uploadSites[0]?.id ?? "");
  const { data, isLoading } = useQuery({ queryKey: ["documents", studyId], queryFn: () => apiFetch<{ documents: Doc[] }>(`/api/v1/studies/${studyId}/documents`) });
  const canUpload = uploadSites.length > 0 || canUploadStudyLevel;
  return (
    <div className="space-y-4">
      {canUpload && (
        <div className="card flex flex-wrap items-end gap-4">
          <label className="field">
            <span>For</span>
            <select className="input" value={siteId} onChange={(e) => setSiteId(e.target.value)}>
              {canUploadStudyLevel && <option value="">The whole study</option>}
              {uploadSites.map((s) => (
                <option key={s.id} value={s.id}>
                  Site {s.code}
                </option>
              ))}
            </select>
          </label>
          <DocumentUpload studyId={studyId} siteId={siteId || null} purpose="general" maxBytes={maxBytes} onUploaded={() => qc.invalidateQueries({ queryKey: ["documents", studyId] })} />
        </div>
      )}
      {isLoading ? <p>Loading documents…</p> : <DataTable columns={columns} data={data?.documents ?? []} testId="documents-table" />}
    </div>
  );
}
