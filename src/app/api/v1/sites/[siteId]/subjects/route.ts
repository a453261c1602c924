// POST /api/v1/sites/:siteId/subjects — screen a new subject at the site (pseudonymous code only)
import { apiRoute } from "@/server/api/route";
import { siteParams } from "@/lib/api/schemas";
import { siteScope } from "@/server/sites/get-site";
import { createSubject } from "@/server/subjects/create-subject";
import { createSubjectSchema } from "@/server/subjects/subject-schemas";

export const POST = apiRoute(
  { permission: "subjects.write", params: siteParams, body: createSubjectSchema, scope: ({ params }, tx) => siteScope(tx, params), status: 201 },
  async ({ tx, input, actor, audit }) => {
    const subject = await createSubject(tx, { siteId: input.params.siteId, input: input.body, actor });
    await audit({ action: "subject.create", entityType: "subject", entityId: subject.id, after: subject });
    return { subject };
  },
);
