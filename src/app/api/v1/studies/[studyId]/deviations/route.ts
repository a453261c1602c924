// GET /api/v1/studies/:studyId/deviations — the deviation log, filtered (?format=csv to export)
import { apiRoute } from "@/server/api/route";
import { studyParams } from "@/lib/api/schemas";
import { studySiteScope } from "@/server/sites/get-site";
import { deviationsToCsv, listDeviations } from "@/server/visits/deviations";
import { deviationListQuery } from "@/server/visits/visit-schemas";

export const GET = apiRoute(
  {
    permission: "deviations.read",
    params: studyParams,
    query: deviationListQuery,
    scope: ({ params, query }, tx) => studySiteScope(tx, { studyId: params.studyId, siteId: query.siteId }),
    siteFiltered: true,
  },
  async ({ tx, input, siteIds }) => {
    const { format, ...filter } = input.query;
    const rows = await listDeviations(tx, { studyId: input.params.studyId, siteIds, filter });
    if (format === "csv") {
      return new Response(deviationsToCsv(rows), {
        headers: { "content-type": "text/csv; charset=utf-8", "content-disposition": `attachment; filename="deviations-${new Date().toISOString().slice(0, 10)}.csv"` },
      });
    }
    return { deviations: rows };
  },
);
