import "server-only";
import Stripe from "stripe";
import { env } from "@/env";

// The one Stripe client. Network retries are ours, not the SDK's: the worker retries a send later
// under the same idempotency key, so a short in-call retry (1) only rides over a blip.
const globalForStripe = globalThis as unknown as { cairnStripe?: Stripe };

export const STRIPE_TIMEOUT_MS = 10_000;

export function stripeClient(): Stripe {
  if (globalForStripe.cairnStripe) return globalForStripe.cairnStripe;
  const client = new Stripe(env.STRIPE_SECRET_KEY, {
    ...(env.STRIPE_API_HOST ? { host: env.STRIPE_API_HOST, port: env.STRIPE_API_PORT, protocol: env.STRIPE_API_PROTOCOL } : {}),
    maxNetworkRetries: 1,
    timeout: STRIPE_TIMEOUT_MS,
    telemetry: false,
    appInfo: { name: "Cairn" },
  });
  globalForStripe.cairnStripe = client;
  return client;
}

/** Verify a webhook's signature on its raw body (rejects a bad signature or a timestamp over 5 minutes old). */
export function verifyStripeEvent(rawBody: string, signature: string | null): Stripe.Event {
  if (!signature) throw new Error("No Stripe-Signature header");
  return stripeClient().webhooks.constructEvent(rawBody, signature, env.STRIPE_WEBHOOK_SECRET, 300);
}

export type { Stripe };
