import "server-only";
import type { Tx } from "@/server/db/client";

/**
 * Runs inside the release transaction, after the version is released and its parent superseded:
 * whatever must follow a release (acknowledgement requests) commits or fails with it.
 */
export async function onProtocolVersionReleased(tx: Tx, { versionId }: { versionId: string }): Promise<void> {
  // TODO(acknowledgements): call notifyVersionReleased(tx, { versionId }) from
  // "@/server/acknowledgements/on-release" once that module exists.
  void tx;
  void versionId;
}
