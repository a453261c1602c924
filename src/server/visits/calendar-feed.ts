import "server-only";
import { createHash, randomBytes } from "node:crypto";
import { and, desc, eq, isNull } from "drizzle-orm";
import { db, type Tx } from "@/server/db/client";
import { calendarFeedTokens, type CalendarFeedToken } from "@/server/db/schema";
import { conflict, notFound } from "@/server/api/errors";
import { loadActor } from "@/server/auth/load-actor";
import { getSiteById } from "@/server/studies/queries";
import { can } from "@/lib/auth/authorize";
import { buildSiteVisitFeed } from "@/lib/visits/ical";
import { loadCalendars } from "./load-calendars";

// A per-user secret address for a site's visit feed. Calendar programs cannot sign in, so the
// address itself is the credential: 256 random bits, stored only as a SHA-256, revocable, and
// checked against the owner's current role at the site on every fetch.

export const feedTokenPattern = /^[A-Za-z0-9_-]{43}$/;
const hashToken = (token: string) => createHash("sha256").update(token).digest("hex");

export function feedPath(token: string) {
  return `/api/v1/calendar-feeds/${token}`;
}

export async function createFeedToken(tx: Tx, { userId, studyId, siteId, label }: { userId: string; studyId: string; siteId: string; label: string }) {
  const token = randomBytes(32).toString("base64url");
  const [row] = await tx.insert(calendarFeedTokens).values({ userId, studyId, siteId, label, tokenHash: hashToken(token) }).returning();
  return { row: row!, token, path: feedPath(token) };
}

/** The caller's own active feed addresses at a site (the secret itself is shown once only). */
export async function listFeedTokens(tx: Tx, { userId, siteId }: { userId: string; siteId: string }) {
  return tx
    .select({ id: calendarFeedTokens.id, label: calendarFeedTokens.label, createdAt: calendarFeedTokens.createdAt, lastUsedAt: calendarFeedTokens.lastUsedAt })
    .from(calendarFeedTokens)
    .where(and(eq(calendarFeedTokens.userId, userId), eq(calendarFeedTokens.siteId, siteId), isNull(calendarFeedTokens.revokedAt)))
    .orderBy(desc(calendarFeedTokens.createdAt));
}

export async function feedTokenScope(tx: Tx, { tokenId }: { tokenId: string }) {
  const [row] = await tx.select({ studyId: calendarFeedTokens.studyId, siteId: calendarFeedTokens.siteId }).from(calendarFeedTokens).where(eq(calendarFeedTokens.id, tokenId));
  if (!row) throw notFound("That calendar address");
  return row;
}

/** Revokes one of the caller's own feed addresses; someone else's answers 404. */
export async function revokeFeedToken(tx: Tx, { tokenId, userId, now = new Date() }: { tokenId: string; userId: string; now?: Date }): Promise<{ before: CalendarFeedToken; after: CalendarFeedToken }> {
  const [before] = await tx.select().from(calendarFeedTokens).where(eq(calendarFeedTokens.id, tokenId)).for("update");
  if (!before || before.userId !== userId) throw notFound("That calendar address");
  if (before.revokedAt) throw conflict("This calendar address is already revoked.");
  const [after] = await tx.update(calendarFeedTokens).set({ revokedAt: now }).where(eq(calendarFeedTokens.id, tokenId)).returning();
  return { before, after: after! };
}

/**
 * The iCalendar feed behind a secret address, or null when the address is unknown, revoked, or its
 * owner no longer holds calendar access at the site (all look the same to the caller: 404).
 */
export async function siteFeedForToken(token: string, { now = new Date(), uidDomain }: { now?: Date; uidDomain: string }): Promise<string | null> {
  const [row] = await db.select().from(calendarFeedTokens).where(and(eq(calendarFeedTokens.tokenHash, hashToken(token)), isNull(calendarFeedTokens.revokedAt)));
  if (!row) return null;
  const actor = await loadActor(row.userId);
  if (!actor || !can(actor, "calendar.read", { studyId: row.studyId, siteId: row.siteId })) return null;
  const site = await getSiteById(db, { siteId: row.siteId });
  const loaded = await loadCalendars(db, { siteIds: [row.siteId], now });
  await db.update(calendarFeedTokens).set({ lastUsedAt: now }).where(eq(calendarFeedTokens.id, row.id));
  return buildSiteVisitFeed({ siteCode: site.code, calendars: loaded.map((l) => l.calendar), uidDomain, generatedAt: now, states: ["overdue", "due", "upcoming"] });
}
