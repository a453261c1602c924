// POST /api/v1/invitations/accept — set a password from an invitation link.
// The one route open to the signed-out: the invitation token is the credential. It still
// validates with zod, answers typed errors and writes the audit trail.
import type { NextRequest } from "next/server";
import { db } from "@/server/db/client";
import { acceptInvitationSchema } from "@/lib/api/schemas";
import { acceptInvitation } from "@/server/people/people";
import { errorResponse, jsonResponse } from "@/server/api/route";
import { parseOrThrow } from "@/server/api/authorized";
import { AppError } from "@/server/api/errors";

export async function POST(req: NextRequest) {
  try {
    let raw: unknown;
    try {
      raw = await req.json();
    } catch {
      throw new AppError("bad_request", "The request body is not valid JSON.");
    }
    const input = parseOrThrow(acceptInvitationSchema, raw, "form");
    const result = await db.transaction((tx) => acceptInvitation(tx, input));
    return jsonResponse({ ok: true, email: result.email });
  } catch (err) {
    return errorResponse(err);
  }
}
