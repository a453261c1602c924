// GET /api/v1/studies/:studyId/documents — stored documents the caller may see; POST — request an upload URL
import { and, desc, eq, inArray } from "drizzle-orm";
import { apiRoute } from "@/server/api/route";
import { studyParams } from "@/lib/api/schemas";
import { createUploadSchema, documentListQuery } from "@/lib/api/document-schemas";
import { createUpload, maxUploadBytes } from "@/server/documents/uploads";
import { documents } from "@/server/db/schema";
import { checkBinderUpload } from "@/server/binder/binder-upload";

export const GET = apiRoute(
  { permission: "documents.read", params: studyParams, query: documentListQuery, siteFiltered: true, scope: ({ params, query }) => ({ studyId: params.studyId, siteId: query.siteId }) },
  async ({ tx, input, siteIds }) => {
    const rows = await tx
      .select()
      .from(documents)
      .where(
        and(
          eq(documents.studyId, input.params.studyId),
          input.query.siteId ? eq(documents.siteId, input.query.siteId) : undefined,
          siteIds === "all" ? undefined : inArray(documents.siteId, siteIds.length ? siteIds : ["00000000-0000-4000-8000-000000000000"]),
          input.query.purpose ? eq(documents.purpose, input.query.purpose) : undefined,
          eq(documents.state, "stored"),
        ),
      )
      .orderBy(desc(documents.createdAt))
      .limit(500);
    return { documents: rows };
  },
);

export const POST = apiRoute(
  {
    permission: "documents.upload",
    params: studyParams,
    body: createUploadSchema(maxUploadBytes()),
    scope: ({ params, body }) => ({ studyId: params.studyId, siteId: body.siteId }),
    status: 201,
  },
  async ({ tx, input, actor, audit }) => {
    const { siteId, purpose: givenPurpose, binder: binderInput, ...request } = input.body;
    const studyId = input.params.studyId;
    const checked = binderInput ? await checkBinderUpload(tx, { studyId, siteId, binder: binderInput }) : null;
    const purpose = checked?.purpose ?? givenPurpose;
    const binder = checked ? { documentTypeId: checked.documentTypeId, personId: checked.personId, issuedOn: checked.issuedOn, expiresOn: checked.expiresOn, reviewState: checked.reviewState } : undefined;
    const { document, uploadUrl } = await createUpload(tx, { studyId, siteId, purpose, request, uploaderId: actor.userId, binder });
    await audit({ action: "document.upload_requested", entityType: "document", entityId: document.id, after: { fileName: document.fileName, sha256: document.sha256, sizeBytes: document.sizeBytes, purpose, ...binder } });
    return { document, uploadUrl };
  },
);
