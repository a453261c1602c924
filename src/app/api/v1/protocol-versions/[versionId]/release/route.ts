// POST /api/v1/protocol-versions/:versionId/release — release an approved version: supersedes its parent, freezes and hashes the content
import { transitionRoute } from "@/server/protocol/transition-route";

export const POST = transitionRoute("release", "protocol.release");
