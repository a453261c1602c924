// GET /api/v1/studies/:studyId/subjects — subjects at the sites the caller may see (?siteId, ?status)
import { apiRoute } from "@/server/api/route";
import { studyParams } from "@/lib/api/schemas";
import { studySiteScope } from "@/server/sites/get-site";
import { listSubjects } from "@/server/subjects/list-subjects";
import { subjectListQuery } from "@/server/subjects/subject-schemas";

export const GET = apiRoute(
  {
    permission: "subjects.read",
    params: studyParams,
    query: subjectListQuery,
    scope: ({ params, query }, tx) => studySiteScope(tx, { studyId: params.studyId, siteId: query.siteId }),
    siteFiltered: true,
  },
  async ({ tx, input, siteIds }) => ({
    subjects: await listSubjects(tx, { studyId: input.params.studyId, siteIds: input.query.siteId ? [input.query.siteId] : siteIds, status: input.query.status }),
  }),
);
