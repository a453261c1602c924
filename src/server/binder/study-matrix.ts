import "server-only";
import type { Tx } from "@/server/db/client";
import { computeSiteBinder, type SiteBinder } from "@/lib/binder/readiness";
import { buildMatrix } from "@/lib/binder/matrix";
import { listSitesForStudy } from "@/server/studies/queries";
import { listDocumentTypes } from "./document-types";
import { loadBinderDocuments, loadSitePeople, siteToday, toBinderType } from "./load-site-binder";

/** Every visible site's binder and the sites × document types matrix. */
export async function loadStudyBinders(tx: Tx, { studyId, siteIds, now = new Date() }: { studyId: string; siteIds: "all" | string[]; now?: Date }) {
  const typeRows = await listDocumentTypes(tx, { studyId });
  const types = typeRows.map(toBinderType);
  const siteRows = await listSitesForStudy(tx, { studyId, siteIds });
  const ids = siteRows.map((s) => s.id);
  const people = await loadSitePeople(tx, { siteIds: ids });
  const docs = await loadBinderDocuments(tx, { siteIds: ids });
  const binders: { site: (typeof siteRows)[number]; today: string; binder: SiteBinder }[] = siteRows.map((site) => {
    const today = siteToday(site.timeZone, now);
    return { site, today, binder: computeSiteBinder({ today, status: site.status, types, people: people.get(site.id) ?? [], documents: docs.get(site.id) ?? [] }) };
  });
  const rows = buildMatrix(
    binders.map((b) => ({ id: b.site.id, code: b.site.code, name: b.site.name, status: b.site.status, binder: b.binder })),
    types.map((t) => t.id),
  );
  return { types: typeRows, binders, rows };
}
