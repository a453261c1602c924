import { calendarDaysBetween, isCalendarDate } from "@/lib/visits/calendar-date";
import { siteStatusLabels, siteStatuses, type SiteStatus } from "@/lib/sites/site-status";
import type { Role } from "@/lib/auth/roles";

// A site's essential-documents binder: which documents it must hold at its status, and the state
// of each (per site, or per person for personal records such as CVs and training certificates).
// Pure: the loader gives it the site's types, people, current uploads and today's site date.

/** Days before the expiry date from which a document counts as expiring (issue 8: 60 days). */
export const EXPIRING_WITHIN_DAYS = 60;

export type BinderType = {
  id: string;
  code: string;
  name: string;
  holder: "site" | "person";
  appliesToRoles: readonly Role[];
  /** Required once the site has reached this status; null = optional. */
  requiredFrom: SiteStatus | null;
  expires: boolean;
};

export type BinderPerson = { userId: string; name: string; roles: readonly Role[] };

export type BinderDocument = {
  id: string;
  documentTypeId: string;
  personId: string | null;
  fileName: string;
  /** Upload time (ISO timestamp): the newest stored upload is the current version. */
  createdAt: string;
  reviewState: "awaiting_review" | "accepted" | "rejected";
  reviewReason?: string | null;
  issuedOn: string | null;
  /** Last day of validity (site calendar date). */
  expiresOn: string | null;
};

export const itemStates = ["missing", "rejected", "awaiting_review", "expired", "expiring", "complete"] as const;
export type ItemState = (typeof itemStates)[number];

export const itemStateLabels: Record<ItemState, string> = {
  missing: "Missing",
  rejected: "Rejected",
  awaiting_review: "Awaiting review",
  expired: "Expired",
  expiring: "Expiring",
  complete: "Complete",
};

/** States that keep a required item on the site's to-do list and block opening. */
export const blockingStates: readonly ItemState[] = ["missing", "rejected", "awaiting_review", "expired"];

export type BinderItem = {
  type: BinderType;
  /** The person for a per-person type; null for per-site types (or when nobody holds the role yet). */
  person: { userId: string; name: string } | null;
  required: boolean;
  state: ItemState;
  current: BinderDocument | null;
  /** Earlier uploads for the same item, newest first (still readable). */
  earlier: BinderDocument[];
  /** Days from today to the last valid day (negative once expired); null without an expiry date. */
  daysToExpiry: number | null;
};

export type StateCounts = Record<ItemState, number>;

export type SiteBinder = {
  items: BinderItem[];
  counts: StateCounts;
  /** Required items that are missing, rejected, awaiting review or expired. */
  blocking: BinderItem[];
  /** Required items complete or expiring, out of all required items. */
  readyCount: number;
  requiredCount: number;
};

export const emptyCounts = (): StateCounts => ({ missing: 0, rejected: 0, awaiting_review: 0, expired: 0, expiring: 0, complete: 0 });

const statusIndex = (s: SiteStatus) => siteStatuses.indexOf(s);

export function isRequiredAt(type: Pick<BinderType, "requiredFrom">, status: SiteStatus): boolean {
  return type.requiredFrom !== null && statusIndex(status) >= statusIndex(type.requiredFrom);
}

/** State of one item from its current upload. Review comes first: only accepted files count. */
export function itemState(current: BinderDocument | null, expires: boolean, today: string): { state: ItemState; daysToExpiry: number | null } {
  if (!current) return { state: "missing", daysToExpiry: null };
  const daysToExpiry = expires && current.expiresOn ? calendarDaysBetween(today, current.expiresOn) : null;
  if (current.reviewState === "rejected") return { state: "rejected", daysToExpiry };
  if (current.reviewState === "awaiting_review") return { state: "awaiting_review", daysToExpiry };
  if (daysToExpiry !== null) {
    // Valid through its expiry date; expiring while 0–60 days of validity remain.
    if (daysToExpiry < 0) return { state: "expired", daysToExpiry };
    if (daysToExpiry <= EXPIRING_WITHIN_DAYS) return { state: "expiring", daysToExpiry };
  }
  return { state: "complete", daysToExpiry };
}

export type SiteBinderInput = {
  /** Today at the site (YYYY-MM-DD in the site's time zone). */
  today: string;
  /** The status to judge against: the site's own, or the one it is about to move to. */
  status: SiteStatus;
  types: readonly BinderType[];
  people: readonly BinderPerson[];
  documents: readonly BinderDocument[];
};

export function computeSiteBinder({ today, status, types, people, documents }: SiteBinderInput): SiteBinder {
  if (!isCalendarDate(today)) throw new RangeError(`today must be YYYY-MM-DD, got ${JSON.stringify(today)}`);
  const byItem = new Map<string, BinderDocument[]>();
  for (const d of documents) {
    const key = `${d.documentTypeId}|${d.personId ?? ""}`;
    const list = byItem.get(key);
    if (list) list.push(d);
    else byItem.set(key, [d]);
  }
  for (const list of byItem.values()) list.sort((a, b) => (a.createdAt < b.createdAt ? 1 : a.createdAt > b.createdAt ? -1 : 0));

  const items: BinderItem[] = [];
  for (const type of types) {
    const required = isRequiredAt(type, status);
    const holders: ({ userId: string; name: string } | null)[] =
      type.holder === "site" ? [null] : people.filter((p) => p.roles.some((r) => type.appliesToRoles.includes(r))).map((p) => ({ userId: p.userId, name: p.name }));
    // A per-person requirement with nobody in the role yet is itself a gap.
    if (holders.length === 0) holders.push(null);
    for (const person of holders) {
      const list = type.holder === "person" && !person ? [] : (byItem.get(`${type.id}|${person?.userId ?? ""}`) ?? []);
      const [current = null, ...earlier] = list;
      const { state, daysToExpiry } = itemState(current, type.expires, today);
      items.push({ type, person, required, state, current, earlier, daysToExpiry });
    }
  }
  const counts = emptyCounts();
  for (const item of items) if (item.required || item.current) counts[item.state]++;
  const requiredItems = items.filter((i) => i.required);
  const blocking = requiredItems.filter((i) => blockingStates.includes(i.state));
  return { items, counts, blocking, readyCount: requiredItems.length - blocking.length, requiredCount: requiredItems.length };
}

/** One line per blocking item, for error messages and mail. */
export function describeItem(item: BinderItem): string {
  const whose =
    item.type.holder === "person" ? (item.person ? ` (${item.person.name})` : ` (nobody holds the role ${item.type.appliesToRoles.join(" or ")} yet)`) : "";
  const reason = item.state === "rejected" && item.current?.reviewReason ? `: ${item.current.reviewReason}` : "";
  return `${item.type.name}${whose} — ${itemStateLabels[item.state].toLowerCase()}${reason}`;
}

export const requiredFromLabel = (s: SiteStatus | null) => (s ? `from ${siteStatusLabels[s]}` : "optional");
