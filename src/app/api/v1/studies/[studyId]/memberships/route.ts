// POST /api/v1/studies/:studyId/memberships — grant a role to a person
import { apiRoute } from "@/server/api/route";
import { grantSchema, studyParams } from "@/lib/api/schemas";
import { grantRole } from "@/server/people/people";

export const POST = apiRoute(
  { permission: "people.manage", params: studyParams, body: grantSchema, scope: ({ params }) => ({ studyId: params.studyId }), status: 201 },
  async ({ tx, input, actor, audit }) => {
    const row = await grantRole(tx, { actor, studyId: input.params.studyId, ...input.body });
    await audit({ action: "role.granted", entityType: "membership", entityId: row.id, siteId: row.siteId, after: row });
    return { membership: row };
  },
);
