"use client";

import { useState } from "react";
import { Upload } from "lucide-react";
import { apiFetch, ApiError } from "@/lib/api/client";
import { allowedContentTypes } from "@/lib/documents/upload-rules";

type Stage = "idle" | "hashing" | "requesting" | "uploading" | "verifying" | "done" | "error";

async function sha256Hex(file: File): Promise<string> {
  const digest = await crypto.subtle.digest("SHA-256", await file.arrayBuffer());
  return [...new Uint8Array(digest)].map((b) => b.toString(16).padStart(2, "0")).join("");
}

/**
 * Upload one file: hash it in the browser, ask Cairn for a presigned URL (type and size are checked
 * there), PUT the bytes straight to storage with progress, then ask Cairn to verify the stored SHA-256.
 */
export function DocumentUpload({
  studyId,
  siteId,
  purpose,
  maxBytes,
  onUploaded,
  label = "Upload a file",
  binder,
  disabled = false,
  testId,
}: {
  studyId: string;
  siteId: string | null;
  purpose: string;
  maxBytes: number;
  onUploaded?: (doc: { id: string; fileName: string }) => void;
  label?: string;
  /** For an essential document of a site's binder: its type, person and dates. */
  binder?: { documentTypeId: string; personId: string | null; issuedOn: string | null; expiresOn: string | null };
  disabled?: boolean;
  testId?: string;
}) {
  const [stage, setStage] = useState<Stage>("idle");
  const [progress, setProgress] = useState(0);
  const [message, setMessage] = useState<string | null>(null);
  const accept = Object.entries(allowedContentTypes)
    .flatMap(([t, exts]) => [t, ...exts])
    .join(",");

  async function upload(file: File) {
    setMessage(null);
    setProgress(0);
    try {
      if (file.size > maxBytes) throw new ApiError(413, "payload_too_large", `Files may be at most ${Math.round(maxBytes / 1048576)} MB.`);
      setStage("hashing");
      const sha256 = await sha256Hex(file);
      setStage("requesting");
      const { document, uploadUrl } = await apiFetch<{ document: { id: string; fileName: string }; uploadUrl: string }>(
        `/api/v1/studies/${studyId}/documents`,
        { method: "POST", json: { fileName: file.name, contentType: file.type, sizeBytes: file.size, sha256, siteId, purpose, ...(binder ? { binder } : {}) } },
      );
      setStage("uploading");
      await new Promise<void>((resolve, reject) => {
        const xhr = new XMLHttpRequest();
        xhr.open("PUT", uploadUrl);
        xhr.setRequestHeader("content-type", file.type);
        xhr.upload.onprogress = (e) => e.lengthComputable && setProgress(Math.round((e.loaded / e.total) * 100));
        xhr.onload = () => (xhr.status < 300 ? resolve() : reject(new Error(`Storage refused the file (${xhr.status}).`)));
        xhr.onerror = () => reject(new Error("Storage could not be reached. Try again."));
        xhr.send(file);
      });
      setStage("verifying");
      await apiFetch(`/api/v1/documents/${document.id}/complete`, { method: "POST" });
      setStage("done");
      setMessage(`${file.name} stored and verified.`);
      onUploaded?.(document);
    } catch (err) {
      setStage("error");
      const e = err as ApiError;
      setMessage(e.fields ? Object.values(e.fields).flat().join(" ") || e.message : e.message);
    }
  }

  const busy = stage === "hashing" || stage === "requesting" || stage === "uploading" || stage === "verifying";
  return (
    <div className="space-y-2" data-testid={testId}>
      <label className={`btn-secondary ${disabled ? "cursor-not-allowed opacity-60" : "cursor-pointer"}`}>
        <Upload size={14} aria-hidden /> {label}
        <input
          type="file"
          className="sr-only"
          accept={accept}
          disabled={busy || disabled}
          onChange={(e) => {
            const f = e.target.files?.[0];
            if (f) void upload(f);
            e.target.value = "";
          }}
        />
      </label>
      {busy && (
        <div role="status" className="text-sm">
          {stage === "hashing" && "Computing the file's SHA-256…"}
          {stage === "requesting" && "Checking the file…"}
          {stage === "uploading" && (
            <>
              Uploading… {progress}%
              <progress className="ml-2 align-middle" max={100} value={progress} />
            </>
          )}
          {stage === "verifying" && "Verifying the stored copy…"}
        </div>
      )}
      {message && (
        <p role={stage === "error" ? "alert" : "status"} className={`text-sm ${stage === "error" ? "text-brick-dark" : "text-lichen-dark"}`}>
          {message}
        </p>
      )}
    </div>
  );
}
