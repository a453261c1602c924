// GET /api/v1/sites/:siteId/calendar-feeds — the caller's own secret calendar addresses for the site
// POST /api/v1/sites/:siteId/calendar-feeds — create one (the address is shown once)
import { apiRoute } from "@/server/api/route";
import { siteParams } from "@/lib/api/schemas";
import { siteScope } from "@/server/sites/get-site";
import { createFeedToken, listFeedTokens } from "@/server/visits/calendar-feed";
import { createFeedTokenSchema } from "@/server/visits/visit-schemas";

export const GET = apiRoute({ permission: "calendar.read", params: siteParams, scope: ({ params }, tx) => siteScope(tx, params) }, async ({ tx, input, actor }) => ({
  feeds: await listFeedTokens(tx, { userId: actor.userId, siteId: input.params.siteId }),
}));

export const POST = apiRoute(
  { permission: "calendar.read", params: siteParams, body: createFeedTokenSchema, scope: ({ params }, tx) => siteScope(tx, params), status: 201 },
  async ({ tx, input, actor, audit, scope, req }) => {
    const { row, path } = await createFeedToken(tx, { userId: actor.userId, studyId: scope.studyId, siteId: input.params.siteId, label: input.body.label });
    // The audit trail records that an address exists, never the secret.
    await audit({ action: "calendar_feed.create", entityType: "calendar_feed_token", entityId: row.id, after: { id: row.id, userId: row.userId, siteId: row.siteId, label: row.label } });
    return { feed: { id: row.id, label: row.label, createdAt: row.createdAt }, url: new URL(path, req.nextUrl.origin).toString() };
  },
);
