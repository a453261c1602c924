// GET /api/v1/studies/:studyId/acknowledgements/signature-page?versionId=&siteId= — printable signature page (PDF) of a version at a site
import { apiRoute } from "@/server/api/route";
import { studyParams } from "@/lib/api/schemas";
import { signaturePageQuery } from "@/lib/acknowledgements/api-schemas";
import { signaturePageFor } from "@/server/acknowledgements/signature-page";

export const GET = apiRoute(
  { permission: "acknowledgement.read", params: studyParams, query: signaturePageQuery, scope: ({ params, query }) => ({ studyId: params.studyId, siteId: query.siteId }) },
  async ({ tx, input }) => {
    const { pdf, fileName } = await signaturePageFor(tx, { studyId: input.params.studyId, ...input.query });
    return new Response(new Uint8Array(pdf), {
      headers: { "content-type": "application/pdf", "content-disposition": `inline; filename="${fileName}"`, "cache-control": "no-store" },
    });
  },
);
