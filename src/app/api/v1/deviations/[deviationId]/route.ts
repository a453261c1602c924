// PATCH /api/v1/deviations/:deviationId — resolve a reported deviation
import { z } from "zod";
import { apiRoute } from "@/server/api/route";
import { idSchema } from "@/lib/api/schemas";
import { deviationScope, resolveDeviation } from "@/server/visits/deviations";
import { resolveDeviationSchema } from "@/server/visits/visit-schemas";

export const PATCH = apiRoute(
  { permission: "deviations.write", params: z.object({ deviationId: idSchema }), body: resolveDeviationSchema, scope: ({ params }, tx) => deviationScope(tx, params) },
  async ({ tx, input, audit }) => {
    const { before, after } = await resolveDeviation(tx, { deviationId: input.params.deviationId, resolution: input.body.resolution });
    await audit({ action: "deviation.resolve", entityType: "deviation", entityId: after.id, before, after });
    return { deviation: after };
  },
);
