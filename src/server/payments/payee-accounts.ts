import "server-only";
import { and, asc, eq, inArray } from "drizzle-orm";
import type Stripe from "stripe";
import type { Tx } from "@/server/db/client";
import { payeeAccounts, sites, type PayeeAccountRow } from "@/server/db/schema";
import { AppError, notFound, unprocessable } from "@/server/api/errors";
import { stripeClient } from "@/server/stripe/client";
import { payeeStateOf } from "./payee-state";

export async function listPayeeAccounts(tx: Tx, { studyId, siteIds }: { studyId: string; siteIds: "all" | string[] }) {
  if (siteIds !== "all" && siteIds.length === 0) return [];
  return tx
    .select({ id: payeeAccounts.id, siteId: sites.id, siteCode: sites.code, siteName: sites.name, currency: sites.currency, stripeAccountId: payeeAccounts.stripeAccountId, state: payeeAccounts.state, stateReason: payeeAccounts.stateReason, updatedAt: payeeAccounts.updatedAt })
    .from(sites)
    .leftJoin(payeeAccounts, eq(payeeAccounts.siteId, sites.id))
    .where(and(eq(sites.studyId, studyId), siteIds === "all" ? undefined : inArray(sites.id, siteIds)))
    .orderBy(asc(sites.code));
}

/**
 * Create the site's connected account in Stripe, or read its verification state again when it
 * exists. The account is created under an idempotency key per site, so a repeat never makes two.
 */
export async function createOrRefreshPayeeAccount(
  tx: Tx,
  { studyId, siteId, actorId, stripe = stripeClient() }: { studyId: string; siteId: string; actorId: string; stripe?: Stripe },
): Promise<{ before: PayeeAccountRow | null; after: PayeeAccountRow }> {
  const [site] = await tx.select().from(sites).where(and(eq(sites.id, siteId), eq(sites.studyId, studyId))).limit(1);
  if (!site) throw notFound("That site");
  const [existing] = await tx.select().from(payeeAccounts).where(eq(payeeAccounts.siteId, siteId)).for("update").limit(1);
  let account: Stripe.Account;
  try {
    account = existing
      ? await stripe.accounts.retrieve(existing.stripeAccountId)
      : await stripe.accounts.create(
          { type: "custom", country: site.country, metadata: { cairn_site_id: site.id, cairn_study_id: studyId, cairn_site_code: site.code }, capabilities: { transfers: { requested: true } } },
          { idempotencyKey: `cairn-account-${site.id}` },
        );
  } catch (err) {
    const e = err as { type?: string; message?: string };
    // Stripe unreachable or failing: try again later; Stripe refusing the request: say why.
    if (e.type === "StripeConnectionError" || e.type === "StripeAPIError" || e.type === "StripeRateLimitError") throw new AppError("upstream_unavailable", `Stripe is not answering; try again shortly. (${e.message ?? ""})`);
    throw unprocessable(`Stripe refused: ${e.message ?? String(err)}`);
  }
  const { state, reason } = payeeStateOf(account);
  if (existing) {
    const [after] = await tx.update(payeeAccounts).set({ state, stateReason: reason, updatedAt: new Date() }).where(eq(payeeAccounts.id, existing.id)).returning();
    return { before: existing, after: after! };
  }
  const [after] = await tx.insert(payeeAccounts).values({ studyId, siteId, stripeAccountId: account.id, state, stateReason: reason, createdBy: actorId }).returning();
  return { before: null, after: after! };
}

/** Apply an account.updated event's state (returns the change, or null when nothing changed). */
export async function applyAccountUpdate(tx: Tx, account: Stripe.Account) {
  const [existing] = await tx.select().from(payeeAccounts).where(eq(payeeAccounts.stripeAccountId, account.id)).for("update").limit(1);
  if (!existing) return null;
  const { state, reason } = payeeStateOf(account);
  if (state === existing.state && reason === existing.stateReason) return null;
  const [after] = await tx.update(payeeAccounts).set({ state, stateReason: reason, updatedAt: new Date() }).where(eq(payeeAccounts.id, existing.id)).returning();
  return { before: existing, after: after! };
}
