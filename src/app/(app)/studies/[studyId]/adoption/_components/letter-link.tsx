"use client";

import { apiFetch } from "@/lib/api/client";

/** Opens a short-lived download link for the stored approval letter. */
export function LetterLink({ documentId, fileName }: { documentId: string; fileName: string }) {
  async function open() {
    const { url } = await apiFetch<{ url: string }>(`/api/v1/documents/${documentId}/download`);
    window.open(url, "_blank", "noopener");
  }
  return (
    <button type="button" className="text-xs underline" onClick={open} title={fileName}>
      letter
    </button>
  );
}
