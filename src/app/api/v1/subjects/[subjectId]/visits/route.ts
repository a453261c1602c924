// POST /api/v1/subjects/:subjectId/visits — record or correct a visit (done or missed)
import { z } from "zod";
import { apiRoute } from "@/server/api/route";
import { idSchema } from "@/lib/api/schemas";
import { subjectScope } from "@/server/subjects/load-subject";
import { recordVisit } from "@/server/visits/record-visit";
import { recordVisitSchema } from "@/server/visits/visit-schemas";

export const POST = apiRoute(
  { permission: "visits.record", params: z.object({ subjectId: idSchema }), body: recordVisitSchema, scope: ({ params }, tx) => subjectScope(tx, params) },
  async ({ tx, input, actor, audit, unchanged }) => {
    const result = await recordVisit(tx, { subjectId: input.params.subjectId, input: input.body, actor, audit });
    if (!result.changed) unchanged();
    return { visit: result.after };
  },
);
