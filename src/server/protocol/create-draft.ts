import "server-only";
import { and, count, eq, inArray, isNotNull } from "drizzle-orm";
import type { Tx } from "@/server/db/client";
import { protocolVersions } from "@/server/db/schema";
import { conflict } from "@/server/api/errors";
import type { Actor } from "@/lib/auth/authorize";
import { nextAmendmentNumber, nextVersionLabel } from "@/lib/protocol/version-label";
import type { ProtocolDoc } from "@/lib/protocol/types";
import { getOpenVersion, getVersionInForce } from "./queries";

const emptyDoc: ProtocolDoc = { type: "doc", content: [{ type: "heading", attrs: { level: 1 }, content: [{ type: "text", text: "Introduction" }] }, { type: "paragraph" }] };

/**
 * A new version as a copy of the version in force (or the first version, 1.0, when none is
 * released yet). Only one version may be open at a time: a second writer would fork the text.
 */
export async function createProtocolDraft(tx: Tx, { studyId, actor, substantial }: { studyId: string; actor: Actor; substantial: boolean }) {
  const open = await getOpenVersion(tx, { studyId });
  if (open) throw conflict(`Version ${open.versionLabel} is already being worked on (${open.state.replace("_", " ")}); finish or release it before starting another.`);
  const parent = await getVersionInForce(tx, { studyId });
  const [{ n }] = (await tx
    .select({ n: count() })
    .from(protocolVersions)
    .where(and(eq(protocolVersions.studyId, studyId), isNotNull(protocolVersions.amendmentNumber), inArray(protocolVersions.state, ["released", "superseded"])))) as [{ n: number }];
  const [row] = await tx
    .insert(protocolVersions)
    .values({
      studyId,
      parentId: parent?.id ?? null,
      versionLabel: nextVersionLabel(parent?.versionLabel ?? null, substantial),
      amendmentNumber: nextAmendmentNumber(parent?.versionLabel ?? null, n),
      state: "draft",
      title: parent?.title ?? "Clinical investigation plan",
      substantial: parent ? substantial : null,
      content: parent?.content ?? emptyDoc,
      visitSchedule: parent?.visitSchedule ?? [],
      authorId: actor.userId,
    })
    .returning();
  return row!;
}
