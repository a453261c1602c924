import "server-only";
import { eq } from "drizzle-orm";
import type { Tx } from "@/server/db/client";
import { sites } from "@/server/db/schema";
import { notFound } from "@/server/api/errors";

/** The scope of a site-level payments route: the site's study and the site, or 404. */
export async function scopeOfPayeeSite(tx: Tx, siteId: string): Promise<{ studyId: string; siteId: string }> {
  const [row] = await tx.select({ studyId: sites.studyId }).from(sites).where(eq(sites.id, siteId)).limit(1);
  if (!row) throw notFound("That site");
  return { studyId: row.studyId, siteId };
}
