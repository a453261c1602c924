// POST /api/v1/sites/:siteId/status — move a site one step along its lifecycle
import { apiRoute } from "@/server/api/route";
import { siteParams } from "@/lib/api/schemas";
import { siteScope } from "@/server/sites/get-site";
import { changeSiteStatus } from "@/server/sites/change-site-status";
import { siteStatusChangeSchema } from "@/server/sites/site-schemas";

export const POST = apiRoute(
  { permission: "sites.manage", params: siteParams, body: siteStatusChangeSchema, scope: ({ params }, tx) => siteScope(tx, params) },
  async ({ tx, input, actor, audit }) => {
    const change = await changeSiteStatus(tx, { siteId: input.params.siteId, to: input.body.to, effectiveOn: input.body.effectiveOn, actor });
    await audit({
      action: "site.status_change",
      entityType: "site",
      entityId: change.after.id,
      before: { status: change.before.status },
      after: { status: change.after.status, effectiveOn: change.effectiveOn, eventId: change.eventId },
    });
    return { site: change.after, effectiveOn: change.effectiveOn };
  },
);
