// GET /api/v1/studies/:studyId/exchange-rates — rates into the reporting currency; POST — enter a rate
import { apiRoute } from "@/server/api/route";
import { studyParams } from "@/lib/api/schemas";
import { exchangeRateInput } from "@/lib/budgets/api-schemas";
import { addExchangeRate, listExchangeRates } from "@/server/budgets/exchange-rates";

export const GET = apiRoute(
  { permission: "ledger.read", params: studyParams, siteFiltered: true, scope: ({ params }) => ({ studyId: params.studyId }) },
  async ({ tx, input }) => ({ rates: await listExchangeRates(tx, { studyId: input.params.studyId }) }),
);

export const POST = apiRoute(
  { permission: "rates.write", params: studyParams, body: exchangeRateInput, scope: ({ params }) => ({ studyId: params.studyId }), status: 201 },
  async ({ tx, input, actor, audit }) => {
    const rate = await addExchangeRate(tx, { studyId: input.params.studyId, ...input.body, actorId: actor.userId });
    await audit({ action: "exchange_rate.entered", entityType: "exchange_rate", entityId: rate.id, after: rate });
    return { rate };
  },
);
