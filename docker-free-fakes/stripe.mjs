// Stripe fake: an HTTP stand-in for the parts of the Stripe API that Cairn uses (Connect accounts,
// transfers and reversals, balance, events, webhook endpoints), with signed webhooks and a test
// control API under /_fake. Modules live in ./stripe/.
import { LOOPBACK, closeOnSignals, dataDirFor, envInt, isMain } from "./common.mjs";
import { VERIFICATION_STATES } from "./stripe/accounts.mjs";
import { StripeFake, listen } from "./stripe/server.mjs";

export { signatureHeader } from "./stripe/webhooks.mjs";

export const DEFAULT_STRIPE_PORT = 12111;
export const DEFAULT_WEBHOOK_SECRET = "whsec_cairn_fake_secret";

/**
 * Starts the Stripe fake. port 0 picks a free port. dataDir null keeps state in memory only.
 * @param {import("./stripe.d.mts").StripeFakeOptions} [options]
 */
export async function startStripeFake(options = {}) {
  const port = options.port ?? envInt("STRIPE_FAKE_PORT", DEFAULT_STRIPE_PORT);
  const dataDir = options.dataDir === null ? null : dataDirFor("stripe", options.dataDir);
  const initialAccountState = options.initialAccountState ?? (process.env.STRIPE_FAKE_ACCOUNT_STATE || "pending");
  if (!VERIFICATION_STATES.includes(initialAccountState)) {
    throw new Error(`initial account state must be one of ${VERIFICATION_STATES.join(", ")}, got ${initialAccountState}`);
  }
  const log = options.log ?? ((m) => console.error(`[stripe-fake] ${m}`));
  const fake = new StripeFake({
    dataDir,
    webhookUrl: options.webhookUrl !== undefined ? options.webhookUrl : process.env.STRIPE_FAKE_WEBHOOK_URL || null,
    webhookSecret: options.webhookSecret ?? (process.env.STRIPE_WEBHOOK_SECRET || DEFAULT_WEBHOOK_SECRET),
    initialAccountState,
    startingBalance: options.startingBalance ?? envInt("STRIPE_FAKE_STARTING_BALANCE", 100_000_000_00),
    defaultCurrency: options.defaultCurrency ?? "usd",
    webhookMaxAttempts: options.webhookMaxAttempts ?? envInt("STRIPE_FAKE_WEBHOOK_MAX_ATTEMPTS", 6),
    webhookRetryBaseMs: options.webhookRetryBaseMs ?? envInt("STRIPE_FAKE_WEBHOOK_RETRY_MS", 1000),
    webhookRetryMaxMs: options.webhookRetryMaxMs ?? envInt("STRIPE_FAKE_WEBHOOK_RETRY_MAX_MS", 60_000),
    webhookTimeoutMs: options.webhookTimeoutMs ?? envInt("STRIPE_FAKE_WEBHOOK_TIMEOUT_MS", 10_000),
    autoDeliver: options.autoDeliver ?? process.env.STRIPE_FAKE_WEBHOOK_AUTO !== "0",
    holdMs: options.holdMs ?? envInt("STRIPE_FAKE_HOLD_MS", 120_000),
    log,
  });
  const server = await listen(fake, port);
  const address = server.address();
  const actualPort = typeof address === "object" && address ? address.port : port;
  let closed = false;
  return {
    url: `http://${LOOPBACK}:${actualPort}`,
    port: actualPort,
    host: LOOPBACK,
    dataDir,
    fake,
    async close() {
      if (closed) return;
      closed = true;
      await fake.close();
      server.closeAllConnections();
      await new Promise((resolve) => server.close(() => resolve(undefined)));
    },
  };
}

if (isMain(import.meta.url)) {
  const stripe = await startStripeFake();
  console.log(
    `Stripe fake: ${stripe.url} (control ${stripe.url}/_fake/state) webhooks=${process.env.STRIPE_FAKE_WEBHOOK_URL || "registered endpoints only"} data=${stripe.dataDir}`,
  );
  closeOnSignals([() => stripe.close()]);
}
