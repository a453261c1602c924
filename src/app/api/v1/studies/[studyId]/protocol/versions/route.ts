// GET /api/v1/studies/:studyId/protocol/versions — the study's protocol versions; POST — start a new draft from the version in force
import { apiRoute } from "@/server/api/route";
import { studyParams } from "@/lib/api/schemas";
import { createDraftSchema } from "@/lib/protocol/api-schemas";
import { audienceFor, listProtocolVersions } from "@/server/protocol/queries";
import { createProtocolDraft } from "@/server/protocol/create-draft";

export const GET = apiRoute(
  { permission: "protocol.read", params: studyParams, siteFiltered: true, scope: ({ params }) => ({ studyId: params.studyId }) },
  async ({ tx, input, siteIds }) => ({ versions: await listProtocolVersions(tx, { studyId: input.params.studyId, audience: audienceFor(siteIds) }) }),
);

export const POST = apiRoute(
  { permission: "protocol.write", params: studyParams, body: createDraftSchema, scope: ({ params }) => ({ studyId: params.studyId }), status: 201 },
  async ({ tx, input, actor, audit }) => {
    const version = await createProtocolDraft(tx, { studyId: input.params.studyId, actor, substantial: input.body.substantial });
    await audit({
      action: "protocol_version.create",
      entityType: "protocol_version",
      entityId: version.id,
      after: { state: version.state, versionLabel: version.versionLabel, amendmentNumber: version.amendmentNumber, parentId: version.parentId },
    });
    return { version: { id: version.id, versionLabel: version.versionLabel, state: version.state, revision: version.revision } };
  },
);
