// GET /api/v1/studies/:studyId/binder/types — the study's essential-document types; POST — add one
import { apiRoute } from "@/server/api/route";
import { studyParams } from "@/lib/api/schemas";
import { binderTypeInputSchema } from "@/lib/binder/schemas";
import { createDocumentType, listDocumentTypes } from "@/server/binder/document-types";

export const GET = apiRoute(
  { permission: "documents.read", params: studyParams, siteFiltered: true, scope: ({ params }) => ({ studyId: params.studyId }) },
  async ({ tx, input }) => ({ types: await listDocumentTypes(tx, { studyId: input.params.studyId, includeRetired: true }) }),
);

export const POST = apiRoute(
  { permission: "documents.configure", params: studyParams, body: binderTypeInputSchema, scope: ({ params }) => ({ studyId: params.studyId }), status: 201 },
  async ({ tx, input, audit }) => {
    const type = await createDocumentType(tx, { studyId: input.params.studyId, input: input.body });
    await audit({ action: "binder.type_created", entityType: "binder_document_type", entityId: type.id, after: type });
    return { type };
  },
);
