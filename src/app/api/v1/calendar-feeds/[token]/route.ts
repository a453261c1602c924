// GET /api/v1/calendar-feeds/:token — a site's visit feed (RFC 5545); the secret address is the credential
import { z } from "zod";
import type { NextRequest } from "next/server";
import { errorResponse } from "@/server/api/route";
import { notFound } from "@/server/api/errors";
import { parseOrThrow } from "@/server/api/authorized";
import { feedTokenPattern, siteFeedForToken } from "@/server/visits/calendar-feed";

const params = z.object({ token: z.string().regex(feedTokenPattern, "Not a calendar address") });

export async function GET(req: NextRequest, ctx: { params: Promise<Record<string, string | string[]>> }): Promise<Response> {
  try {
    const { token } = parseOrThrow(params, await ctx.params, "address");
    const body = await siteFeedForToken(token, { uidDomain: req.nextUrl.hostname || "cairn.invalid" });
    if (body === null) throw notFound("That calendar");
    return new Response(body, { headers: { "content-type": "text/calendar; charset=utf-8", "cache-control": "private, no-store" } });
  } catch (err) {
    return errorResponse(err);
  }
}
