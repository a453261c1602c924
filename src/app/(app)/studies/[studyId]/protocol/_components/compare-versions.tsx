"use client";

import { useQuery } from "@tanstack/react-query";
import { apiFetch } from "@/lib/api/client";
import type { Redline, VisitScheduleDiff } from "@/lib/protocol/redline";
import { RedlineView } from "./redline-view";

type Meta = { id: string; versionLabel: string; state: string; contentHash: string | null };
type Comparison = { from: Meta; to: Meta; redline: Redline; visits: VisitScheduleDiff };

/** Redline of two versions, fetched from the compare API through the client cache. */
export function CompareVersions({ studyId, from, to }: { studyId: string; from: string; to: string }) {
  const q = useQuery({
    queryKey: ["protocol-compare", studyId, from, to],
    queryFn: () => apiFetch<Comparison>(`/api/v1/studies/${studyId}/protocol/compare?from=${from}&to=${to}`),
  });
  if (q.isPending) return <p className="animate-pulse text-sm text-muted">Comparing…</p>;
  if (q.isError) return <p role="alert" className="text-sm text-brick">{q.error.message}</p>;
  const { from: a, to: b } = q.data;
  return (
    <div className="space-y-3">
      <h1>
        Version {a.versionLabel} → version {b.versionLabel}
      </h1>
      <RedlineView redline={q.data.redline} visits={q.data.visits} fromLabel={a.versionLabel} toLabel={b.versionLabel} />
    </div>
  );
}
