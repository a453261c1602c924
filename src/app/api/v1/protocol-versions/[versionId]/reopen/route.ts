// POST /api/v1/protocol-versions/:versionId/reopen — the writer takes a returned version back as a draft
import { transitionRoute } from "@/server/protocol/transition-route";

export const POST = transitionRoute("reopen", "protocol.write");
