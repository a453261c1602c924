import "server-only";
import { and, eq, inArray, isNull } from "drizzle-orm";
import type { Tx } from "@/server/db/client";
import { documents, memberships, sites, users, type Site } from "@/server/db/schema";
import { notFound } from "@/server/api/errors";
import { computeSiteBinder, type BinderDocument, type BinderPerson, type BinderType, type SiteBinder } from "@/lib/binder/readiness";
import { isSiteRole, type Role } from "@/lib/auth/roles";
import type { SiteStatus } from "@/lib/sites/site-status";
import { listDocumentTypes } from "./document-types";

const formatters = new Map<string, Intl.DateTimeFormat>();
/** Today's calendar date at the site (its own time zone). */
export function siteToday(timeZone: string, now: Date = new Date()): string {
  let f = formatters.get(timeZone);
  if (!f) formatters.set(timeZone, (f = new Intl.DateTimeFormat("en-CA", { timeZone, year: "numeric", month: "2-digit", day: "2-digit" })));
  return f.format(now);
}

export function toBinderType(t: { id: string; code: string; name: string; holder: "site" | "person"; appliesToRoles: Role[]; requiredFrom: SiteStatus | null; expires: boolean }): BinderType {
  return { id: t.id, code: t.code, name: t.name, holder: t.holder, appliesToRoles: t.appliesToRoles, requiredFrom: t.requiredFrom, expires: t.expires };
}

/** People holding a site role at each of the given sites (revoked roles excluded). */
export async function loadSitePeople(tx: Tx, { siteIds }: { siteIds: string[] }): Promise<Map<string, BinderPerson[]>> {
  const bySite = new Map<string, Map<string, BinderPerson>>();
  if (siteIds.length === 0) return new Map();
  const rows = await tx
    .select({ siteId: memberships.siteId, userId: users.id, name: users.name, role: memberships.role })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(and(inArray(memberships.siteId, siteIds), isNull(memberships.revokedAt), isNull(users.disabledAt)));
  for (const r of rows) {
    if (!r.siteId || !isSiteRole(r.role)) continue;
    const people = bySite.get(r.siteId) ?? new Map<string, BinderPerson>();
    bySite.set(r.siteId, people);
    const p = people.get(r.userId);
    if (p) (p.roles as Role[]).push(r.role);
    else people.set(r.userId, { userId: r.userId, name: r.name, roles: [r.role] });
  }
  return new Map([...bySite].map(([k, v]) => [k, [...v.values()].sort((a, b) => a.name.localeCompare(b.name))]));
}

export type BinderFile = BinderDocument & { sizeBytes: number; uploaderName: string; supersedesId: string | null; reviewedAt: string | null };

/** Stored binder uploads of the given sites, newest first. */
export async function loadBinderDocuments(tx: Tx, { siteIds }: { siteIds: string[] }): Promise<Map<string, BinderFile[]>> {
  const out = new Map<string, BinderFile[]>();
  if (siteIds.length === 0) return out;
  const rows = await tx
    .select({
      id: documents.id,
      siteId: documents.siteId,
      documentTypeId: documents.documentTypeId,
      personId: documents.personId,
      fileName: documents.fileName,
      sizeBytes: documents.sizeBytes,
      createdAt: documents.createdAt,
      reviewState: documents.reviewState,
      reviewReason: documents.reviewReason,
      reviewedAt: documents.reviewedAt,
      issuedOn: documents.issuedOn,
      expiresOn: documents.expiresOn,
      supersedesId: documents.supersedesId,
      uploaderName: users.name,
    })
    .from(documents)
    .innerJoin(users, eq(users.id, documents.uploaderId))
    .where(and(inArray(documents.siteId, siteIds), eq(documents.state, "stored")));
  for (const r of rows) {
    if (!r.siteId || !r.documentTypeId) continue;
    const list = out.get(r.siteId) ?? [];
    out.set(r.siteId, list);
    list.push({
      ...r,
      documentTypeId: r.documentTypeId,
      createdAt: r.createdAt.toISOString(),
      reviewedAt: r.reviewedAt?.toISOString() ?? null,
      reviewState: r.reviewState ?? "awaiting_review",
    });
  }
  return out;
}

/** A site's binder judged at its own status, or at `status` (the one it is about to move to). */
export async function loadSiteBinder(
  tx: Tx,
  { siteId, status, now = new Date(), installDefaults = true }: { siteId: string; status?: SiteStatus; now?: Date; installDefaults?: boolean },
): Promise<{ site: Site; today: string; binder: SiteBinder }> {
  const site = await tx.query.sites.findFirst({ where: eq(sites.id, siteId) });
  if (!site) throw notFound("That site");
  const types = (await listDocumentTypes(tx, { studyId: site.studyId, installDefaults })).map(toBinderType);
  const people = (await loadSitePeople(tx, { siteIds: [siteId] })).get(siteId) ?? [];
  const docs = (await loadBinderDocuments(tx, { siteIds: [siteId] })).get(siteId) ?? [];
  const today = siteToday(site.timeZone, now);
  return { site, today, binder: computeSiteBinder({ today, status: status ?? site.status, types, people, documents: docs }) };
}
