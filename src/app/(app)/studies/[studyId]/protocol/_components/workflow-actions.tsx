"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { apiFetch, ApiError } from "@/lib/api/client";
import { ProblemList } from "@/components/problem-list";

type Action = "submit" | "reopen" | "return" | "approve" | "release";

const labels: Record<Action, string> = {
  submit: "Submit for review",
  reopen: "Reopen as draft",
  return: "Return with comments",
  approve: "Approve",
  release: "Release to sites",
};

/** The workflow steps the signed-in person may take on this version. */
export function WorkflowActions({ versionId, versionLabel, actions }: { versionId: string; versionLabel: string; actions: Action[] }) {
  const router = useRouter();
  const [comment, setComment] = useState("");
  const [busy, setBusy] = useState<Action | null>(null);
  const [error, setError] = useState<{ message: string; fields?: Record<string, string[]> } | null>(null);
  const needsComment = actions.includes("return");

  async function run(action: Action) {
    if (action === "release" && !window.confirm(`Release version ${versionLabel} to the sites? Its content is frozen and the version in force is superseded.`)) return;
    setBusy(action);
    setError(null);
    try {
      await apiFetch(`/api/v1/protocol-versions/${versionId}/${action}`, { method: "POST", json: comment.trim() ? { comment } : {} });
      setComment("");
      router.refresh();
    } catch (e) {
      setError(e instanceof ApiError ? { message: e.message, fields: e.fields } : { message: "The step failed; try again." });
    } finally {
      setBusy(null);
    }
  }

  return (
    <section className="card space-y-3" aria-labelledby="workflow">
      <h2 id="workflow">Review and release</h2>
      {needsComment && (
        <label className="field">
          <span>Comments for the writer (needed to return; optional with an approval)</span>
          <textarea className="input min-h-24" value={comment} onChange={(e) => setComment(e.target.value)} aria-label="Review comments" />
        </label>
      )}
      <div className="flex flex-wrap gap-2">
        {actions.map((a) => (
          <button key={a} type="button" className={a === "return" ? "btn-secondary" : "btn"} disabled={busy !== null} onClick={() => run(a)}>
            {busy === a ? "Working…" : labels[a]}
          </button>
        ))}
      </div>
      {error && <ProblemList problem={error} />}
    </section>
  );
}
