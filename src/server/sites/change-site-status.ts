import "server-only";
import { desc, eq } from "drizzle-orm";
import type { Tx } from "@/server/db/client";
import { sites, siteStatusEvents, type Site } from "@/server/db/schema";
import { conflict, notFound, unprocessable } from "@/server/api/errors";
import type { Actor } from "@/lib/auth/authorize";
import { nextSiteStatus, siteStatusLabels, type SiteStatus } from "@/lib/sites/site-status";
import { todayAtSite } from "./site-today";
import { assertSiteReadyToOpen } from "@/server/binder/readiness";

export type SiteStatusChange = { before: Site; after: Site; eventId: string; effectiveOn: string };

/**
 * One lifecycle step: Proposed → Start-up → Open → Enrolment closed → Closed out, forward only,
 * one step at a time, dated (site calendar date, not before the previous step nor in the future).
 * The caller audits the change.
 */
export async function changeSiteStatus(
  tx: Tx,
  { siteId, to, effectiveOn, actor, now = new Date() }: { siteId: string; to: SiteStatus; effectiveOn?: string; actor: Actor; now?: Date },
): Promise<SiteStatusChange> {
  const [site] = await tx.select().from(sites).where(eq(sites.id, siteId)).for("update");
  if (!site) throw notFound("That site");
  const expected = nextSiteStatus[site.status];
  if (site.status === to) throw conflict(`The site is already ${siteStatusLabels[to]}.`);
  if (expected !== to) {
    throw unprocessable(
      expected
        ? `A site that is ${siteStatusLabels[site.status]} can only move to ${siteStatusLabels[expected]}.`
        : `A site that is ${siteStatusLabels[site.status]} has no further step.`,
      { to: [`Next step: ${expected ? siteStatusLabels[expected] : "none"}`] },
    );
  }
  const today = todayAtSite(site.timeZone, now);
  const on = effectiveOn ?? today;
  if (on > today) throw unprocessable(`The date of the step cannot be after today at the site (${today}).`, { effectiveOn: ["Not in the future"] });
  const [last] = await tx.select().from(siteStatusEvents).where(eq(siteStatusEvents.siteId, siteId)).orderBy(desc(siteStatusEvents.effectiveOn), desc(siteStatusEvents.at)).limit(1);
  if (last && on < last.effectiveOn) {
    throw unprocessable(`The date of the step cannot be before the previous step (${last.effectiveOn}).`, { effectiveOn: [`On or after ${last.effectiveOn}`] });
  }
  if (to === "open") await assertSiteReadyToOpen(tx, { siteId, now });
  const [after] = await tx.update(sites).set({ status: to, updatedAt: now }).where(eq(sites.id, siteId)).returning();
  const [event] = await tx.insert(siteStatusEvents).values({ siteId, fromStatus: site.status, toStatus: to, effectiveOn: on, actorId: actor.userId }).returning({ id: siteStatusEvents.id });
  return { before: site, after: after!, eventId: event!.id, effectiveOn: on };
}
