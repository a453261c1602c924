// PATCH /api/v1/studies/:studyId/binder/types/:typeCode — change or retire a document type
import { z } from "zod";
import { apiRoute } from "@/server/api/route";
import { idSchema } from "@/lib/api/schemas";
import { binderTypeCodeSchema, binderTypePatchSchema } from "@/lib/binder/schemas";
import { updateDocumentType } from "@/server/binder/document-types";

export const PATCH = apiRoute(
  {
    permission: "documents.configure",
    params: z.object({ studyId: idSchema, typeCode: binderTypeCodeSchema }),
    body: binderTypePatchSchema,
    scope: ({ params }) => ({ studyId: params.studyId }),
  },
  async ({ tx, input, audit }) => {
    const { before, after } = await updateDocumentType(tx, { studyId: input.params.studyId, code: input.params.typeCode, patch: input.body });
    await audit({ action: after.retiredAt && !before.retiredAt ? "binder.type_retired" : "binder.type_changed", entityType: "binder_document_type", entityId: after.id, before, after });
    return { type: after };
  },
);
