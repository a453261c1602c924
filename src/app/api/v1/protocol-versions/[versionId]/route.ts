// GET /api/v1/protocol-versions/:versionId — one version with its content; PUT — save a draft (409 on a stale base revision)
import { apiRoute, jsonResponse } from "@/server/api/route";
import { saveDraftSchema, versionParams } from "@/lib/protocol/api-schemas";
import { hashProtocolContent } from "@/lib/protocol/content-hash";
import { audienceFor, getProtocolVersion, permittedActions, studyIdOfVersion } from "@/server/protocol/queries";
import { saveProtocolDraft } from "@/server/protocol/save-draft";

export const GET = apiRoute(
  { permission: "protocol.read", params: versionParams, siteFiltered: true, scope: async ({ params }, tx) => ({ studyId: await studyIdOfVersion(tx, params) }) },
  async ({ tx, input, actor, siteIds }) => {
    const version = await getProtocolVersion(tx, { versionId: input.params.versionId, audience: audienceFor(siteIds) });
    return { version, permittedActions: permittedActions(version, actor) };
  },
);

export const PUT = apiRoute(
  { permission: "protocol.write", params: versionParams, body: saveDraftSchema, scope: async ({ params }, tx) => ({ studyId: await studyIdOfVersion(tx, params) }) },
  async ({ tx, input, audit, unchanged }) => {
    const result = await saveProtocolDraft(tx, { versionId: input.params.versionId, input: input.body });
    if (!result.ok) {
      unchanged();
      // The other person's saved version comes back so the client can show it beside the local edit.
      return jsonResponse(
        {
          error: {
            code: "conflict",
            message: `Someone saved this draft after you opened it (you edited revision ${input.body.baseRevision}, it is now at revision ${result.current.revision}). Your change was not saved.`,
          },
          current: result.current,
        },
        { status: 409 },
      );
    }
    const { before, version } = result;
    const digest = (v: typeof version) => ({ revision: v.revision, versionLabel: v.versionLabel, substantial: v.substantial, draftHash: hashProtocolContent({ doc: v.content, visitSchedule: v.visitSchedule }) });
    await audit({ action: "protocol_version.save", entityType: "protocol_version", entityId: version.id, before: digest(before), after: digest(version) });
    return { version: { id: version.id, revision: version.revision, versionLabel: version.versionLabel, updatedAt: version.updatedAt, substantial: version.substantial } };
  },
);
