"use client";

import { useState } from "react";
import { apiFetch } from "@/lib/api/client";

/** Asks Cairn for a short-lived link (same authorisation as the page), then follows it. */
export function DownloadLink({ documentId, fileName }: { documentId: string; fileName: string }) {
  const [error, setError] = useState<string | null>(null);
  return (
    <>
      <button
        type="button"
        className="text-slate underline"
        onClick={async () => {
          setError(null);
          try {
            const { url } = await apiFetch<{ url: string }>(`/api/v1/documents/${documentId}/download`);
            window.location.assign(url);
          } catch (e) {
            setError((e as Error).message);
          }
        }}
      >
        {fileName}
      </button>
      {error && (
        <span role="alert" className="ml-1 text-xs text-brick-dark">
          {error}
        </span>
      )}
    </>
  );
}
