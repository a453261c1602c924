// GET /api/v1/studies/:studyId/protocol/compare?from=&to= — redline of two versions (blocks, words, schedule of visits)
import { apiRoute } from "@/server/api/route";
import { studyParams } from "@/lib/api/schemas";
import { compareQuerySchema } from "@/lib/protocol/api-schemas";
import { audienceFor } from "@/server/protocol/queries";
import { compareProtocolVersions } from "@/server/protocol/compare";

export const GET = apiRoute(
  { permission: "protocol.read", params: studyParams, query: compareQuerySchema, siteFiltered: true, scope: ({ params }) => ({ studyId: params.studyId }) },
  async ({ tx, input, siteIds }) =>
    compareProtocolVersions(tx, { studyId: input.params.studyId, fromId: input.query.from, toId: input.query.to, audience: audienceFor(siteIds) }),
);
