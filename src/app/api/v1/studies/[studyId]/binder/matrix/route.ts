// GET /api/v1/studies/:studyId/binder/matrix — sites × document types with counts (?format=csv to export)
import { apiRoute } from "@/server/api/route";
import { studyParams } from "@/lib/api/schemas";
import { matrixQuerySchema } from "@/lib/binder/schemas";
import { filterMatrix, matrixCsv } from "@/lib/binder/matrix";
import { loadStudyBinders } from "@/server/binder/study-matrix";

export const GET = apiRoute(
  { permission: "documents.read", params: studyParams, query: matrixQuerySchema, siteFiltered: true, scope: ({ params }) => ({ studyId: params.studyId }) },
  async ({ tx, input, siteIds }) => {
    const { types, rows } = await loadStudyBinders(tx, { studyId: input.params.studyId, siteIds });
    const filtered = filterMatrix(rows, { state: input.query.state, siteCode: input.query.site });
    if (input.query.format === "csv") {
      return new Response(matrixCsv(filtered, types), {
        headers: { "content-type": "text/csv; charset=utf-8", "content-disposition": 'attachment; filename="binder-matrix.csv"', "cache-control": "no-store" },
      });
    }
    return { types: types.map((t) => ({ id: t.id, code: t.code, name: t.name, holder: t.holder, requiredFrom: t.requiredFrom })), rows: filtered };
  },
);
