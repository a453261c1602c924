import "server-only";
import { and, asc, eq, inArray, isNotNull } from "drizzle-orm";
import type { Tx } from "@/server/db/client";
import { binderDocumentTypes, documents, sites, users, type DocumentRow } from "@/server/db/schema";
import { conflict, unprocessable } from "@/server/api/errors";
import { enqueueMail } from "@/server/mail/enqueue-mail";
import { loadSitePeople } from "./load-site-binder";

/**
 * A sponsor person accepts or rejects one binder upload. A rejection puts the item back on the
 * site's to-do list and tells the site's coordinators why (outbox, same transaction).
 */
export async function reviewDocument(
  tx: Tx,
  { doc, decision, reason, reviewer, now = new Date() }: { doc: DocumentRow; decision: "accepted" | "rejected"; reason: string; reviewer: { userId: string; name: string }; now?: Date },
) {
  if (!doc.documentTypeId || !doc.siteId) throw unprocessable("Only essential documents of a site's binder are reviewed.");
  if (doc.state !== "stored") throw unprocessable("The file has not been verified in storage yet, so it cannot be reviewed.");
  if (doc.reviewState === decision) return { before: doc, after: doc, changed: false };
  if (doc.reviewState && doc.reviewState !== "awaiting_review") {
    throw conflict(`This document was already ${doc.reviewState}. Ask the site to upload a new version instead.`);
  }
  const [after] = await tx
    .update(documents)
    .set({ reviewState: decision, reviewReason: reason || null, reviewerId: reviewer.userId, reviewedAt: now })
    .where(and(eq(documents.id, doc.id), eq(documents.reviewState, "awaiting_review")))
    .returning();
  if (!after) throw conflict("Someone else reviewed this document at the same time. Reload to see their decision.");
  if (decision === "rejected") {
    const [type] = await tx.select({ name: binderDocumentTypes.name }).from(binderDocumentTypes).where(eq(binderDocumentTypes.id, doc.documentTypeId));
    const [site] = await tx.select({ code: sites.code }).from(sites).where(eq(sites.id, doc.siteId));
    const people = (await loadSitePeople(tx, { siteIds: [doc.siteId] })).get(doc.siteId) ?? [];
    const coordinators = people.filter((p) => p.roles.includes("coordinator")).map((p) => p.userId);
    const recipients = coordinators.length ? await tx.select({ id: users.id, email: users.email }).from(users).where(inArray(users.id, coordinators)) : [];
    for (const r of recipients) {
      await enqueueMail(tx, {
        dedupeKey: `binder-rejected:${doc.id}:${r.id}`,
        to: r.email,
        subject: `Site ${site?.code}: ${type?.name ?? "a document"} was not accepted`,
        text: `${reviewer.name} did not accept "${doc.fileName}" (${type?.name}) for site ${site?.code}.\n\nReason: ${reason}\n\nUpload a corrected version in Cairn under Documents.`,
      });
    }
  }
  return { before: doc, after, changed: true };
}

/** Stored binder uploads waiting for a sponsor decision, oldest first. */
export async function listAwaitingReview(tx: Tx, { studyId, limit = 200 }: { studyId: string; limit?: number }) {
  return tx
    .select({
      id: documents.id,
      fileName: documents.fileName,
      createdAt: documents.createdAt,
      issuedOn: documents.issuedOn,
      expiresOn: documents.expiresOn,
      siteId: documents.siteId,
      siteCode: sites.code,
      typeName: binderDocumentTypes.name,
      personId: documents.personId,
      uploaderName: users.name,
    })
    .from(documents)
    .innerJoin(binderDocumentTypes, eq(binderDocumentTypes.id, documents.documentTypeId))
    .innerJoin(sites, eq(sites.id, documents.siteId))
    .innerJoin(users, eq(users.id, documents.uploaderId))
    .where(and(eq(documents.studyId, studyId), eq(documents.state, "stored"), eq(documents.reviewState, "awaiting_review"), isNotNull(documents.documentTypeId)))
    .orderBy(asc(documents.createdAt))
    .limit(limit);
}
