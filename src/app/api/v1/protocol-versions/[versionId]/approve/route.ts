// POST /api/v1/protocol-versions/:versionId/approve — the reviewer (not the author) approves a version
import { transitionRoute } from "@/server/protocol/transition-route";

export const POST = transitionRoute("approve", "protocol.review");
