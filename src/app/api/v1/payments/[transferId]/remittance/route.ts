// GET /api/v1/payments/:transferId/remittance?format=pdf|csv — a payment's remittance advice
import { apiRoute } from "@/server/api/route";
import { remittanceQuery, transferParams } from "@/lib/payments/schemas";
import { remittanceCsvFor, remittancePdfFor, scopeOfTransfer } from "@/server/payments/remittance";

export const GET = apiRoute(
  { permission: "payments.read", params: transferParams, query: remittanceQuery, scope: ({ params }, tx) => scopeOfTransfer(tx, params.transferId) },
  async ({ tx, input }) => {
    if (input.query.format === "csv") {
      const { fileName, body } = await remittanceCsvFor(tx, { transferId: input.params.transferId });
      return new Response(body, { headers: { "content-type": "text/csv; charset=utf-8", "content-disposition": `attachment; filename="${fileName}"` } });
    }
    const { fileName, body } = await remittancePdfFor(tx, { transferId: input.params.transferId });
    return new Response(new Uint8Array(body), { headers: { "content-type": "application/pdf", "content-disposition": `inline; filename="${fileName}"` } });
  },
);
