import "server-only";
import { and, asc, eq, inArray, isNull, ne, sql } from "drizzle-orm";
import type { Tx } from "@/server/db/client";
import { paymentConfirmations, paymentQueries, paymentRuns, paymentTransfers, sites, users } from "@/server/db/schema";

// What the finance people's home pages show: work waiting for them.

const NO_SITE = "00000000-0000-4000-8000-000000000000";

/** Runs prepared and not yet approved, with who prepared them (the approver must be someone else). */
export async function listRunsAwaitingApproval(tx: Tx, { studyId }: { studyId: string }) {
  return tx
    .select({ id: paymentRuns.id, number: paymentRuns.number, preparedBy: paymentRuns.preparedBy, preparedByName: users.name, preparedAt: paymentRuns.preparedAt, lineCount: paymentRuns.lineCount })
    .from(paymentRuns)
    .innerJoin(users, eq(users.id, paymentRuns.preparedBy))
    .where(and(eq(paymentRuns.studyId, studyId), eq(paymentRuns.state, "prepared")))
    .orderBy(asc(paymentRuns.number));
}

/** Failed or reversed transfers whose lines are due again and not yet in another run. */
export async function listFailedTransfers(tx: Tx, { studyId }: { studyId: string }) {
  return tx
    .select({ id: paymentTransfers.id, runId: paymentTransfers.runId, runNumber: paymentRuns.number, siteCode: sites.code, currency: paymentTransfers.currency, amountMinor: paymentTransfers.amountMinor, state: paymentTransfers.state, failureMessage: paymentTransfers.failureMessage })
    .from(paymentTransfers)
    .innerJoin(sites, eq(sites.id, paymentTransfers.siteId))
    .innerJoin(paymentRuns, eq(paymentRuns.id, paymentTransfers.runId))
    .where(
      and(
        eq(paymentTransfers.studyId, studyId),
        inArray(paymentTransfers.state, ["failed", "reversed"]),
        sql`not exists (select 1 from payment_run_lines l1 join payment_run_lines l2 on l2.site_id = l1.site_id and l2.line_key = l1.line_key and l2.state in ('in_run', 'sent', 'paid') where l1.transfer_id = ${paymentTransfers.id})`,
      ),
    )
    .orderBy(asc(paymentTransfers.failedAt));
}

/** Paid payments the site has not confirmed yet. */
export async function listPaymentsToConfirm(tx: Tx, { studyId, siteIds }: { studyId: string; siteIds: "all" | string[] }) {
  return tx
    .select({ id: paymentTransfers.id, siteCode: sites.code, runNumber: paymentRuns.number, currency: paymentTransfers.currency, amountMinor: paymentTransfers.amountMinor, paidAt: paymentTransfers.paidAt })
    .from(paymentTransfers)
    .innerJoin(sites, eq(sites.id, paymentTransfers.siteId))
    .innerJoin(paymentRuns, eq(paymentRuns.id, paymentTransfers.runId))
    .leftJoin(paymentConfirmations, eq(paymentConfirmations.transferId, paymentTransfers.id))
    .where(
      and(
        eq(paymentTransfers.studyId, studyId),
        eq(paymentTransfers.state, "paid"),
        isNull(paymentConfirmations.id),
        siteIds === "all" ? undefined : inArray(paymentTransfers.siteId, siteIds.length ? siteIds : [NO_SITE]),
      ),
    )
    .orderBy(asc(paymentTransfers.paidAt));
}

/** Queries not resolved. */
export async function listOpenPaymentQueries(tx: Tx, { studyId, siteIds }: { studyId: string; siteIds: "all" | string[] }) {
  return tx
    .select({ id: paymentQueries.id, siteCode: sites.code, subject: paymentQueries.subject, state: paymentQueries.state, updatedAt: paymentQueries.updatedAt })
    .from(paymentQueries)
    .innerJoin(sites, eq(sites.id, paymentQueries.siteId))
    .where(and(eq(paymentQueries.studyId, studyId), ne(paymentQueries.state, "resolved"), siteIds === "all" ? undefined : inArray(paymentQueries.siteId, siteIds.length ? siteIds : [NO_SITE])))
    .orderBy(asc(paymentQueries.updatedAt));
}
