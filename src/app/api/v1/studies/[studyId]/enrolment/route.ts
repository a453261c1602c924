// GET /api/v1/studies/:studyId/enrolment — enrolment against target and visit backlog per site
import { apiRoute } from "@/server/api/route";
import { studyParams } from "@/lib/api/schemas";
import { enrolmentOverview } from "@/server/sites/enrolment-overview";

export const GET = apiRoute(
  { permission: "subjects.read", params: studyParams, scope: ({ params }) => ({ studyId: params.studyId }), siteFiltered: true },
  async ({ tx, input, siteIds }) => ({ sites: await enrolmentOverview(tx, { studyId: input.params.studyId, siteIds }) }),
);
