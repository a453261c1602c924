import "server-only";
import { eq } from "drizzle-orm";
import type { Tx } from "@/server/db/client";
import { sites, type Site } from "@/server/db/schema";
import { notFound } from "@/server/api/errors";
import type { UpdateSiteInput } from "./site-schemas";

/** Edits a site's details (not its code or status); returns before and after for the audit trail. */
export async function updateSite(tx: Tx, { siteId, input }: { siteId: string; input: UpdateSiteInput }): Promise<{ before: Site; after: Site }> {
  const [before] = await tx.select().from(sites).where(eq(sites.id, siteId)).for("update");
  if (!before) throw notFound("That site");
  const [after] = await tx
    .update(sites)
    .set({ ...input, updatedAt: new Date() })
    .where(eq(sites.id, siteId))
    .returning();
  return { before, after: after! };
}
