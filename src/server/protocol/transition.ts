import "server-only";
import { and, eq, ne } from "drizzle-orm";
import type { Tx } from "@/server/db/client";
import { protocolVersions, type ProtocolVersion, type ReviewComment } from "@/server/db/schema";
import { AppError, conflict, unprocessable } from "@/server/api/errors";
import type { AuditEntry } from "@/server/audit/record-audit";
import { rolesIn, type Actor } from "@/lib/auth/authorize";
import { hashProtocolContent } from "@/lib/protocol/content-hash";
import { computeRedline, diffVisitSchedules } from "@/lib/protocol/redline";
import { rowsMissingRationale } from "@/lib/protocol/summary-of-changes";
import { checkTransition, protocolTransitions, type TransitionRule } from "@/lib/protocol/workflow";
import { onProtocolVersionReleased } from "./on-released";

export type TransitionAction = TransitionRule["action"];

const auditState = (v: ProtocolVersion) => ({ state: v.state, versionLabel: v.versionLabel, revision: v.revision, contentHash: v.contentHash });

/** Reasons an amendment may not go to review yet (empty: ready). */
export function submissionProblems(version: ProtocolVersion, parent: ProtocolVersion | null): Record<string, string[]> {
  const fields: Record<string, string[]> = {};
  if (!parent) return fields; // the original protocol has no summary of changes
  if (version.substantial === null) fields.substantial = ["Say whether the amendment is substantial."];
  if (!version.substantialReason?.trim()) fields.substantialReason = ["Give the reason the amendment is (or is not) substantial."];
  const changed = computeRedline(parent.content, version.content).hasChanges;
  const visits = diffVisitSchedules(parent.visitSchedule, version.visitSchedule);
  const visitsChanged = visits.added.length + visits.removed.length + visits.changed.length > 0 || visits.orderChanged;
  if (!changed && !visitsChanged) fields._ = ["Nothing has changed since version " + parent.versionLabel + "."];
  if ((changed || visitsChanged) && version.summaryOfChanges.length === 0) fields.summaryOfChanges = ["Fill in the summary of changes (start from the computed differences)."];
  for (const m of rowsMissingRationale(version.summaryOfChanges)) (fields[`summaryOfChanges.${m.index}.rationale`] ??= []).push(m.message);
  return fields;
}

/**
 * One workflow step on a version, with every check of the library's workflow (roles, author ≠
 * approver/releaser, comments on a return). Release freezes the content: its SHA-256 (RFC 8785
 * canonical JSON) is stored, the parent becomes Superseded, and the release hook runs in the same
 * transaction. Each change of state is written to the audit trail by `audit`.
 */
export async function transitionProtocolVersion(
  tx: Tx,
  { versionId, action, actor, comment, audit }: { versionId: string; action: TransitionAction; actor: Actor; comment?: string; audit: (e: AuditEntry) => Promise<void> },
): Promise<ProtocolVersion> {
  const [version] = await tx.select().from(protocolVersions).where(eq(protocolVersions.id, versionId)).for("update");
  if (!version) throw new Error("version vanished");
  const rule = protocolTransitions.find((t) => t.action === action)!;
  const check = checkTransition({ from: version.state, to: rule.to, actorUserId: actor.userId, authorUserId: version.authorId, actorRoles: rolesIn(actor, version.studyId), comment });
  if (!check.ok) {
    if (check.code === "missing_permission" || check.code === "author_cannot_approve") throw new AppError("forbidden", check.message);
    if (check.code === "comment_required") throw unprocessable(check.message, { comment: [check.message] });
    throw conflict(check.message);
  }
  const parent = version.parentId ? ((await tx.select().from(protocolVersions).where(eq(protocolVersions.id, version.parentId)))[0] ?? null) : null;
  const now = new Date();
  const patch: Partial<typeof protocolVersions.$inferInsert> = { state: rule.to, updatedAt: now, revision: version.revision + 1 };

  if (action === "submit") {
    const problems = submissionProblems(version, parent);
    if (Object.keys(problems).length) throw unprocessable(Object.values(problems)[0]![0]!, problems);
    patch.submittedAt = now;
  }
  if (action === "return") {
    const note: ReviewComment = { at: now.toISOString(), byUserId: actor.userId, byName: actor.name, text: comment!.trim() };
    patch.reviewComments = [...version.reviewComments, note];
  }
  if (action === "approve") {
    patch.approvedBy = actor.userId;
    patch.approvedAt = now;
    if (comment?.trim()) patch.reviewComments = [...version.reviewComments, { at: now.toISOString(), byUserId: actor.userId, byName: actor.name, text: comment.trim() }];
  }
  if (action === "release") {
    patch.releasedBy = actor.userId;
    patch.releasedAt = now;
    patch.contentHash = hashProtocolContent({ doc: version.content, visitSchedule: version.visitSchedule });
  }
  const [updated] = await tx.update(protocolVersions).set(patch).where(eq(protocolVersions.id, versionId)).returning();
  await audit({
    action: `protocol_version.${action}`,
    entityType: "protocol_version",
    entityId: versionId,
    before: auditState(version),
    after: { ...auditState(updated!), ...(comment?.trim() ? { comment: comment.trim() } : {}) },
  });

  if (action === "release") {
    // Every other released version of the study (normally just the parent) is superseded.
    const superseded = await tx
      .update(protocolVersions)
      .set({ state: "superseded", updatedAt: now })
      .where(and(eq(protocolVersions.studyId, version.studyId), eq(protocolVersions.state, "released"), ne(protocolVersions.id, versionId)))
      .returning();
    for (const s of superseded)
      await audit({ action: "protocol_version.supersede", entityType: "protocol_version", entityId: s.id, before: { state: "released", versionLabel: s.versionLabel }, after: { state: "superseded", versionLabel: s.versionLabel, supersededBy: updated!.versionLabel } });
    await onProtocolVersionReleased(tx, { versionId, actor });
  }
  return updated!;
}
