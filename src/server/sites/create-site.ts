import "server-only";
import type { Tx } from "@/server/db/client";
import { sites, siteStatusEvents, type Site } from "@/server/db/schema";
import type { Actor } from "@/lib/auth/authorize";
import type { CreateSiteInput } from "./site-schemas";
import { todayAtSite } from "./site-today";

/** A new site starts Proposed; the first lifecycle event records who proposed it and when. */
export async function createSite(tx: Tx, { studyId, input, actor, now = new Date() }: { studyId: string; input: CreateSiteInput; actor: Actor; now?: Date }): Promise<Site> {
  const [site] = await tx
    .insert(sites)
    .values({ studyId, ...input, status: "proposed" })
    .returning();
  await tx.insert(siteStatusEvents).values({ siteId: site!.id, fromStatus: null, toStatus: "proposed", effectiveOn: todayAtSite(site!.timeZone, now), actorId: actor.userId });
  return site!;
}
