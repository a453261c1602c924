"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { apiFetch } from "@/lib/api/client";

type Message = { id: string; side: string; author: string; body: string; at: string };

/** A query's messages, oldest first, with a reply box (and resolve). */
export function QueryThread({ queryId, state, canReply, messages }: { queryId: string; state: string; canReply: boolean; messages: Message[] }) {
  const router = useRouter();
  const [text, setText] = useState("");
  const [error, setError] = useState<string | null>(null);
  const send = async (resolve: boolean) => {
    setError(null);
    try {
      await apiFetch(`/api/v1/payment-queries/${queryId}/messages`, { method: "POST", json: { message: text || (resolve ? "Resolved." : ""), resolve } });
      setText("");
      router.refresh();
    } catch (err) {
      setError((err as Error).message);
    }
  };
  return (
    <div className="space-y-2">
      <ol className="space-y-1 text-sm">
        {messages.map((m) => (
          <li key={m.id}>
            <span className="font-semibold">{m.author}</span> <span className="text-xs text-muted">({m.side === "site" ? "site" : "sponsor"}, {m.at} UTC)</span>: {m.body}
          </li>
        ))}
      </ol>
      {canReply && state !== "resolved" && (
        <div className="space-y-1">
          <textarea className="input w-full" rows={2} value={text} onChange={(e) => setText(e.target.value)} aria-label="Reply" />
          <div className="flex gap-2">
            <button type="button" className="btn-secondary" disabled={!text} onClick={() => send(false)}>
              Reply
            </button>
            <button type="button" className="btn-secondary" onClick={() => send(true)}>
              Mark resolved
            </button>
          </div>
        </div>
      )}
      {error && (
        <p role="alert" className="text-sm text-brick">
          {error}
        </p>
      )}
    </div>
  );
}
