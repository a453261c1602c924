import "server-only";
import { apiRoute } from "@/server/api/route";
import type { Permission } from "@/lib/auth/roles";
import { transitionBodySchema, versionParams } from "@/lib/protocol/api-schemas";
import { studyIdOfVersion } from "./queries";
import { transitionProtocolVersion, type TransitionAction } from "./transition";

/** POST handler of one workflow step (submit, return, reopen, approve, release). */
export function transitionRoute(action: TransitionAction, permission: Permission) {
  return apiRoute(
    { permission, params: versionParams, body: transitionBodySchema.optional(), scope: async ({ params }, tx) => ({ studyId: await studyIdOfVersion(tx, params) }) },
    async ({ tx, input, actor, audit }) => {
      const version = await transitionProtocolVersion(tx, { versionId: input.params.versionId, action, actor, comment: input.body?.comment, audit });
      const { content: _c, visitSchedule: _v, ...rest } = version;
      return { version: rest };
    },
  );
}
