// POST /api/v1/subjects/:subjectId/status — move a subject one step (reason for screen failure or withdrawal)
import { z } from "zod";
import { apiRoute } from "@/server/api/route";
import { idSchema } from "@/lib/api/schemas";
import { subjectScope } from "@/server/subjects/load-subject";
import { changeSubjectStatus } from "@/server/subjects/change-subject-status";
import { subjectStatusChangeSchema } from "@/server/subjects/subject-schemas";

export const POST = apiRoute(
  { permission: "subjects.write", params: z.object({ subjectId: idSchema }), body: subjectStatusChangeSchema, scope: ({ params }, tx) => subjectScope(tx, params) },
  async ({ tx, input, actor, audit }) => {
    const { before, after } = await changeSubjectStatus(tx, { subjectId: input.params.subjectId, input: input.body, actor, audit });
    await audit({ action: "subject.status_change", entityType: "subject", entityId: after.id, before, after });
    return { subject: after };
  },
);
