// GET /api/v1/subjects/:subjectId — a subject with its visit calendar, history and deviations
// PATCH /api/v1/subjects/:subjectId — correct a subject's dates or device serial
import { z } from "zod";
import { apiRoute } from "@/server/api/route";
import { idSchema } from "@/lib/api/schemas";
import { subjectScope } from "@/server/subjects/load-subject";
import { getSubjectDetail } from "@/server/subjects/get-subject";
import { updateSubject } from "@/server/subjects/update-subject";
import { updateSubjectSchema } from "@/server/subjects/subject-schemas";

const params = z.object({ subjectId: idSchema });

export const GET = apiRoute({ permission: "subjects.read", params, scope: ({ params }, tx) => subjectScope(tx, params) }, async ({ tx, input }) =>
  getSubjectDetail(tx, { subjectId: input.params.subjectId }),
);

export const PATCH = apiRoute(
  { permission: "subjects.write", params, body: updateSubjectSchema, scope: ({ params }, tx) => subjectScope(tx, params) },
  async ({ tx, input, audit }) => {
    const { before, after } = await updateSubject(tx, { subjectId: input.params.subjectId, input: input.body, audit });
    await audit({ action: "subject.update", entityType: "subject", entityId: after.id, before, after });
    return { subject: after };
  },
);
