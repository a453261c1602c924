import "server-only";
import { and, eq, sql } from "drizzle-orm";
import type { Tx } from "@/server/db/client";
import { protocolVersions, type ProtocolVersion } from "@/server/db/schema";
import { unprocessable } from "@/server/api/errors";
import type { SaveDraftInput } from "@/lib/protocol/api-schemas";
import { sanitizeProtocolDoc } from "@/lib/protocol/sanitize";
import { nextVersionLabel } from "@/lib/protocol/version-label";

export type SaveDraftResult = { ok: true; version: ProtocolVersion; before: ProtocolVersion } | { ok: false; current: ProtocolVersion };

/**
 * Save a draft with an optimistic check: the UPDATE matches only the revision the edit was based
 * on, so of two saves from the same base the second matches nothing (PostgreSQL re-checks the
 * WHERE after the first commits) and gets the current version back instead of overwriting it.
 */
export async function saveProtocolDraft(tx: Tx, { versionId, input }: { versionId: string; input: SaveDraftInput }): Promise<SaveDraftResult> {
  const [current] = await tx.select().from(protocolVersions).where(eq(protocolVersions.id, versionId)).for("update");
  if (!current) throw new Error("version vanished"); // the scope resolver found it
  if (current.state !== "draft")
    throw unprocessable(`Version ${current.versionLabel} is ${current.state.replace("_", " ")}: only a draft can be edited.${current.state === "returned" ? " Reopen it as a draft first." : ""}`);
  if (current.revision !== input.baseRevision) return { ok: false, current };

  const patch: Partial<typeof protocolVersions.$inferInsert> = {};
  if (input.title !== undefined) patch.title = input.title;
  if (input.content !== undefined) patch.content = sanitizeProtocolDoc(input.content);
  if (input.visitSchedule !== undefined) patch.visitSchedule = input.visitSchedule;
  if (input.summaryOfChanges !== undefined) patch.summaryOfChanges = input.summaryOfChanges;
  if (input.substantialReason !== undefined) patch.substantialReason = input.substantialReason;
  if (input.substantial !== undefined && current.parentId) {
    patch.substantial = input.substantial;
    if (input.substantial !== current.substantial) {
      const [parent] = await tx.select({ label: protocolVersions.versionLabel }).from(protocolVersions).where(eq(protocolVersions.id, current.parentId));
      patch.versionLabel = nextVersionLabel(parent!.label, input.substantial);
    }
  }
  const [saved] = await tx
    .update(protocolVersions)
    .set({ ...patch, revision: sql`${protocolVersions.revision} + 1`, updatedAt: new Date() })
    .where(and(eq(protocolVersions.id, versionId), eq(protocolVersions.revision, input.baseRevision), eq(protocolVersions.state, "draft")))
    .returning();
  if (!saved) {
    const [now] = await tx.select().from(protocolVersions).where(eq(protocolVersions.id, versionId));
    return { ok: false, current: now! };
  }
  return { ok: true, version: saved, before: current };
}
