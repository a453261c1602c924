import "server-only";
import type { Tx } from "@/server/db/client";
import { unprocessable } from "@/server/api/errors";
import { describeItem } from "@/lib/binder/readiness";
import { loadSiteBinder } from "./load-site-binder";

/**
 * The start-up gate: a site may move to Open only when every document Open requires is held,
 * accepted and in date. Throws `unprocessable` listing what is still missing. A study whose binder
 * was never opened gets the default checklist first, so no site opens without one.
 */
export async function assertSiteReadyToOpen(tx: Tx, { siteId, now = new Date() }: { siteId: string; now?: Date }) {
  const { site, binder } = await loadSiteBinder(tx, { siteId, status: "open", now, installDefaults: true });
  if (binder.blocking.length === 0) return;
  const lines = binder.blocking.map(describeItem);
  throw unprocessable(`Site ${site.code} cannot open until its essential documents are complete: ${lines.join("; ")}.`, { documents: lines });
}
