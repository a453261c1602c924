// GET /api/v1/studies/:studyId/binder/review — binder uploads awaiting a sponsor decision
import { apiRoute } from "@/server/api/route";
import { studyParams } from "@/lib/api/schemas";
import { listAwaitingReview } from "@/server/binder/review-document";

export const GET = apiRoute(
  { permission: "documents.review", params: studyParams, scope: ({ params }) => ({ studyId: params.studyId }) },
  async ({ tx, input }) => ({ documents: await listAwaitingReview(tx, { studyId: input.params.studyId }) }),
);
