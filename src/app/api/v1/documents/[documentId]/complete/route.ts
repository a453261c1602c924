// POST /api/v1/documents/:documentId/complete — verify the uploaded object's size and SHA-256
import { apiRoute } from "@/server/api/route";
import { documentParams } from "@/lib/api/document-schemas";
import { completeUpload, getDocumentById } from "@/server/documents/uploads";
import { AppError } from "@/server/api/errors";

export const POST = apiRoute(
  {
    permission: "documents.upload",
    params: documentParams,
    scope: async ({ params }, tx) => {
      const doc = await getDocumentById(tx, { id: params.documentId });
      return { studyId: doc.studyId, siteId: doc.siteId };
    },
  },
  async ({ tx, input, actor, audit, unchanged }) => {
    const doc = await getDocumentById(tx, { id: input.params.documentId });
    if (doc.state === "stored") {
      unchanged();
      return { document: doc };
    }
    if (doc.uploaderId !== actor.userId) throw new AppError("forbidden", "Only the person who uploaded a file can complete its upload.");
    const result = await completeUpload(tx, doc);
    await audit({ action: result.state === "stored" ? "document.stored" : "document.checksum_mismatch", entityType: "document", entityId: doc.id, before: { state: doc.state }, after: { state: result.state } });
    if (result.state !== "stored") {
      return new Response(
        JSON.stringify({ error: { code: "unprocessable", message: "The stored file does not match its SHA-256: it was changed or damaged in transit. Upload it again." } }),
        { status: 422, headers: { "content-type": "application/json" } },
      );
    }
    return { document: result };
  },
);
