// GET /api/v1/studies/:studyId/acknowledgements/export — the compliance matrix as CSV, same filters as the list
import { apiRoute } from "@/server/api/route";
import { studyParams } from "@/lib/api/schemas";
import { matrixQuery } from "@/lib/acknowledgements/api-schemas";
import { listAcknowledgementMatrix } from "@/server/acknowledgements/list-matrix";
import { describeStatus } from "@/lib/acknowledgements";
import { toCsv } from "@/lib/csv";

export const GET = apiRoute(
  { permission: "acknowledgement.read", params: studyParams, query: matrixQuery, siteFiltered: true, scope: ({ params, query }) => ({ studyId: params.studyId, siteId: query.siteId }) },
  async ({ tx, input, siteIds }) => {
    const rows = await listAcknowledgementMatrix(tx, { studyId: input.params.studyId, siteIds, ...input.query });
    const csv = toCsv(
      ["version", "site", "investigator", "email", "requested_at_utc", "due_on_site", "state", "days_left", "days_over", "status", "signed_at_utc", "signed_at_site", "content_hash"],
      rows.map((r) => [
        r.versionLabel,
        r.siteCode,
        r.investigatorName,
        r.investigatorEmail,
        r.requestedAt,
        r.dueOn,
        r.status.state,
        r.status.state === "pending" ? r.status.daysLeft : null,
        r.status.state === "overdue" ? r.status.daysOver : null,
        describeStatus(r.status),
        r.signature?.signedAt ?? null,
        r.signature?.signedAtSiteLocal ?? null,
        r.signature?.contentHash ?? null,
      ]),
    );
    return new Response(csv, {
      headers: { "content-type": "text/csv; charset=utf-8", "content-disposition": `attachment; filename="acknowledgements.csv"`, "cache-control": "no-store" },
    });
  },
);
