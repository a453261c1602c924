import "server-only";
import { and, asc, eq, isNull } from "drizzle-orm";
import type { Tx } from "@/server/db/client";
import { binderDocumentTypes, type BinderDocumentTypeRow } from "@/server/db/schema";
import { notFound } from "@/server/api/errors";
import { defaultBinderTypes } from "@/lib/binder/default-types";
import type { BinderTypeInput, BinderTypePatch } from "@/lib/binder/schemas";

/** A study starts from the default checklist: installed the first time its binder is used. */
export async function ensureDefaultTypes(tx: Tx, { studyId }: { studyId: string }) {
  const existing = await tx.select({ id: binderDocumentTypes.id }).from(binderDocumentTypes).where(eq(binderDocumentTypes.studyId, studyId)).limit(1);
  if (existing.length > 0) return;
  await tx
    .insert(binderDocumentTypes)
    .values(defaultBinderTypes.map((t, i) => ({ ...t, studyId, sortOrder: (i + 1) * 10 })))
    .onConflictDoNothing({ target: [binderDocumentTypes.studyId, binderDocumentTypes.code] });
}

export async function listDocumentTypes(
  tx: Tx,
  { studyId, includeRetired = false, installDefaults = true }: { studyId: string; includeRetired?: boolean; installDefaults?: boolean },
): Promise<BinderDocumentTypeRow[]> {
  if (installDefaults) await ensureDefaultTypes(tx, { studyId });
  return tx
    .select()
    .from(binderDocumentTypes)
    .where(and(eq(binderDocumentTypes.studyId, studyId), includeRetired ? undefined : isNull(binderDocumentTypes.retiredAt)))
    .orderBy(asc(binderDocumentTypes.sortOrder), asc(binderDocumentTypes.name));
}

export async function getDocumentType(tx: Tx, { studyId, id }: { studyId: string; id: string }) {
  const row = await tx.query.binderDocumentTypes.findFirst({ where: and(eq(binderDocumentTypes.id, id), eq(binderDocumentTypes.studyId, studyId)) });
  if (!row) throw notFound("That document type");
  return row;
}

export async function getDocumentTypeByCode(tx: Tx, { studyId, code }: { studyId: string; code: string }) {
  await ensureDefaultTypes(tx, { studyId });
  const row = await tx.query.binderDocumentTypes.findFirst({ where: and(eq(binderDocumentTypes.code, code), eq(binderDocumentTypes.studyId, studyId)) });
  if (!row) throw notFound("That document type");
  return row;
}

export async function createDocumentType(tx: Tx, { studyId, input }: { studyId: string; input: BinderTypeInput }) {
  await ensureDefaultTypes(tx, { studyId });
  const [row] = await tx
    .insert(binderDocumentTypes)
    .values({ ...input, studyId, appliesToRoles: input.holder === "person" ? input.appliesToRoles : [] })
    .returning();
  return row!;
}

export async function updateDocumentType(tx: Tx, { studyId, code, patch, now = new Date() }: { studyId: string; code: string; patch: BinderTypePatch; now?: Date }) {
  const before = await getDocumentTypeByCode(tx, { studyId, code });
  const { retired, ...fields } = patch;
  const holder = fields.holder ?? before.holder;
  const [after] = await tx
    .update(binderDocumentTypes)
    .set({
      ...fields,
      ...(holder === "site" ? { appliesToRoles: [] } : {}),
      ...(retired === undefined ? {} : { retiredAt: retired ? (before.retiredAt ?? now) : null }),
      updatedAt: now,
    })
    .where(eq(binderDocumentTypes.id, before.id))
    .returning();
  return { before, after: after! };
}
