// GET /api/v1/protocol-versions/:versionId/pdf?kind=clean|tracked|summary|package — ethics-committee PDFs of a version
import { apiRoute } from "@/server/api/route";
import { pdfQuerySchema, versionParams } from "@/lib/protocol/api-schemas";
import { audienceFor, getProtocolVersion, studyIdOfVersion } from "@/server/protocol/queries";
import { buildVersionPdf } from "@/server/protocol/version-pdf";

export const GET = apiRoute(
  { permission: "protocol.read", params: versionParams, query: pdfQuerySchema, siteFiltered: true, scope: async ({ params }, tx) => ({ studyId: await studyIdOfVersion(tx, params) }) },
  async ({ tx, input, siteIds }) => {
    const version = await getProtocolVersion(tx, { versionId: input.params.versionId, audience: audienceFor(siteIds) });
    const { bytes, fileName } = await buildVersionPdf(tx, { version, kind: input.query.kind });
    return new Response(new Uint8Array(bytes), {
      headers: { "content-type": "application/pdf", "content-disposition": `inline; filename="${fileName}"`, "cache-control": "private, no-store" },
    });
  },
);
