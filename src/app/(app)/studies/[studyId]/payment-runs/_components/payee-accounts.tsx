"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { apiFetch } from "@/lib/api/client";
import { payeeStateLabels } from "@/lib/payments/labels";
import { PaymentChip } from "./payment-chip";

type Account = { siteId: string; siteCode: string; siteName: string; currency: string; stripeAccountId: string | null; state: string; stateReason: string | null };

/** Each site's connected account: created in Stripe from here; payments go only to verified ones. */
export function PayeeAccounts({ studyId, accounts, canManage }: { studyId: string; accounts: Account[]; canManage: boolean }) {
  const router = useRouter();
  const [busy, setBusy] = useState<string | null>(null);
  const [error, setError] = useState<string | null>(null);
  const act = async (siteId: string) => {
    setBusy(siteId);
    setError(null);
    try {
      await apiFetch(`/api/v1/studies/${studyId}/payee-accounts`, { method: "POST", json: { siteId } });
      router.refresh();
    } catch (e) {
      setError((e as Error).message);
    } finally {
      setBusy(null);
    }
  };
  return (
    <section className="space-y-2" aria-labelledby="payees-heading">
      <h2 id="payees-heading">Payee accounts</h2>
      <p className="text-sm text-muted">No payment goes to a site whose account is not verified.</p>
      {error && (
        <p role="alert" className="text-sm text-brick">
          {error}
        </p>
      )}
      <table className="table-dense" data-testid="payee-accounts">
        <thead>
          <tr>
            <th>Site</th>
            <th>Currency</th>
            <th>Account</th>
            <th>State</th>
            {canManage && <th />}
          </tr>
        </thead>
        <tbody>
          {accounts.map((a) => (
            <tr key={a.siteId}>
              <td>
                <span className="font-mono">{a.siteCode}</span> {a.siteName}
              </td>
              <td>{a.currency}</td>
              <td className="font-mono text-xs">{a.stripeAccountId ?? "—"}</td>
              <td>
                <PaymentChip table={payeeStateLabels} state={a.state} /> {a.stateReason && <span className="text-xs text-muted">{a.stateReason}</span>}
              </td>
              {canManage && (
                <td>
                  <button type="button" className="btn-secondary" disabled={busy === a.siteId} onClick={() => act(a.siteId)}>
                    {a.stripeAccountId ? "Check state" : "Create account"}
                  </button>
                </td>
              )}
            </tr>
          ))}
        </tbody>
      </table>
    </section>
  );
}
