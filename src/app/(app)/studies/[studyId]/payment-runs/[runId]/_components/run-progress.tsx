"use client";

import { useQuery } from "@tanstack/react-query";
import { useRouter } from "next/navigation";
import { useEffect, useRef } from "react";
import { apiFetch } from "@/lib/api/client";
import { formatMinor } from "@/lib/money";
import { transferStateLabels } from "@/lib/payments/labels";
import { PaymentChip } from "../../_components/payment-chip";

type Transfer = { id: string; siteCode: string; currency: string; amountMinor: string; state: string; attempts: number; stripeTransferId: string | null; lastError: string | null; failureMessage: string | null };

const settled = (s: string) => s === "paid" || s === "failed" || s === "reversed";

/** Per-site send progress, polled while a transfer is still on its way. */
export function RunProgress({ runId, initial }: { runId: string; initial: Transfer[] }) {
  const router = useRouter();
  const q = useQuery({
    queryKey: ["payment-run", runId],
    queryFn: () => apiFetch<{ transfers: Transfer[] }>(`/api/v1/payment-runs/${runId}`).then((r) => r.transfers.map((t) => ({ ...t, amountMinor: String(t.amountMinor) }))),
    initialData: initial,
    refetchInterval: (query) => {
      const data = query.state.data ?? [];
      return data.length === 0 || data.some((t) => !settled(t.state)) ? 2_000 : false;
    },
  });
  const transfers = q.data ?? [];
  const signature = transfers.map((t) => t.state).join(",");
  const last = useRef(signature);
  useEffect(() => {
    if (last.current !== signature) {
      last.current = signature;
      router.refresh();
    }
  }, [signature, router]);
  if (transfers.length === 0) return null;
  const done = transfers.filter((t) => settled(t.state)).length;
  return (
    <section className="space-y-2" aria-labelledby="progress-heading">
      <h2 id="progress-heading">Transfers</h2>
      <p className="text-sm" data-testid="send-progress">
        {done} of {transfers.length} settled
      </p>
      <progress max={transfers.length} value={done} className="w-64 accent-lichen" aria-label="Transfers settled" />
      <table className="table-dense" data-testid="run-transfers">
        <thead>
          <tr>
            <th>Site</th>
            <th>State</th>
            <th className="text-right">Amount</th>
            <th>Stripe transfer</th>
            <th className="text-right">Attempts</th>
            <th>Remittance</th>
            <th>Note</th>
          </tr>
        </thead>
        <tbody>
          {transfers.map((t) => (
            <tr key={t.id} data-site={t.siteCode}>
              <td className="font-mono">{t.siteCode}</td>
              <td>
                <PaymentChip table={transferStateLabels} state={t.state} />
              </td>
              <td className="amount">{formatMinor(BigInt(t.amountMinor), t.currency)}</td>
              <td className="font-mono text-xs">{t.stripeTransferId ?? "—"}</td>
              <td className="amount">{t.attempts}</td>
              <td className="text-sm">
                {(t.state === "sent" || t.state === "paid") && (
                  <>
                    <a className="underline" href={`/api/v1/payments/${t.id}/remittance?format=pdf`}>
                      PDF
                    </a>{" "}
                    ·{" "}
                    <a className="underline" href={`/api/v1/payments/${t.id}/remittance?format=csv`}>
                      CSV
                    </a>
                  </>
                )}
              </td>
              <td className="text-xs text-muted">{t.failureMessage ?? (t.state === "queued" ? t.lastError : null) ?? ""}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </section>
  );
}
