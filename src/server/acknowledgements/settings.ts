import "server-only";
import { eq } from "drizzle-orm";
import type { Tx } from "@/server/db/client";
import { studies } from "@/server/db/schema";
import { notFound } from "@/server/api/errors";

/** Change the acknowledgement deadline; tasks already issued keep their due dates. */
export async function setAcknowledgementDeadline(tx: Tx, { studyId, ackDeadlineDays }: { studyId: string; ackDeadlineDays: number }) {
  const [before] = await tx.select({ ackDeadlineDays: studies.ackDeadlineDays }).from(studies).where(eq(studies.id, studyId));
  if (!before) throw notFound("That study");
  if (before.ackDeadlineDays === ackDeadlineDays) return { before, after: before, changed: false };
  await tx.update(studies).set({ ackDeadlineDays }).where(eq(studies.id, studyId));
  return { before, after: { ackDeadlineDays }, changed: true };
}
