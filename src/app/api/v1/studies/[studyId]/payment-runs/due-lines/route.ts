// GET /api/v1/studies/:studyId/payment-runs/due-lines — lines with something to pay and in no live run
import { apiRoute } from "@/server/api/route";
import { studyParams } from "@/lib/api/schemas";
import { dueLinesQuery } from "@/lib/payments/schemas";
import { listDueLines } from "@/server/payments/due-lines";

export const GET = apiRoute(
  { permission: "payments.prepare", params: studyParams, query: dueLinesQuery, scope: ({ params }) => ({ studyId: params.studyId }) },
  async ({ tx, input }) => {
    const q = input.query;
    return listDueLines(tx, { studyId: input.params.studyId, siteIds: q.siteId ? [q.siteId] : "all", asOf: q.asOf ?? new Date().toISOString(), cycle: q.cycle, currency: q.currency });
  },
);
