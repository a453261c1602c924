// POST /api/v1/documents/:documentId/review — accept or reject a binder upload (with a reason)
import { apiRoute } from "@/server/api/route";
import { documentParams } from "@/lib/api/document-schemas";
import { reviewDecisionSchema } from "@/lib/binder/schemas";
import { getDocumentById } from "@/server/documents/uploads";
import { reviewDocument } from "@/server/binder/review-document";

export const POST = apiRoute(
  {
    permission: "documents.review",
    params: documentParams,
    body: reviewDecisionSchema,
    scope: async ({ params }, tx) => {
      const doc = await getDocumentById(tx, { id: params.documentId });
      return { studyId: doc.studyId, siteId: doc.siteId };
    },
  },
  async ({ tx, input, actor, audit, unchanged }) => {
    const doc = await getDocumentById(tx, { id: input.params.documentId });
    const { after, changed } = await reviewDocument(tx, { doc, decision: input.body.decision, reason: input.body.reason, reviewer: actor });
    if (!changed) unchanged();
    else {
      await audit({
        action: input.body.decision === "accepted" ? "document.accepted" : "document.rejected",
        entityType: "document",
        entityId: doc.id,
        before: { reviewState: doc.reviewState },
        after: { reviewState: after.reviewState, reason: after.reviewReason },
      });
    }
    return { document: after };
  },
);
