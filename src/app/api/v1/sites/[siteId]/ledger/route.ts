// GET /api/v1/sites/:siteId/ledger — a site's earned lines, cycles, totals and holdback ledger
import { apiRoute } from "@/server/api/route";
import { siteParams } from "@/lib/api/schemas";
import { asOfQuery } from "@/lib/budgets/api-schemas";
import { notFound } from "@/server/api/errors";
import { scopeOfSite } from "@/server/budgets/site-scope";
import { getSiteLedger } from "@/server/ledger/get-site-ledger";

export const GET = apiRoute(
  { permission: "ledger.read", params: siteParams, query: asOfQuery, scope: ({ params }, tx) => scopeOfSite(tx, params.siteId) },
  async ({ tx, input, scope }) => {
    const ledger = await getSiteLedger(tx, { studyId: scope.studyId, siteId: input.params.siteId, asOf: input.query.asOf });
    if (!ledger) throw notFound("That site");
    return ledger;
  },
);
