// Webhooks from the Stripe fake: signed like Stripe (checked with the official SDK's verifier),
// retried with back-off, and the delivery faults (duplicate, out of order, failed transfer).
import fs from "node:fs";
import Stripe from "stripe";
import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import { startStripeFake, type StripeFakeHandle } from "../../../docker-free-fakes/stripe.mjs";
import { control, eventually, startWebhookReceiver, tempDir } from "./helpers";

const SECRET = "whsec_test_receiver_secret";
let fake: StripeFakeHandle;
let receiver: Awaited<ReturnType<typeof startWebhookReceiver>>;
let stripe: Stripe;

type Delivery = { event_id: string; event_type: string; status: string; attempts: { status?: number; error?: string }[]; endpoint_id: string };
const deliveries = () => control<Delivery[]>(fake.url, "GET", "/_fake/deliveries");
const flush = () => control<{ attempted: Delivery[]; pending: number }>(fake.url, "POST", "/_fake/webhooks/flush");
const events = () => receiver.received.map((r) => JSON.parse(r.body) as Stripe.Event);

async function verifiedAccount(metadata: Record<string, string> = {}) {
  const account = await stripe.accounts.create({ type: "custom", metadata });
  await control(fake.url, "POST", `/_fake/accounts/${account.id}/verification`, { state: "verified" });
  return account;
}

beforeAll(async () => {
  receiver = await startWebhookReceiver();
  fake = await startStripeFake({
    port: 0,
    dataDir: null,
    webhookUrl: receiver.url,
    webhookSecret: SECRET,
    initialAccountState: "pending",
    startingBalance: 100_000_000,
    // Tests flush the queue themselves, except where automatic delivery is under test.
    autoDeliver: false,
    webhookMaxAttempts: 3,
    webhookRetryBaseMs: 20,
    webhookRetryMaxMs: 100,
    log: () => {},
  });
  stripe = new Stripe("sk_test_cairn_webhooks", { host: "127.0.0.1", port: fake.port, protocol: "http", telemetry: false, maxNetworkRetries: 0 });
});

afterAll(async () => {
  await fake?.close();
  await receiver?.close();
});

beforeEach(async () => {
  await control(fake.url, "POST", "/_fake/webhooks/auto", { enabled: false });
  await control(fake.url, "POST", "/_fake/reset");
  receiver.clear();
});

describe("signatures", () => {
  it("signs each delivery so that stripe.webhooks.constructEvent accepts it, and rejects a tampered copy", async () => {
    const account = await verifiedAccount();
    const t = await stripe.transfers.create({ amount: 2_000, currency: "usd", destination: account.id, metadata: { run: "run-9" } });
    await flush();
    const created = receiver.received.find((r) => JSON.parse(r.body).type === "transfer.created");
    expect(created).toBeDefined();
    // The official SDK's verifier is the reference for Stripe's signing scheme.
    const event = stripe.webhooks.constructEvent(created!.body, created!.signature, SECRET);
    expect(event.type).toBe("transfer.created");
    expect((event.data.object as Stripe.Transfer).id).toBe(t.id);
    expect((event.data.object as Stripe.Transfer).metadata).toEqual({ run: "run-9" });

    const tampered = created!.body.replace('"amount": 2000', '"amount": 2001');
    expect(tampered).not.toBe(created!.body);
    expect(() => stripe.webhooks.constructEvent(tampered, created!.signature, SECRET)).toThrow(Stripe.errors.StripeSignatureVerificationError);
    expect(() => stripe.webhooks.constructEvent(created!.body, created!.signature, "whsec_some_other_secret")).toThrow(
      Stripe.errors.StripeSignatureVerificationError,
    );
  });

  it("delivers to a registered endpoint with that endpoint's own secret", async () => {
    const second = await startWebhookReceiver();
    try {
      const endpoint = await stripe.webhookEndpoints.create({ url: second.url, enabled_events: ["transfer.created"] });
      expect(endpoint.secret).toMatch(/^whsec_/);
      expect((await stripe.webhookEndpoints.list()).data.map((e) => e.id)).toEqual([endpoint.id]);
      expect((await stripe.webhookEndpoints.retrieve(endpoint.id)).url).toBe(second.url);
      const account = await verifiedAccount();
      await stripe.transfers.create({ amount: 10, currency: "usd", destination: account.id });
      await flush();
      // account.updated is not among the endpoint's enabled events.
      expect(second.received.map((r) => JSON.parse(r.body).type)).toEqual(["transfer.created"]);
      const only = second.received[0]!;
      expect(stripe.webhooks.constructEvent(only.body, only.signature, endpoint.secret!).type).toBe("transfer.created");
      expect(() => stripe.webhooks.constructEvent(only.body, only.signature, SECRET)).toThrow();
    } finally {
      await second.close();
    }
  });
});

