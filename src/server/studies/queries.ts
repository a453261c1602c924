import "server-only";
import { and, asc, count, eq, inArray } from "drizzle-orm";
import type { Tx } from "@/server/db/client";
import { sites, studies, type Site } from "@/server/db/schema";
import type { SiteStatus } from "@/lib/sites/site-status";
import { notFound } from "@/server/api/errors";

export async function getStudyById(tx: Tx, { studyId }: { studyId: string }) {
  const study = await tx.query.studies.findFirst({ where: eq(studies.id, studyId) });
  if (!study) throw notFound("That study");
  return study;
}

export async function listStudiesByIds(tx: Tx, { studyIds }: { studyIds: string[] }) {
  if (studyIds.length === 0) return [];
  return tx.select().from(studies).where(inArray(studies.id, studyIds)).orderBy(asc(studies.code));
}

export async function getSiteById(tx: Tx, { siteId }: { siteId: string }): Promise<Site> {
  const site = await tx.query.sites.findFirst({ where: eq(sites.id, siteId) });
  if (!site) throw notFound("That site");
  return site;
}

/** Sites of a study, limited to the ones the caller may see. */
export async function listSitesForStudy(tx: Tx, { studyId, siteIds }: { studyId: string; siteIds: "all" | string[] }) {
  if (siteIds !== "all" && siteIds.length === 0) return [];
  return tx
    .select()
    .from(sites)
    .where(and(eq(sites.studyId, studyId), siteIds === "all" ? undefined : inArray(sites.id, siteIds)))
    .orderBy(asc(sites.code));
}

/** Number of sites in each lifecycle status. */
export async function countSitesByStatus(tx: Tx, { studyId }: { studyId: string }): Promise<Map<SiteStatus, number>> {
  const rows = await tx.select({ status: sites.status, n: count() }).from(sites).where(eq(sites.studyId, studyId)).groupBy(sites.status);
  return new Map(rows.map((r) => [r.status, r.n]));
}
