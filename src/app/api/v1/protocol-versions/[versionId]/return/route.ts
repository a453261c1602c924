// POST /api/v1/protocol-versions/:versionId/return — the reviewer sends a version back with comments
import { transitionRoute } from "@/server/protocol/transition-route";

export const POST = transitionRoute("return", "protocol.review");
