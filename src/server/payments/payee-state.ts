// Stripe account → Cairn's payee state: pending, verified, restricted (or rejected).
export type PayeeState = "pending" | "verified" | "restricted" | "rejected";

export function payeeStateOf(account: { capabilities?: { transfers?: string | null } | null; requirements?: { disabled_reason?: string | null } | null }): { state: PayeeState; reason: string | null } {
  const reason = account.requirements?.disabled_reason ?? null;
  if (account.capabilities?.transfers === "active") return { state: "verified", reason: null };
  if (reason?.startsWith("rejected")) return { state: "rejected", reason };
  if (reason && reason !== "requirements.pending_verification") return { state: "restricted", reason };
  return { state: "pending", reason };
}
