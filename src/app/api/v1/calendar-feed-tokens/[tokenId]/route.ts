// DELETE /api/v1/calendar-feed-tokens/:tokenId — revoke one of the caller's calendar addresses
import { z } from "zod";
import { apiRoute } from "@/server/api/route";
import { idSchema } from "@/lib/api/schemas";
import { feedTokenScope, revokeFeedToken } from "@/server/visits/calendar-feed";

export const DELETE = apiRoute(
  { permission: "calendar.read", params: z.object({ tokenId: idSchema }), scope: ({ params }, tx) => feedTokenScope(tx, params) },
  async ({ tx, input, actor, audit }) => {
    const { before, after } = await revokeFeedToken(tx, { tokenId: input.params.tokenId, userId: actor.userId });
    const shown = (t: typeof before) => ({ id: t.id, userId: t.userId, siteId: t.siteId, label: t.label, revokedAt: t.revokedAt });
    await audit({ action: "calendar_feed.revoke", entityType: "calendar_feed_token", entityId: after.id, before: shown(before), after: shown(after) });
    return { revoked: true };
  },
);