describe("event types", () => {
  it("emits account.updated, transfer.created, transfer.updated and transfer.reversed, each listed by /v1/events", async () => {
    const account = await verifiedAccount({ site: "site-11" });
    const t = await stripe.transfers.create({ amount: 5_000, currency: "usd", destination: account.id });
    await stripe.transfers.update(t.id, { metadata: { confirmed: "no" } });
    await stripe.transfers.createReversal(t.id, { amount: 1_000 });
    await flush();
    expect(events().map((e) => e.type)).toEqual(["account.updated", "transfer.created", "transfer.updated", "transfer.reversed"]);
    const accountEvent = events()[0]!;
    expect((accountEvent.data.object as Stripe.Account).charges_enabled).toBe(true);
    expect(accountEvent.data.previous_attributes).toMatchObject({ charges_enabled: false });
    const reversedEvent = events()[3]!;
    expect((reversedEvent.data.object as Stripe.Transfer).amount_reversed).toBe(1_000);

    const listed = await stripe.events.list({ type: "transfer.*" });
    expect(listed.data.map((e) => e.type)).toEqual(["transfer.reversed", "transfer.updated", "transfer.created"]);
    expect((await stripe.events.retrieve(accountEvent.id)).type).toBe("account.updated");
  });

  it("a transfer failed through the control API emits transfer.failed carrying its metadata", async () => {
    const account = await verifiedAccount();
    const t = await stripe.transfers.create({ amount: 3_300, currency: "usd", destination: account.id, metadata: { run: "run-4", site: "site-2" } });
    await control(fake.url, "POST", `/_fake/transfers/${t.id}/fail`, { code: "account_closed" });
    await flush();
    const failed = events().find((e) => (e.type as string) === "transfer.failed");
    expect(failed).toBeDefined();
    const obj = failed!.data.object as Stripe.Transfer & { failure_code?: string };
    expect(obj).toMatchObject({ id: t.id, metadata: { run: "run-4", site: "site-2" }, reversed: true, amount_reversed: 3_300, failure_code: "account_closed" });
    expect((await stripe.transfers.retrieve(t.id)).reversed).toBe(true);
  });
});

