// GET /api/v1/studies — the studies the signed-in person holds a role in
import { apiRoute } from "@/server/api/route";
import { listStudiesByIds } from "@/server/studies/queries";
import { studyIdsOf } from "@/lib/auth/authorize";

export const GET = apiRoute({ permission: "signed_in", scope: () => ({ studyId: "" }) }, async ({ actor, tx }) => ({
  studies: await listStudiesByIds(tx, { studyIds: studyIdsOf(actor) }),
}));
