import "server-only";
import { and, eq } from "drizzle-orm";
import type { Tx } from "@/server/db/client";
import { visitRecords, type VisitRecord } from "@/server/db/schema";
import { notFound, unprocessable } from "@/server/api/errors";
import { loadSubjectForUpdate } from "@/server/subjects/load-subject";
import { todayAtSite } from "@/server/sites/site-today";
import type { Actor } from "@/lib/auth/authorize";

/** The monitor's source verification of a visit done (a payment trigger where the budget says so). */
export async function verifyVisit(
  tx: Tx,
  { subjectId, visitCode, verifiedOn, actor, now = new Date() }: { subjectId: string; visitCode: string; verifiedOn: string; actor: Actor; now?: Date },
): Promise<{ before: VisitRecord; after: VisitRecord }> {
  const { site } = await loadSubjectForUpdate(tx, { subjectId });
  const [before] = await tx.select().from(visitRecords).where(and(eq(visitRecords.subjectId, subjectId), eq(visitRecords.visitCode, visitCode))).for("update");
  if (!before) throw notFound(`Visit ${visitCode} of this subject`);
  const today = todayAtSite(site.timeZone, now);
  if (before.outcome !== "done" || !before.actualDate) throw unprocessable("Only a visit done can be verified against source.", { verifiedOn: ["The visit is not recorded as done"] });
  if (verifiedOn > today) throw unprocessable(`Not after today at the site (${today}).`, { verifiedOn: [`Not after ${today}`] });
  if (verifiedOn < before.actualDate) throw unprocessable("Verification comes on or after the visit date.", { verifiedOn: [`On or after ${before.actualDate}`] });
  if (before.dataEnteredOn && verifiedOn < before.dataEnteredOn) throw unprocessable("Verification comes on or after data entry.", { verifiedOn: [`On or after ${before.dataEnteredOn}`] });
  const [after] = await tx.update(visitRecords).set({ verifiedOn, verifiedBy: actor.userId, updatedAt: now }).where(eq(visitRecords.id, before.id)).returning();
  return { before, after: after! };
}
