// POST /api/v1/sites/:siteId/subjects/import — import subjects and visits from CSV, all or nothing
import { apiRoute } from "@/server/api/route";
import { siteParams } from "@/lib/api/schemas";
import { siteScope } from "@/server/sites/get-site";
import { importSubjects } from "@/server/subjects/import-subjects";
import { importSubjectsSchema } from "@/server/subjects/subject-schemas";

export const POST = apiRoute(
  { permission: "subjects.write", params: siteParams, body: importSubjectsSchema, scope: ({ params }, tx) => siteScope(tx, params), status: 201 },
  async ({ tx, input, actor, audit }) => importSubjects(tx, { siteId: input.params.siteId, csv: input.body.csv, actor, audit }),
);
