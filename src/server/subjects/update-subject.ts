import "server-only";
import { eq } from "drizzle-orm";
import type { Tx } from "@/server/db/client";
import { subjects, type Subject } from "@/server/db/schema";
import { unprocessable } from "@/server/api/errors";
import type { AuditEntry } from "@/server/audit/record-audit";
import { listVersionsInForceAtSite } from "@/server/protocol/in-force";
import { todayAtSite } from "@/server/sites/site-today";
import { reconcileSubjectDeviations } from "@/server/visits/reconcile-subject-deviations";
import { consentVersionFor } from "./consent-version";
import { loadSubjectForUpdate } from "./load-subject";
import { checkSubjectDates } from "./subject-dates";
import type { UpdateSubjectInput } from "./subject-schemas";

/**
 * Corrects a subject's dates or device serial. The consent version follows the consent date; visit
 * windows follow the anchors, so deviations are reconciled afterwards.
 */
export async function updateSubject(
  tx: Tx,
  { subjectId, input, audit, now = new Date() }: { subjectId: string; input: UpdateSubjectInput; audit: (e: AuditEntry) => Promise<void>; now?: Date },
): Promise<{ before: Subject; after: Subject }> {
  const { subject: before, site } = await loadSubjectForUpdate(tx, { subjectId });
  const next = { ...before, ...input };
  const fields = checkSubjectDates(next, todayAtSite(site.timeZone, now));
  if (Object.keys(fields).length > 0) throw unprocessable("Check the dates.", fields);
  let consentVersionId = before.consentVersionId;
  if (input.consentDate && input.consentDate !== before.consentDate) {
    consentVersionId = consentVersionFor(await listVersionsInForceAtSite(tx, { siteId: site.id }), input.consentDate, site.code).versionId;
  }
  const [after] = await tx
    .update(subjects)
    .set({ ...input, consentVersionId, updatedAt: now })
    .where(eq(subjects.id, subjectId))
    .returning();
  await reconcileSubjectDeviations(tx, { subjectId, audit, now });
  return { before, after: after! };
}
