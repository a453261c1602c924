// POST /api/v1/subjects/:subjectId/deviations — report a protocol deviation for a subject
import { z } from "zod";
import { apiRoute } from "@/server/api/route";
import { idSchema } from "@/lib/api/schemas";
import { subjectScope } from "@/server/subjects/load-subject";
import { createManualDeviation } from "@/server/visits/deviations";
import { createDeviationSchema } from "@/server/visits/visit-schemas";

export const POST = apiRoute(
  { permission: "deviations.write", params: z.object({ subjectId: idSchema }), body: createDeviationSchema, scope: ({ params }, tx) => subjectScope(tx, params), status: 201 },
  async ({ tx, input, actor, audit }) => {
    const deviation = await createManualDeviation(tx, { subjectId: input.params.subjectId, input: input.body, actor });
    await audit({ action: "deviation.report", entityType: "deviation", entityId: deviation.id, after: deviation });
    return { deviation };
  },
);
