import "server-only";
import type { Tx } from "@/server/db/client";
import type { Actor } from "@/lib/auth/authorize";
import { notifyVersionReleased } from "@/server/acknowledgements/on-release";

/**
 * Runs inside the release transaction, after the version is released and its parent superseded:
 * whatever must follow a release (acknowledgement requests and their e-mails) commits or fails with it.
 */
export async function onProtocolVersionReleased(tx: Tx, { versionId, actor }: { versionId: string; actor: Pick<Actor, "userId" | "name"> }): Promise<void> {
  await notifyVersionReleased(tx, { versionId, actor });
}
