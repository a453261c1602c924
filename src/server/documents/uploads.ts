import "server-only";
import { randomUUID } from "node:crypto";
import { and, desc, eq, isNull, ne } from "drizzle-orm";
import { env } from "@/env";
import type { Tx } from "@/server/db/client";
import { documents, type DocumentRow } from "@/server/db/schema";
import { notFound, unprocessable } from "@/server/api/errors";
import type { UploadRequest } from "@/lib/documents/upload-rules";
import { hashStoredObject, presignDownload, presignUpload } from "@/server/storage/s3";

export const maxUploadBytes = () => env.UPLOAD_MAX_BYTES;

/** Record a pending document and issue a presigned PUT URL for it. */
export async function createUpload(
  tx: Tx,
  {
    studyId,
    siteId,
    purpose,
    request,
    uploaderId,
    binder,
  }: {
    studyId: string;
    siteId: string | null;
    purpose: string;
    request: UploadRequest;
    uploaderId: string;
    /** Binder fields (document type, person, dates, review state) for an essential document. */
    binder?: Pick<DocumentRow, "documentTypeId" | "personId" | "issuedOn" | "expiresOn" | "reviewState">;
  },
) {
  const storageKey = `${studyId}/${siteId ?? "study"}/${purpose}/${randomUUID()}`;
  const [row] = await tx
    .insert(documents)
    .values({ studyId, siteId, purpose, storageKey, fileName: request.fileName, contentType: request.contentType, sizeBytes: request.sizeBytes, sha256: request.sha256, uploaderId, ...binder })
    .returning();
  const uploadUrl = await presignUpload(storageKey, request.contentType, request.sizeBytes);
  return { document: row!, uploadUrl };
}

export async function getDocumentById(tx: Tx, { id }: { id: string }): Promise<DocumentRow> {
  const row = await tx.query.documents.findFirst({ where: eq(documents.id, id) });
  if (!row) throw notFound("That document");
  return row;
}

/** After the browser's PUT: read the object back, check size and SHA-256, mark it stored. */
export async function completeUpload(tx: Tx, doc: DocumentRow) {
  if (doc.state === "stored") return doc;
  const stored = await hashStoredObject(doc.storageKey);
  if (!stored) throw unprocessable("The file has not arrived in storage yet. Upload it, then try again.");
  const matches = stored.sha256 === doc.sha256 && stored.sizeBytes === doc.sizeBytes;
  // A stored binder document supersedes the current version of the same item (the old one stays readable).
  const previous =
    matches && doc.documentTypeId
      ? await tx.query.documents.findFirst({
          where: and(
            eq(documents.documentTypeId, doc.documentTypeId),
            doc.siteId ? eq(documents.siteId, doc.siteId) : isNull(documents.siteId),
            doc.personId ? eq(documents.personId, doc.personId) : isNull(documents.personId),
            eq(documents.state, "stored"),
            ne(documents.id, doc.id),
          ),
          orderBy: desc(documents.createdAt),
        })
      : undefined;
  const [updated] = await tx
    .update(documents)
    .set({ state: matches ? "stored" : "rejected_checksum", verifiedAt: new Date(), ...(previous ? { supersedesId: previous.id } : {}) })
    .where(and(eq(documents.id, doc.id)))
    .returning();
  if (!matches) {
    return { ...updated!, mismatch: { expected: doc.sha256, found: stored.sha256, expectedSize: doc.sizeBytes, foundSize: stored.sizeBytes } };
  }
  return updated!;
}

/** Re-check a stored document against its recorded SHA-256 (detects a changed object). */
export async function verifyStoredDocument(doc: DocumentRow) {
  const stored = await hashStoredObject(doc.storageKey);
  return { intact: !!stored && stored.sha256 === doc.sha256 && stored.sizeBytes === doc.sizeBytes, found: stored };
}

export async function downloadUrlFor(doc: DocumentRow) {
  if (doc.state !== "stored") throw unprocessable("This document has not been verified in storage, so it cannot be downloaded.");
  return presignDownload(doc.storageKey, doc.fileName);
}
