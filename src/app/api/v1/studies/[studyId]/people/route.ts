// GET /api/v1/studies/:studyId/people — people and their roles; POST — invite a person by e-mail
import { apiRoute } from "@/server/api/route";
import { inviteSchema, studyParams } from "@/lib/api/schemas";
import { invitePerson, listPeopleForStudy } from "@/server/people/people";

export const GET = apiRoute(
  { permission: "people.read", params: studyParams, scope: ({ params }) => ({ studyId: params.studyId }) },
  async ({ tx, input, siteIds }) => ({ people: await listPeopleForStudy(tx, { studyId: input.params.studyId, siteIds }) }),
);

export const POST = apiRoute(
  { permission: "people.manage", params: studyParams, body: inviteSchema, scope: ({ params }) => ({ studyId: params.studyId }), status: 201 },
  async ({ tx, input, actor, audit }) => {
    const result = await invitePerson(tx, { actor, studyId: input.params.studyId, ...input.body });
    await audit({
      action: "person.invited",
      entityType: "membership",
      entityId: result.membership.id,
      siteId: input.body.siteId,
      after: { email: input.body.email, role: input.body.role, siteId: input.body.siteId, invitationSent: result.invitationSent },
    });
    return { userId: result.user.id, membershipId: result.membership.id, invitationSent: result.invitationSent };
  },
);
