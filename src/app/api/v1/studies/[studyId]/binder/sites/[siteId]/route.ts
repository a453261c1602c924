// GET /api/v1/studies/:studyId/binder/sites/:siteId — one site's binder: items, versions and readiness
import { z } from "zod";
import { apiRoute } from "@/server/api/route";
import { idSchema } from "@/lib/api/schemas";
import { getSiteById } from "@/server/studies/queries";
import { notFound } from "@/server/api/errors";
import { loadSiteBinder } from "@/server/binder/load-site-binder";
import { listDocumentTypes } from "@/server/binder/document-types";

export const GET = apiRoute(
  {
    permission: "documents.read",
    params: z.object({ studyId: idSchema, siteId: idSchema }),
    scope: async ({ params }, tx) => {
      const site = await getSiteById(tx, { siteId: params.siteId });
      if (site.studyId !== params.studyId) throw notFound("That site");
      return { studyId: site.studyId, siteId: site.id };
    },
  },
  async ({ tx, input }) => {
    const { site, today, binder } = await loadSiteBinder(tx, { siteId: input.params.siteId });
    const types = await listDocumentTypes(tx, { studyId: site.studyId });
    const validity = new Map(types.map((t) => [t.id, { validityMonths: t.validityMonths, reference: t.reference }]));
    return {
      site: { id: site.id, code: site.code, name: site.name, status: site.status, timeZone: site.timeZone },
      today,
      counts: binder.counts,
      readyCount: binder.readyCount,
      requiredCount: binder.requiredCount,
      items: binder.items.map((i) => ({ ...i, type: { ...i.type, ...validity.get(i.type.id) } })),
    };
  },
);
