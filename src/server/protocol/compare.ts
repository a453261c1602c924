import "server-only";
import { notFound } from "@/server/api/errors";
import type { Tx } from "@/server/db/client";
import { computeRedline, diffVisitSchedules } from "@/lib/protocol/redline";
import { getProtocolVersion, type VersionAudience } from "./queries";

/** Redline between two versions of the same study (from = earlier side, to = later side). */
export async function compareProtocolVersions(tx: Tx, { studyId, fromId, toId, audience }: { studyId: string; fromId: string; toId: string; audience: VersionAudience }) {
  const from = await getProtocolVersion(tx, { versionId: fromId, audience });
  const to = await getProtocolVersion(tx, { versionId: toId, audience });
  if (from.studyId !== studyId || to.studyId !== studyId) throw notFound("That protocol version");
  const meta = (v: typeof from) => ({ id: v.id, versionLabel: v.versionLabel, state: v.state, contentHash: v.contentHash, releasedAt: v.releasedAt, revision: v.revision });
  return { from: meta(from), to: meta(to), redline: computeRedline(from.content, to.content), visits: diffVisitSchedules(from.visitSchedule, to.visitSchedule) };
}
