// GET /api/v1/me — the signed-in person and their roles
import { apiRoute } from "@/server/api/route";

export const GET = apiRoute({ permission: "signed_in", scope: () => ({ studyId: "" }) }, async ({ actor }) => ({
  userId: actor.userId,
  name: actor.name,
  email: actor.email,
  memberships: actor.memberships,
}));
