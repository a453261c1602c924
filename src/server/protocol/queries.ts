import "server-only";
import { and, asc, desc, eq, inArray } from "drizzle-orm";
import { alias } from "drizzle-orm/pg-core";
import type { Tx } from "@/server/db/client";
import { protocolVersions, users, type ProtocolVersion } from "@/server/db/schema";
import { notFound } from "@/server/api/errors";
import { compareVersionLabels } from "@/lib/protocol/version-label";
import { checkTransition, protocolTransitions } from "@/lib/protocol/workflow";

// Reads of protocol versions. Site people (whose protocol.read is held at sites only) see released
// and superseded versions; drafts and versions under review are the sponsor's working copies.
export const publishedStates = ["released", "superseded"] as const;

export type VersionAudience = "all" | "published";

/** Audience from the sites the actor may read the protocol at: study-wide readers see everything. */
export const audienceFor = (siteIds: "all" | string[]): VersionAudience => (siteIds === "all" ? "all" : "published");

const approver = alias(users, "approver");
const releaser = alias(users, "releaser");

export type ProtocolVersionSummary = Omit<ProtocolVersion, "content" | "visitSchedule" | "summaryOfChanges"> & {
  authorName: string;
  approverName: string | null;
  releaserName: string | null;
};

const summaryColumns = {
  id: protocolVersions.id,
  studyId: protocolVersions.studyId,
  parentId: protocolVersions.parentId,
  versionLabel: protocolVersions.versionLabel,
  amendmentNumber: protocolVersions.amendmentNumber,
  state: protocolVersions.state,
  title: protocolVersions.title,
  substantial: protocolVersions.substantial,
  substantialReason: protocolVersions.substantialReason,
  reviewComments: protocolVersions.reviewComments,
  revision: protocolVersions.revision,
  contentHash: protocolVersions.contentHash,
  authorId: protocolVersions.authorId,
  createdAt: protocolVersions.createdAt,
  updatedAt: protocolVersions.updatedAt,
  submittedAt: protocolVersions.submittedAt,
  approvedBy: protocolVersions.approvedBy,
  approvedAt: protocolVersions.approvedAt,
  releasedBy: protocolVersions.releasedBy,
  releasedAt: protocolVersions.releasedAt,
  authorName: users.name,
  approverName: approver.name,
  releaserName: releaser.name,
};

/** Versions of a study, newest label first. */
export async function listProtocolVersions(tx: Tx, { studyId, audience = "all" }: { studyId: string; audience?: VersionAudience }): Promise<ProtocolVersionSummary[]> {
  const rows = await tx
    .select(summaryColumns)
    .from(protocolVersions)
    .innerJoin(users, eq(users.id, protocolVersions.authorId))
    .leftJoin(approver, eq(approver.id, protocolVersions.approvedBy))
    .leftJoin(releaser, eq(releaser.id, protocolVersions.releasedBy))
    .where(and(eq(protocolVersions.studyId, studyId), audience === "published" ? inArray(protocolVersions.state, [...publishedStates]) : undefined))
    .orderBy(desc(protocolVersions.createdAt));
  return rows.sort((a, b) => compareVersionLabels(b.versionLabel, a.versionLabel));
}

export type ProtocolVersionDetail = ProtocolVersion & { authorName: string; approverName: string | null; releaserName: string | null; parentLabel: string | null };

export async function getProtocolVersion(tx: Tx, { versionId, audience = "all" }: { versionId: string; audience?: VersionAudience }): Promise<ProtocolVersionDetail> {
  const parent = alias(protocolVersions, "parent");
  const [row] = await tx
    .select({ v: protocolVersions, authorName: users.name, approverName: approver.name, releaserName: releaser.name, parentLabel: parent.versionLabel })
    .from(protocolVersions)
    .innerJoin(users, eq(users.id, protocolVersions.authorId))
    .leftJoin(approver, eq(approver.id, protocolVersions.approvedBy))
    .leftJoin(releaser, eq(releaser.id, protocolVersions.releasedBy))
    .leftJoin(parent, eq(parent.id, protocolVersions.parentId))
    .where(eq(protocolVersions.id, versionId));
  if (!row || (audience === "published" && !(publishedStates as readonly string[]).includes(row.v.state))) throw notFound("That protocol version");
  return { ...row.v, authorName: row.authorName, approverName: row.approverName, releaserName: row.releaserName, parentLabel: row.parentLabel };
}

/** The study of a version (scope resolver of /protocol-versions/:versionId routes). */
export async function studyIdOfVersion(tx: Tx, { versionId }: { versionId: string }): Promise<string> {
  const [row] = await tx.select({ studyId: protocolVersions.studyId }).from(protocolVersions).where(eq(protocolVersions.id, versionId));
  if (!row) throw notFound("That protocol version");
  return row.studyId;
}

/** The released version in force for the study as a whole (the newest release), or null. */
export async function getVersionInForce(tx: Tx, { studyId }: { studyId: string }): Promise<ProtocolVersion | null> {
  const [row] = await tx
    .select()
    .from(protocolVersions)
    .where(and(eq(protocolVersions.studyId, studyId), eq(protocolVersions.state, "released")))
    .orderBy(desc(protocolVersions.releasedAt))
    .limit(1);
  return row ?? null;
}

/** The version being worked on (draft, in review, returned or approved), if any: there is at most one. */
export async function getOpenVersion(tx: Tx, { studyId }: { studyId: string }): Promise<ProtocolVersion | null> {
  const [row] = await tx
    .select()
    .from(protocolVersions)
    .where(and(eq(protocolVersions.studyId, studyId), inArray(protocolVersions.state, ["draft", "in_review", "returned", "approved"])))
    .orderBy(asc(protocolVersions.createdAt))
    .limit(1);
  return row ?? null;
}

/** Drafts by an author and versions awaiting review, for the home panel. */
export async function listOpenWork(tx: Tx, { studyId }: { studyId: string }) {
  return tx
    .select({ id: protocolVersions.id, versionLabel: protocolVersions.versionLabel, state: protocolVersions.state, authorId: protocolVersions.authorId, authorName: users.name, updatedAt: protocolVersions.updatedAt, amendmentNumber: protocolVersions.amendmentNumber })
    .from(protocolVersions)
    .innerJoin(users, eq(users.id, protocolVersions.authorId))
    .where(and(eq(protocolVersions.studyId, studyId), inArray(protocolVersions.state, ["draft", "in_review", "returned", "approved"])))
    .orderBy(desc(protocolVersions.updatedAt));
}

/** Workflow steps the actor could take on a version now (comments aside). */
export function permittedActions(version: Pick<ProtocolVersion, "state" | "authorId" | "studyId">, actor: { userId: string; memberships: { studyId: string; siteId: string | null; role: string }[] }) {
  const roles = actor.memberships.filter((m) => m.studyId === version.studyId && m.siteId === null).map((m) => m.role);
  return protocolTransitions
    .filter((t) => t.from === version.state)
    .filter((t) => {
      const r = checkTransition({ from: version.state, to: t.to, actorUserId: actor.userId, authorUserId: version.authorId, actorRoles: roles, comment: "x" });
      return r.ok;
    })
    .map((t) => t.action);
}
