// DELETE /api/v1/studies/:studyId/memberships/:membershipId — revoke a role
import { z } from "zod";
import { apiRoute } from "@/server/api/route";
import { idSchema } from "@/lib/api/schemas";
import { revokeRole } from "@/server/people/people";

export const DELETE = apiRoute(
  { permission: "people.manage", params: z.object({ studyId: idSchema, membershipId: idSchema }), scope: ({ params }) => ({ studyId: params.studyId }) },
  async ({ tx, input, actor, audit }) => {
    const { before, after } = await revokeRole(tx, { actor, ...input.params });
    await audit({ action: "role.revoked", entityType: "membership", entityId: after.id, siteId: after.siteId, before, after });
    return { membership: after };
  },
);
