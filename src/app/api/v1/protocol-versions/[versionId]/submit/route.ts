// POST /api/v1/protocol-versions/:versionId/submit — the writer sends a draft for review
import { transitionRoute } from "@/server/protocol/transition-route";

export const POST = transitionRoute("submit", "protocol.write");
