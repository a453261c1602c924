// GET /api/v1/documents/:documentId/download — a short-lived presigned download URL
import { apiRoute } from "@/server/api/route";
import { documentParams } from "@/lib/api/document-schemas";
import { downloadUrlFor, getDocumentById } from "@/server/documents/uploads";
import { DOWNLOAD_URL_SECONDS } from "@/server/storage/s3";

export const GET = apiRoute(
  {
    permission: "documents.read",
    params: documentParams,
    scope: async ({ params }, tx) => {
      const doc = await getDocumentById(tx, { id: params.documentId });
      return { studyId: doc.studyId, siteId: doc.siteId };
    },
  },
  async ({ tx, input }) => {
    const doc = await getDocumentById(tx, { id: input.params.documentId });
    return { url: await downloadUrlFor(doc), expiresInSeconds: DOWNLOAD_URL_SECONDS, fileName: doc.fileName };
  },
);
