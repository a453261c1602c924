// GET /api/v1/sites/:siteId/statement — a site's statement for a period or cycle, as CSV or PDF
import { apiRoute } from "@/server/api/route";
import { siteParams } from "@/lib/api/schemas";
import { statementQuery } from "@/lib/budgets/api-schemas";
import { statementCsv } from "@/lib/ledger";
import { notFound } from "@/server/api/errors";
import { scopeOfSite } from "@/server/budgets/site-scope";
import { getSiteLedger, linesInPeriod } from "@/server/ledger/get-site-ledger";
import { buildStatementPdf } from "@/server/ledger/statement-pdf";

export const GET = apiRoute(
  { permission: "ledger.read", params: siteParams, query: statementQuery, scope: ({ params }, tx) => scopeOfSite(tx, params.siteId) },
  async ({ tx, input, scope }) => {
    const ledger = await getSiteLedger(tx, { studyId: scope.studyId, siteId: input.params.siteId, asOf: input.query.asOf });
    if (!ledger) throw notFound("That site");
    const { from, to, cycle, format } = input.query;
    const lines = linesInPeriod(ledger.lines, { from, to, cycle });
    const period = cycle ? { from: lines[0]?.cycle.start ?? cycle, to: lines[0]?.cycle.end ?? cycle } : { from: from ?? "start", to: to ?? ledger.asOf };
    const name = `statement-${ledger.site.code}-${cycle ?? `${period.from}_${period.to}`}`;
    const common = { siteCode: ledger.site.code, currency: ledger.site.currency, asOf: ledger.asOf, lines, ...period };
    if (format === "pdf") {
      const pdf = await buildStatementPdf({ ...common, studyCode: ledger.study.code, siteName: ledger.site.name });
      return new Response(new Uint8Array(pdf), { headers: { "content-type": "application/pdf", "content-disposition": `attachment; filename="${name}.pdf"`, "cache-control": "no-store" } });
    }
    return new Response(statementCsv(common), { headers: { "content-type": "text/csv; charset=utf-8", "content-disposition": `attachment; filename="${name}.csv"`, "cache-control": "no-store" } });
  },
);
