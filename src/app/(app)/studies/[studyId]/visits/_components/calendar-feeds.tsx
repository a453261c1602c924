"use client";

import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { useState } from "react";
import { apiFetch } from "@/lib/api/client";
import { ErrorNote } from "../../subjects/_components/use-api-action";

type Feed = { id: string; label: string; createdAt: string; lastUsedAt: string | null };

/** The caller's secret calendar addresses for a site: create (shown once), list, revoke. */
export function CalendarFeeds({ siteId, siteCode }: { siteId: string; siteCode: string }) {
  const qc = useQueryClient();
  const key = ["calendar-feeds", siteId];
  const feeds = useQuery({ queryKey: key, queryFn: () => apiFetch<{ feeds: Feed[] }>(`/api/v1/sites/${siteId}/calendar-feeds`) });
  const [url, setUrl] = useState<string | null>(null);
  const create = useMutation({
    mutationFn: (label: string) => apiFetch<{ url: string }>(`/api/v1/sites/${siteId}/calendar-feeds`, { method: "POST", json: { label } }),
    onSuccess: (r) => {
      setUrl(r.url);
      void qc.invalidateQueries({ queryKey: key });
    },
  });
  const revoke = useMutation({
    mutationFn: (id: string) => apiFetch(`/api/v1/calendar-feed-tokens/${id}`, { method: "DELETE" }),
    onSuccess: () => qc.invalidateQueries({ queryKey: key }),
  });
  return (
    <div className="space-y-3">
      <p className="text-sm">
        Subscribe to {siteCode}&apos;s overdue, due and upcoming visits from a calendar program. The address is a secret that works without signing in: keep it to yourself, and revoke it if it
        leaks. It stops working when your role at the site ends.
      </p>
      <form
        className="flex flex-wrap items-end gap-2"
        onSubmit={(e) => {
          e.preventDefault();
          create.mutate(String(new FormData(e.currentTarget).get("label") ?? ""));
        }}
      >
        <label className="field">
          <span>Label (for you)</span>
          <input className="input" name="label" maxLength={80} placeholder="Clinic calendar" />
        </label>
        <button className="btn-secondary" disabled={create.isPending}>
          Create a calendar address
        </button>
      </form>
      {url && (
        <div role="status" className="rounded border border-slate bg-slate-light p-2 text-sm">
          <p>Copy this address now; it is not shown again:</p>
          <code className="block break-all" data-testid="feed-url">
            {url}
          </code>
        </div>
      )}
      <ErrorNote error={(create.error ?? revoke.error ?? feeds.error) as Error | null} />
      {feeds.data && feeds.data.feeds.length > 0 && (
        <table className="table-dense">
          <thead>
            <tr>
              <th>Label</th>
              <th>Created (UTC)</th>
              <th>Last used (UTC)</th>
              <th />
            </tr>
          </thead>
          <tbody>
            {feeds.data.feeds.map((f) => (
              <tr key={f.id}>
                <td>{f.label || "—"}</td>
                <td className="font-mono text-xs">{f.createdAt.slice(0, 16).replace("T", " ")}</td>
                <td className="font-mono text-xs">{f.lastUsedAt ? f.lastUsedAt.slice(0, 16).replace("T", " ") : "never"}</td>
                <td>
                  <button type="button" className="btn-danger" onClick={() => confirm("Revoke this calendar address? Calendars using it stop updating.") && revoke.mutate(f.id)}>
                    Revoke
                  </button>
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </div>
  );
}
