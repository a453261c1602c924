import "server-only";
import { eq } from "drizzle-orm";
import type { Tx } from "@/server/db/client";
import { sites, subjects } from "@/server/db/schema";
import { notFound } from "@/server/api/errors";

/** The subject row locked for a change, with its site. */
export async function loadSubjectForUpdate(tx: Tx, { subjectId }: { subjectId: string }) {
  const [row] = await tx.select({ subject: subjects, site: sites }).from(subjects).innerJoin(sites, eq(sites.id, subjects.siteId)).where(eq(subjects.id, subjectId)).for("update", { of: subjects });
  if (!row) throw notFound("That subject");
  return row;
}

/** Scope of every /subjects/:subjectId route: a wrong site answers 404. */
export async function subjectScope(tx: Tx, { subjectId }: { subjectId: string }) {
  const [row] = await tx.select({ studyId: subjects.studyId, siteId: subjects.siteId }).from(subjects).where(eq(subjects.id, subjectId));
  if (!row) throw notFound("That subject");
  return row;
}
