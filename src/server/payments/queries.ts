import "server-only";
import { and, asc, desc, eq, inArray } from "drizzle-orm";
import type { Tx } from "@/server/db/client";
import { paymentQueries, paymentQueryMessages, paymentRunLines, paymentTransfers, sites, users } from "@/server/db/schema";
import { conflict, notFound, unprocessable } from "@/server/api/errors";
import { enqueueMail } from "@/server/mail/enqueue-mail";
import { siteFinanceEmails, sponsorFinanceEmails } from "./recipients";

// Queries on a payment or one of its lines: threaded messages, open → answered → resolved, each
// message mailed to the other side through the outbox.

export type QuerySide = "site" | "sponsor";

export async function scopeOfQuery(tx: Tx, queryId: string) {
  const [q] = await tx.select({ studyId: paymentQueries.studyId, siteId: paymentQueries.siteId }).from(paymentQueries).where(eq(paymentQueries.id, queryId)).limit(1);
  if (!q) throw notFound("That query");
  return q;
}

async function mailOtherSide(tx: Tx, { studyId, siteId, side, queryId, messageId, subject, body }: { studyId: string; siteId: string; side: QuerySide; queryId: string; messageId: string; subject: string; body: string }) {
  const [site] = await tx.select({ code: sites.code }).from(sites).where(eq(sites.id, siteId)).limit(1);
  const to = side === "site" ? await sponsorFinanceEmails(tx, { studyId }) : await siteFinanceEmails(tx, { studyId, siteId });
  for (const email of to) {
    await enqueueMail(tx, { dedupeKey: `payment-query:${messageId}:${email}`, to: email, subject: `Payment query (${site?.code ?? ""}): ${subject}`, text: `${body}\n\nQuery ${queryId}. Answer it in Cairn under Reconciliation.` });
  }
}

export async function raisePaymentQuery(
  tx: Tx,
  { studyId, siteId, transferId, lineKey, subject, message, actorId, side }: { studyId: string; siteId: string; transferId?: string | null; lineKey?: string | null; subject: string; message: string; actorId: string; side: QuerySide },
) {
  if (transferId) {
    const [t] = await tx.select({ id: paymentTransfers.id }).from(paymentTransfers).where(and(eq(paymentTransfers.id, transferId), eq(paymentTransfers.siteId, siteId))).limit(1);
    if (!t) throw unprocessable("No payment with that id was made to this site.", { transferId: ["Not a payment to this site"] });
  }
  if (lineKey) {
    const [l] = await tx.select({ id: paymentRunLines.id }).from(paymentRunLines).where(and(eq(paymentRunLines.lineKey, lineKey), eq(paymentRunLines.siteId, siteId))).limit(1);
    if (!l) throw unprocessable("That line was never in a payment run for this site.", { lineKey: ["Unknown line for this site"] });
  }
  const [q] = await tx.insert(paymentQueries).values({ studyId, siteId, transferId: transferId ?? null, lineKey: lineKey ?? null, subject, raisedBy: actorId }).returning();
  const [m] = await tx.insert(paymentQueryMessages).values({ queryId: q!.id, authorId: actorId, side, body: message }).returning();
  await mailOtherSide(tx, { studyId, siteId, side, queryId: q!.id, messageId: m!.id, subject, body: message });
  return q!;
}

/** A reply moves the query: the sponsor's answer makes it answered, the site's reply opens it again. */
export async function replyToPaymentQuery(tx: Tx, { queryId, message, resolve, actorId, side }: { queryId: string; message: string; resolve: boolean; actorId: string; side: QuerySide }) {
  const [q] = await tx.select().from(paymentQueries).where(eq(paymentQueries.id, queryId)).for("update").limit(1);
  if (!q) throw notFound("That query");
  if (q.state === "resolved") throw conflict("This query is resolved. Raise a new one if something is still wrong.");
  const [m] = await tx.insert(paymentQueryMessages).values({ queryId, authorId: actorId, side, body: message }).returning();
  const state = resolve ? "resolved" : side === "sponsor" ? "answered" : "open";
  const [after] = await tx.update(paymentQueries).set({ state, updatedAt: new Date() }).where(eq(paymentQueries.id, queryId)).returning();
  await mailOtherSide(tx, { studyId: q.studyId, siteId: q.siteId, side, queryId, messageId: m!.id, subject: q.subject, body: message });
  return { before: q, after: after! };
}

export async function listPaymentQueries(tx: Tx, { studyId, siteIds }: { studyId: string; siteIds: "all" | string[] }) {
  if (siteIds !== "all" && siteIds.length === 0) return [];
  const qs = await tx
    .select({ q: paymentQueries, siteCode: sites.code, currency: paymentTransfers.currency, transferAmountMinor: paymentTransfers.amountMinor })
    .from(paymentQueries)
    .innerJoin(sites, eq(sites.id, paymentQueries.siteId))
    .leftJoin(paymentTransfers, eq(paymentTransfers.id, paymentQueries.transferId))
    .where(and(eq(paymentQueries.studyId, studyId), siteIds === "all" ? undefined : inArray(paymentQueries.siteId, siteIds)))
    .orderBy(desc(paymentQueries.updatedAt));
  if (qs.length === 0) return [];
  const messages = await tx
    .select({ id: paymentQueryMessages.id, queryId: paymentQueryMessages.queryId, side: paymentQueryMessages.side, body: paymentQueryMessages.body, createdAt: paymentQueryMessages.createdAt, author: users.name })
    .from(paymentQueryMessages)
    .innerJoin(users, eq(users.id, paymentQueryMessages.authorId))
    .where(inArray(paymentQueryMessages.queryId, qs.map((x) => x.q.id)))
    .orderBy(asc(paymentQueryMessages.createdAt));
  return qs.map(({ q, siteCode, currency, transferAmountMinor }) => ({ ...q, siteCode, currency, transferAmountMinor, messages: messages.filter((m) => m.queryId === q.id) }));
}
