import "server-only";
import { createHash, randomBytes } from "node:crypto";
import { and, asc, eq, gt, isNull } from "drizzle-orm";
import { env } from "@/env";
import type { Tx } from "@/server/db/client";
import { invitations, memberships, sites, users } from "@/server/db/schema";
import { AppError, conflict, notFound, unprocessable } from "@/server/api/errors";
import { enqueueMail } from "@/server/mail/enqueue-mail";
import { hashPassword } from "@/server/auth/password";
import { recordAudit } from "@/server/audit/record-audit";
import { requestForJoinedInvestigators } from "@/server/acknowledgements/joined-investigators";
import { isSiteRole, roleLabels, type Role } from "@/lib/auth/roles";
import type { Actor } from "@/lib/auth/authorize";

export const INVITATION_DAYS = 7;
const sha256 = (s: string) => createHash("sha256").update(s).digest("hex");

export async function listPeopleForStudy(tx: Tx, { studyId, siteIds }: { studyId: string; siteIds: "all" | string[] }) {
  const rows = await tx
    .select({
      membershipId: memberships.id,
      userId: users.id,
      name: users.name,
      email: users.email,
      role: memberships.role,
      siteId: memberships.siteId,
      siteCode: sites.code,
      grantedAt: memberships.grantedAt,
      hasPassword: users.passwordHash,
    })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .leftJoin(sites, eq(sites.id, memberships.siteId))
    .where(and(eq(memberships.studyId, studyId), isNull(memberships.revokedAt)))
    .orderBy(asc(users.name), asc(memberships.role));
  return rows
    .filter((r) => siteIds === "all" || (r.siteId !== null && siteIds.includes(r.siteId)))
    .map(({ hasPassword, ...r }) => ({ ...r, invitationPending: !hasPassword }));
}

async function assertSiteRoleScope(tx: Tx, { studyId, role, siteId }: { studyId: string; role: Role; siteId: string | null }) {
  if (isSiteRole(role) && !siteId) throw unprocessable(`${roleLabels[role]} is a site role: choose the site.`, { siteId: ["Required for this role"] });
  if (siteId) {
    const site = await tx.query.sites.findFirst({ where: and(eq(sites.id, siteId), eq(sites.studyId, studyId)) });
    if (!site) throw notFound("That site");
  }
}

export async function grantRole(
  tx: Tx,
  { actor, studyId, userId, role, siteId }: { actor: Actor; studyId: string; userId: string; role: Role; siteId: string | null },
) {
  await assertSiteRoleScope(tx, { studyId, role, siteId });
  const user = await tx.query.users.findFirst({ where: eq(users.id, userId) });
  if (!user) throw notFound("That person");
  const existing = await tx.query.memberships.findFirst({
    where: and(
      eq(memberships.userId, userId),
      eq(memberships.studyId, studyId),
      eq(memberships.role, role),
      siteId ? eq(memberships.siteId, siteId) : isNull(memberships.siteId),
      isNull(memberships.revokedAt),
    ),
  });
  if (existing) throw conflict(`${user.name} already holds this role${siteId ? " at that site" : ""}.`);
  const [row] = await tx.insert(memberships).values({ userId, studyId, siteId, role, grantedBy: actor.userId }).returning();
  // An investigator who joins a site is asked at once to acknowledge the version in force there.
  if (role === "investigator") await requestForJoinedInvestigators(tx, { now: new Date(), studyId });
  return row!;
}

export async function revokeRole(tx: Tx, { actor, studyId, membershipId }: { actor: Actor; studyId: string; membershipId: string }) {
  const row = await tx.query.memberships.findFirst({ where: and(eq(memberships.id, membershipId), eq(memberships.studyId, studyId)) });
  if (!row) throw notFound("That role assignment");
  if (row.revokedAt) throw conflict("That role was already revoked.");
  if (row.userId === actor.userId && row.role === "sponsor_admin") {
    throw unprocessable("You cannot revoke your own administrator role; ask another administrator.");
  }
  const [updated] = await tx
    .update(memberships)
    .set({ revokedAt: new Date(), revokedBy: actor.userId })
    .where(eq(memberships.id, membershipId))
    .returning();
  return { before: row, after: updated! };
}

/**
 * Invite a person by e-mail: creates the account (without a password) if new, grants the role,
 * and queues an e-mail with a link to set a password, valid INVITATION_DAYS days.
 */
export async function invitePerson(
  tx: Tx,
  { actor, studyId, email, name, role, siteId }: { actor: Actor; studyId: string; email: string; name: string; role: Role; siteId: string | null },
) {
  await assertSiteRoleScope(tx, { studyId, role, siteId });
  let user = await tx.query.users.findFirst({ where: eq(users.email, email) });
  if (!user) [user] = await tx.insert(users).values({ email, name }).returning();
  const membership = await grantRole(tx, { actor, studyId, userId: user!.id, role, siteId });
  let invitationSent = false;
  if (!user!.passwordHash) {
    const token = randomBytes(32).toString("base64url");
    const expiresAt = new Date(Date.now() + INVITATION_DAYS * 86_400_000);
    const [inv] = await tx.insert(invitations).values({ userId: user!.id, tokenHash: sha256(token), expiresAt, createdBy: actor.userId }).returning();
    const link = `${env.NEXTAUTH_URL}/invitation/${token}`;
    await enqueueMail(tx, {
      dedupeKey: `invitation:${inv!.id}`,
      to: email,
      subject: "You are invited to Cairn",
      text: `${actor.name} invited you to Cairn as ${roleLabels[role]}.\n\nSet your password here (the link expires in ${INVITATION_DAYS} days):\n${link}\n`,
    });
    invitationSent = true;
  }
  return { user: user!, membership, invitationSent };
}

/** Set the password from an invitation link. Unauthenticated by nature: the token is the credential. */
export async function acceptInvitation(tx: Tx, { token, password }: { token: string; password: string }) {
  const inv = await tx.query.invitations.findFirst({
    where: and(eq(invitations.tokenHash, sha256(token)), isNull(invitations.usedAt), gt(invitations.expiresAt, new Date())),
  });
  if (!inv) throw new AppError("gone", "This invitation link has expired or was already used. Ask your administrator for a new one.");
  const passwordHash = await hashPassword(password);
  await tx.update(users).set({ passwordHash }).where(eq(users.id, inv.userId));
  await tx.update(invitations).set({ usedAt: new Date() }).where(eq(invitations.id, inv.id));
  const user = await tx.query.users.findFirst({ where: eq(users.id, inv.userId) });
  await recordAudit(tx, { userId: inv.userId, name: user!.name }, { action: "invitation.accepted", entityType: "user", entityId: inv.userId });
  return { email: user!.email };
}

/** People with a role in the study who have not yet set a password from their invitation. */
export async function listPendingInvitations(tx: Tx, { studyId }: { studyId: string }) {
  return tx
    .selectDistinct({ name: users.name, email: users.email })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(and(eq(memberships.studyId, studyId), isNull(memberships.revokedAt), isNull(users.passwordHash)));
}
