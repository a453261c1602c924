"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { apiFetch, ApiError } from "@/lib/api/client";

// A mutation from a form: calls the API, then refreshes the server-rendered page.
export function useApiAction() {
  const router = useRouter();
  const [error, setError] = useState<ApiError | Error | null>(null);
  const [pending, setPending] = useState(false);
  async function run<T>(url: string, init: RequestInit & { json?: unknown }): Promise<T | null> {
    setPending(true);
    setError(null);
    try {
      const result = await apiFetch<T>(url, init);
      router.refresh();
      return result;
    } catch (e) {
      setError(e as Error);
      return null;
    } finally {
      setPending(false);
    }
  }
  return { run, error, pending, clear: () => setError(null) };
}

/** The API's message and its field errors, announced to screen readers. */
export function ErrorNote({ error }: { error: Error | null }) {
  if (!error) return null;
  const fields = error instanceof ApiError ? error.fields : undefined;
  return (
    <div role="alert" className="rounded border border-brick bg-brick-light p-2 text-sm text-brick-dark" data-testid="form-error">
      <p>{error.message}</p>
      {fields && Object.keys(fields).length > 0 && (
        <ul className="mt-1 list-disc pl-5">
          {Object.entries(fields).map(([k, msgs]) => (
            <li key={k}>
              <span className="font-mono">{k}</span>: {msgs.join("; ")}
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
