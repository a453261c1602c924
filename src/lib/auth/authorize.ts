import { roleHasPermission, type Permission, type Role } from "./roles";

// Pure authorisation decisions, shared by the route-handler wrapper, server actions and pages.

export type ActorMembership = { studyId: string; siteId: string | null; role: Role };
export type Actor = { userId: string; email: string; name: string; memberships: ActorMembership[] };
export type Scope = { studyId: string; siteId?: string | null };

/** Memberships of the actor in a study that carry the permission. */
function grantsIn(actor: Actor, permission: Permission, studyId: string) {
  return actor.memberships.filter((m) => m.studyId === studyId && roleHasPermission(m.role, permission));
}

/**
 * May the actor use `permission` on something in `scope`?
 * A site-level resource (siteId given) is allowed by a study-wide grant or a grant at that site.
 * A study-level resource (no siteId) needs a study-wide grant.
 */
export function can(actor: Actor, permission: Permission, scope: Scope): boolean {
  const grants = grantsIn(actor, permission, scope.studyId);
  if (scope.siteId) return grants.some((m) => m.siteId === null || m.siteId === scope.siteId);
  return grants.some((m) => m.siteId === null);
}

/** Does the actor hold the permission anywhere in the study (at some site or study-wide)? */
export function canSomewhere(actor: Actor, permission: Permission, studyId: string): boolean {
  return grantsIn(actor, permission, studyId).length > 0;
}

/** Sites whose data the actor may see with this permission: "all" or a list of site ids. */
export function accessibleSiteIds(actor: Actor, permission: Permission, studyId: string): "all" | string[] {
  const grants = grantsIn(actor, permission, studyId);
  if (grants.some((m) => m.siteId === null)) return "all";
  return [...new Set(grants.map((m) => m.siteId).filter((s): s is string => s !== null))];
}

export function rolesIn(actor: Actor, studyId: string, siteId?: string | null): Role[] {
  return [
    ...new Set(
      actor.memberships
        .filter((m) => m.studyId === studyId && (siteId === undefined || m.siteId === null || m.siteId === siteId))
        .map((m) => m.role),
    ),
  ];
}

export function studyIdsOf(actor: Actor): string[] {
  return [...new Set(actor.memberships.map((m) => m.studyId))];
}
