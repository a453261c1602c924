import "server-only";
import { asc, eq } from "drizzle-orm";
import type { Tx } from "@/server/db/client";
import { sites, siteStatusEvents, users } from "@/server/db/schema";
import { notFound } from "@/server/api/errors";

/** A site with its lifecycle history (date and who made each step). */
export async function getSiteDetail(tx: Tx, { siteId }: { siteId: string }) {
  const [site] = await tx.select().from(sites).where(eq(sites.id, siteId));
  if (!site) throw notFound("That site");
  const history = await tx
    .select({
      id: siteStatusEvents.id,
      fromStatus: siteStatusEvents.fromStatus,
      toStatus: siteStatusEvents.toStatus,
      effectiveOn: siteStatusEvents.effectiveOn,
      at: siteStatusEvents.at,
      actorName: users.name,
    })
    .from(siteStatusEvents)
    .leftJoin(users, eq(users.id, siteStatusEvents.actorId))
    .where(eq(siteStatusEvents.siteId, siteId))
    .orderBy(asc(siteStatusEvents.effectiveOn), asc(siteStatusEvents.at));
  return { site, history };
}

/** Only the site's study id: the scope resolver of every /sites/:siteId route. */
export async function siteScope(tx: Tx, { siteId }: { siteId: string }) {
  const [row] = await tx.select({ studyId: sites.studyId }).from(sites).where(eq(sites.id, siteId));
  if (!row) throw notFound("That site");
  return { studyId: row.studyId, siteId };
}

/** Scope of a study-level list narrowed to one site by ?siteId: that site must be in the study. */
export async function studySiteScope(tx: Tx, { studyId, siteId }: { studyId: string; siteId?: string }) {
  if (!siteId) return { studyId };
  const scope = await siteScope(tx, { siteId });
  if (scope.studyId !== studyId) throw notFound("That site");
  return scope;
}
