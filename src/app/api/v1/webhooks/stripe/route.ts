// POST /api/v1/webhooks/stripe — Stripe's signed events (authenticated by signature, not by session)
import type { NextRequest } from "next/server";
import { z } from "zod";
import { errorResponse, jsonResponse } from "@/server/api/route";
import { AppError } from "@/server/api/errors";
import { verifyStripeEvent } from "@/server/stripe/client";
import { applyStripeEvent } from "@/server/payments/stripe-events";

// Outside apiRoute on purpose (as invitations are): Stripe has no session. The signature is
// checked on the raw body first; the event's shape is then validated; each change is audited.
const eventShape = z.object({
  id: z.string().regex(/^evt_/, "not an event id"),
  type: z.string().min(1),
  created: z.number().int(),
  data: z.object({ object: z.record(z.string(), z.unknown()) }),
});

export async function POST(req: NextRequest): Promise<Response> {
  const raw = await req.text();
  let event;
  try {
    event = verifyStripeEvent(raw, req.headers.get("stripe-signature"));
  } catch (err) {
    return errorResponse(new AppError("bad_request", `Webhook signature rejected: ${(err as Error).message}`));
  }
  const shape = eventShape.safeParse(event);
  if (!shape.success) return errorResponse(new AppError("bad_request", "The event is not shaped like a Stripe event."));
  try {
    const outcome = await applyStripeEvent(event);
    return jsonResponse({ received: true, outcome });
  } catch (err) {
    // A 5xx makes Stripe deliver again later; the event id was not stored, so it will apply then.
    return errorResponse(err);
  }
}