describe("delivery", () => {
  it("retries a receiver that answers 500, then records the delivery as delivered", async () => {
    receiver.statuses.push(500, 503);
    const account = await stripe.accounts.create({ type: "custom" });
    await control(fake.url, "POST", `/_fake/accounts/${account.id}/verification`, { state: "restricted" });
    await flush();
    await flush();
    await flush();
    const [d] = await deliveries();
    expect(d?.attempts.map((a) => a.status)).toEqual([500, 503, 200]);
    expect(d?.status).toBe("delivered");
    expect(receiver.received).toHaveLength(3);
    // Every attempt is freshly signed and verifies.
    for (const r of receiver.received) expect(stripe.webhooks.constructEvent(r.body, r.signature, SECRET).type).toBe("account.updated");
  });

  it("retries on its own with back-off when automatic delivery is on", async () => {
    receiver.statuses.push(500);
    await control(fake.url, "POST", "/_fake/webhooks/auto", { enabled: true });
    const account = await stripe.accounts.create({ type: "custom" });
    await control(fake.url, "POST", `/_fake/accounts/${account.id}/verification`, { state: "verified" });
    const delivered = await eventually(async () => (await deliveries()).find((d) => d.status === "delivered"), "automatic redelivery");
    expect(delivered.attempts.map((a) => a.status)).toEqual([500, 200]);
  });

  it("gives up after the bounded number of attempts when the receiver is down", async () => {
    const gone = await startWebhookReceiver();
    const goneUrl = gone.url;
    await gone.close();
    await stripe.webhookEndpoints.create({ url: goneUrl, enabled_events: ["*"] });
    const account = await stripe.accounts.create({ type: "custom" });
    await control(fake.url, "POST", `/_fake/accounts/${account.id}/verification`, { state: "verified" });
    for (let i = 0; i < 5; i += 1) await flush();
    const toGone = (await deliveries()).filter((d) => d.endpoint_id !== "we_env");
    expect(toGone).toHaveLength(1);
    expect(toGone[0]!.status).toBe("failed");
    expect(toGone[0]!.attempts).toHaveLength(3); // webhookMaxAttempts above
    expect(toGone[0]!.attempts.every((a) => a.error !== undefined)).toBe(true);
  });

  it("delivers the next webhook twice when asked", async () => {
    await control(fake.url, "POST", "/_fake/faults/duplicate-next-webhook", { count: 1 });
    const account = await verifiedAccount();
    await stripe.transfers.create({ amount: 10, currency: "usd", destination: account.id });
    await flush();
    const ids = events().map((e) => e.id);
    expect(ids).toHaveLength(3);
    expect(ids[0]).toBe(ids[1]);
    expect(events().map((e) => e.type)).toEqual(["account.updated", "account.updated", "transfer.created"]);
  });

  it("delivers the next K events out of order when asked", async () => {
    const account = await verifiedAccount();
    await flush();
    receiver.clear();
    await control(fake.url, "POST", "/_fake/faults/reorder-next-webhooks", { count: 3 });
    const t = await stripe.transfers.create({ amount: 900, currency: "usd", destination: account.id });
    await stripe.transfers.update(t.id, { description: "corrected" });
    await stripe.transfers.createReversal(t.id);
    await flush();
    expect(events().map((e) => e.type)).toEqual(["transfer.reversed", "transfer.updated", "transfer.created"]);
  });

  it("keeps undelivered webhooks across a restart and delivers them afterwards", async () => {
    const dir = tempDir("stripe-webhook-restart");
    const options = { port: 0, dataDir: dir, webhookUrl: receiver.url, webhookSecret: SECRET, initialAccountState: "pending" as const, log: () => {} };
    try {
      const first = await startStripeFake({ ...options, autoDeliver: false });
      const s1 = new Stripe("sk_test_x", { host: "127.0.0.1", port: first.port, protocol: "http", telemetry: false, maxNetworkRetries: 0 });
      const account = await s1.accounts.create({ type: "custom" });
      await control(first.url, "POST", `/_fake/accounts/${account.id}/verification`, { state: "verified" });
      await first.close();
      expect(receiver.received).toHaveLength(0);

      const second = await startStripeFake({ ...options, autoDeliver: true });
      try {
        await eventually(() => receiver.received.length === 1, "delivery after restart");
        const event = stripe.webhooks.constructEvent(receiver.received[0]!.body, receiver.received[0]!.signature, SECRET);
        expect(event.type).toBe("account.updated");
        expect((event.data.object as Stripe.Account).id).toBe(account.id);
      } finally {
        await second.close();
      }
    } finally {
      fs.rmSync(dir, { recursive: true, force: true });
    }
  });
});
