// The Stripe fake driven by the official stripe SDK (v23): accounts, transfers, idempotency, faults.
import fs from "node:fs";
import Stripe from "stripe";
import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import { startStripeFake, type StripeFakeHandle } from "../../../docker-free-fakes/stripe.mjs";
import { control, tempDir } from "./helpers";

let fake: StripeFakeHandle;
let dataDir: string;

function client(options: { maxNetworkRetries?: number; timeout?: number } = {}) {
  return new Stripe("sk_test_cairn_fakes", {
    host: "127.0.0.1",
    port: fake.port,
    protocol: "http",
    telemetry: false,
    maxNetworkRetries: options.maxNetworkRetries ?? 0,
    ...(options.timeout ? { timeout: options.timeout } : {}),
  });
}

async function verifiedAccount(stripe: Stripe, metadata: Record<string, string> = {}) {
  const account = await stripe.accounts.create({ type: "custom", country: "FR", metadata });
  await control(fake.url, "POST", `/_fake/accounts/${account.id}/verification`, { state: "verified" });
  return account;
}

type Recorded = { transfers: Stripe.Transfer[]; events: Stripe.Event[]; accounts: Stripe.Account[] };
const state = () => control<Recorded>(fake.url, "GET", "/_fake/state");

beforeAll(async () => {
  dataDir = tempDir("stripe-fake");
  // Options are explicit so the environment of `npm test` (which sets the fakes' variables) cannot change them.
  fake = await startStripeFake({ port: 0, dataDir, webhookUrl: null, initialAccountState: "pending", startingBalance: 100_000_000, log: () => {} });
});

afterAll(async () => {
  await fake?.close();
  fs.rmSync(dataDir, { recursive: true, force: true });
});

beforeEach(async () => {
  await control(fake.url, "POST", "/_fake/reset");
});

describe("accounts", () => {
  it("creates a custom account that starts pending and reflects each verification state", async () => {
    const stripe = client();
    const created = await stripe.accounts.create({ type: "custom", country: "DE", metadata: { site: "site-07" } });
    expect(created.id).toMatch(/^acct_/);
    expect(created.metadata).toEqual({ site: "site-07" });
    expect(created.charges_enabled).toBe(false);
    expect(created.capabilities?.transfers).toBe("pending");
    expect(created.requirements?.disabled_reason).toBe("requirements.pending_verification");

    await control(fake.url, "POST", `/_fake/accounts/${created.id}/verification`, { state: "verified" });
    const verified = await stripe.accounts.retrieve(created.id);
    expect([verified.charges_enabled, verified.payouts_enabled]).toEqual([true, true]);
    expect(verified.requirements?.disabled_reason).toBeNull();
    expect(verified.capabilities?.transfers).toBe("active");

    await control(fake.url, "POST", `/_fake/accounts/${created.id}/verification`, { state: "restricted" });
    const restricted = await stripe.accounts.retrieve(created.id);
    expect(restricted.payouts_enabled).toBe(false);
    expect(restricted.requirements?.disabled_reason).toBe("requirements.past_due");
    expect(restricted.requirements?.past_due).toContain("external_account");
    expect(restricted.capabilities?.transfers).toBe("inactive");

    const express = await stripe.accounts.create({ type: "express" });
    expect(express.type).toBe("express");
    const listed = await stripe.accounts.list({ limit: 1 });
    expect(listed.data.map((a) => a.id)).toEqual([express.id]);
    expect(listed.has_more).toBe(true);
  });

  it("answers an unknown account with a resource_missing error", async () => {
    await expect(client().accounts.retrieve("acct_doesnotexist")).rejects.toMatchObject({
      type: "StripeInvalidRequestError",
      code: "resource_missing",
      statusCode: 404,
    });
  });

  it("refuses requests without a test secret key", async () => {
    const anonymous = new Stripe("sk_live_not_for_the_fake", { host: "127.0.0.1", port: fake.port, protocol: "http", telemetry: false, maxNetworkRetries: 0 });
    await expect(anonymous.balance.retrieve()).rejects.toMatchObject({ type: "StripeAuthenticationError", statusCode: 401 });
    const res = await fetch(`${fake.url}/v1/balance`);
    expect(res.status).toBe(401);
  });
});

describe("transfers", () => {
  it("sends a transfer to a verified account and finds it by group and destination", async () => {
    const stripe = client();
    const account = await verifiedAccount(stripe);
    const before = await stripe.balance.retrieve();
    const transfer = await stripe.transfers.create({
      amount: 123_456,
      currency: "eur",
      destination: account.id,
      transfer_group: "run-2026-11",
      description: "Visit payments, November",
      metadata: { run: "run-2026-11", site: "site-03" },
    });
    expect(transfer).toMatchObject({
      object: "transfer",
      amount: 123_456,
      amount_reversed: 0,
      currency: "eur",
      destination: account.id,
      transfer_group: "run-2026-11",
      reversed: false,
      metadata: { run: "run-2026-11", site: "site-03" },
    });
    expect((await stripe.transfers.retrieve(transfer.id)).id).toBe(transfer.id);

    const other = await verifiedAccount(stripe);
    await stripe.transfers.create({ amount: 500, currency: "eur", destination: other.id, transfer_group: "run-2026-12" });
    const byGroup = await stripe.transfers.list({ transfer_group: "run-2026-11" });
    expect(byGroup.data.map((t) => t.id)).toEqual([transfer.id]);
    const byDestination = await stripe.transfers.list({ destination: other.id });
    expect(byDestination.data).toHaveLength(1);
    expect(byDestination.data[0]?.destination).toBe(other.id);

    const after = await stripe.balance.retrieve();
    const eurBefore = before.available.find((b) => b.currency === "eur")?.amount ?? before.available[0]!.amount;
    const eurAfter = after.available.find((b) => b.currency === "eur")?.amount;
    expect(eurAfter).toBe(eurBefore - 123_456 - 500);
  });

  it("refuses a destination that is not verified, like Stripe's missing-capability error", async () => {
    const stripe = client();
    const pending = await stripe.accounts.create({ type: "custom" });
    await expect(stripe.transfers.create({ amount: 1000, currency: "usd", destination: pending.id })).rejects.toMatchObject({
      type: "StripeInvalidRequestError",
      code: "insufficient_capabilities_for_transfer",
      param: "destination",
      statusCode: 400,
    });
    await expect(stripe.transfers.create({ amount: 1000, currency: "usd", destination: "acct_nobody" })).rejects.toMatchObject({
      code: "resource_missing",
      param: "destination",
    });
    expect((await state()).transfers).toHaveLength(0);
  });

  it("validates parameters with Stripe's error codes", async () => {
    const stripe = client();
    const account = await verifiedAccount(stripe);
    await expect(stripe.transfers.create({ currency: "usd", destination: account.id } as Stripe.TransferCreateParams)).rejects.toMatchObject({
      code: "parameter_missing",
      param: "amount",
    });
    await expect(
      stripe.transfers.create({ amount: 10, currency: "usd", destination: account.id, colour: "red" } as Stripe.TransferCreateParams),
    ).rejects.toMatchObject({ code: "parameter_unknown", param: "colour" });
  });

  it("pages through transfers newest first with the SDK's auto-pagination", async () => {
    const stripe = client();
    const account = await verifiedAccount(stripe);
    const ids: string[] = [];
    for (let i = 1; i <= 5; i += 1) ids.push((await stripe.transfers.create({ amount: i, currency: "usd", destination: account.id })).id);
    const firstPage = await stripe.transfers.list({ limit: 2 });
    expect(firstPage.data.map((t) => t.id)).toEqual([ids[4], ids[3]]);
    expect(firstPage.has_more).toBe(true);
    const all = await stripe.transfers.list({ limit: 2 }).autoPagingToArray({ limit: 100 });
    expect(all.map((t) => t.id)).toEqual([...ids].reverse());
  });

  it("refuses an unknown verification state on the control API", async () => {
    const account = await client().accounts.create({ type: "custom" });
    await expect(control(fake.url, "POST", `/_fake/accounts/${account.id}/verification`, { state: "approved" })).rejects.toThrow(/400/);
  });

  it("reverses part of a transfer, then the rest, and refuses more", async () => {
    const stripe = client();
    const account = await verifiedAccount(stripe);
    const t = await stripe.transfers.create({ amount: 10_000, currency: "usd", destination: account.id });
    const partial = await stripe.transfers.createReversal(t.id, { amount: 2_500, metadata: { reason: "query" } });
    expect(partial).toMatchObject({ object: "transfer_reversal", amount: 2_500, transfer: t.id });
    const rest = await stripe.transfers.createReversal(t.id);
    expect(rest.amount).toBe(7_500);
    const reversed = await stripe.transfers.retrieve(t.id);
    expect(reversed.amount_reversed).toBe(10_000);
    expect(reversed.reversed).toBe(true);
    await expect(stripe.transfers.createReversal(t.id, { amount: 1 })).rejects.toMatchObject({ type: "StripeInvalidRequestError" });
  });

  it("keeps transfers across a restart of the fake", async () => {
    const dir = tempDir("stripe-restart");
    try {
      const first = await startStripeFake({ port: 0, dataDir: dir, webhookUrl: null, log: () => {} });
      const s1 = new Stripe("sk_test_x", { host: "127.0.0.1", port: first.port, protocol: "http", telemetry: false, maxNetworkRetries: 0 });
      const acct = await s1.accounts.create({ type: "custom" });
      await fetch(`${first.url}/_fake/accounts/${acct.id}/verification`, { method: "POST", body: JSON.stringify({ state: "verified" }) });
      const t = await s1.transfers.create({ amount: 42, currency: "usd", destination: acct.id }, { idempotencyKey: "restart-key" });
      await first.close();

      const second = await startStripeFake({ port: 0, dataDir: dir, webhookUrl: null, log: () => {} });
      const s2 = new Stripe("sk_test_x", { host: "127.0.0.1", port: second.port, protocol: "http", telemetry: false, maxNetworkRetries: 0 });
      expect((await s2.transfers.retrieve(t.id)).amount).toBe(42);
      // The idempotency key survives too: a retry after the restart does not pay again.
      const again = await s2.transfers.create({ amount: 42, currency: "usd", destination: acct.id }, { idempotencyKey: "restart-key" });
      expect(again.id).toBe(t.id);
      expect((await s2.transfers.list()).data).toHaveLength(1);
      await second.close();
    } finally {
      fs.rmSync(dir, { recursive: true, force: true });
    }
  });
});

describe("idempotency keys", () => {
  it("returns the first transfer for the same key and body, and records one", async () => {
    const stripe = client();
    const account = await verifiedAccount(stripe);
    const params = { amount: 9_900, currency: "usd", destination: account.id, metadata: { run: "r1", site: "s1" } };
    const first = await stripe.transfers.create(params, { idempotencyKey: "run-r1-site-s1" });
    const second = await stripe.transfers.create(params, { idempotencyKey: "run-r1-site-s1" });
    expect(second.id).toBe(first.id);
    expect(second.lastResponse.headers["idempotent-replayed"]).toBe("true");
    const recorded = await state();
    expect(recorded.transfers).toHaveLength(1);
    expect(recorded.events.filter((e) => e.type === "transfer.created")).toHaveLength(1);
  });

  it("refuses the same key with a different body", async () => {
    const stripe = client();
    const account = await verifiedAccount(stripe);
    await stripe.transfers.create({ amount: 100, currency: "usd", destination: account.id }, { idempotencyKey: "k-1" });
    const err = await stripe.transfers
      .create({ amount: 101, currency: "usd", destination: account.id }, { idempotencyKey: "k-1" })
      .catch((e: unknown) => e);
    expect(err).toBeInstanceOf(Stripe.errors.StripeIdempotencyError);
    expect(err).toMatchObject({ statusCode: 400, message: expect.stringContaining("same parameters") });
    expect((await state()).transfers).toHaveLength(1);
  });
});

describe("fault injection", () => {
  it("fails the next call with 500; without retries the SDK raises, the call after succeeds", async () => {
    const stripe = client({ maxNetworkRetries: 0 });
    await control(fake.url, "POST", "/_fake/faults/fail-next", { count: 1 });
    await expect(stripe.balance.retrieve()).rejects.toBeInstanceOf(Stripe.errors.StripeAPIError);
    await expect(stripe.balance.retrieve()).resolves.toMatchObject({ object: "balance" });
  });

  it("with two retries the SDK rides over two 500s and one transfer is recorded", async () => {
    const stripe = client({ maxNetworkRetries: 2 });
    const account = await verifiedAccount(stripe);
    await control(fake.url, "POST", "/_fake/faults/fail-next", { count: 2 });
    const t = await stripe.transfers.create({ amount: 700, currency: "usd", destination: account.id });
    expect(t.object).toBe("transfer");
    expect((await control<{ fail_next: number }>(fake.url, "GET", "/_fake/faults")).fail_next).toBe(0);
    expect((await state()).transfers).toHaveLength(1);
  });

  it("a 500 after the transfer took effect is retried under the same key without paying twice", async () => {
    const stripe = client({ maxNetworkRetries: 1 });
    const account = await verifiedAccount(stripe);
    await control(fake.url, "POST", "/_fake/faults/fail-next", { count: 1, after: true });
    const t = await stripe.transfers.create({ amount: 800, currency: "usd", destination: account.id }, { idempotencyKey: "after-fault" });
    const recorded = await state();
    expect(recorded.transfers.map((x) => x.id)).toEqual([t.id]);
  });

  it("holds the next call past the client's timeout: the SDK raises a connection error", async () => {
    const stripe = client({ maxNetworkRetries: 0, timeout: 300 });
    await control(fake.url, "POST", "/_fake/faults/timeout-next", { count: 1 });
    const err = await stripe.balance.retrieve().catch((e: unknown) => e);
    expect(err).toBeInstanceOf(Stripe.errors.StripeConnectionError);
    // The fault is used up; a client with the default timeout is answered (300 ms is tight on a busy machine).
    await expect(client().balance.retrieve()).resolves.toMatchObject({ object: "balance" });
  });

  it("declines the next transfer with a Stripe-like error and records nothing", async () => {
    const stripe = client();
    const account = await verifiedAccount(stripe);
    await control(fake.url, "POST", "/_fake/faults/decline-next-transfer", {});
    await expect(stripe.transfers.create({ amount: 300, currency: "usd", destination: account.id })).rejects.toMatchObject({
      type: "StripeInvalidRequestError",
      code: "balance_insufficient",
    });
    expect((await state()).transfers).toHaveLength(0);
    await expect(stripe.transfers.create({ amount: 300, currency: "usd", destination: account.id })).resolves.toMatchObject({ amount: 300 });
  });

  it("refuses a transfer larger than the platform balance", async () => {
    const stripe = client();
    const account = await verifiedAccount(stripe);
    await control(fake.url, "POST", "/_fake/balance", { currency: "chf", amount: 1_000 });
    await expect(stripe.transfers.create({ amount: 1_001, currency: "chf", destination: account.id })).rejects.toMatchObject({
      code: "balance_insufficient",
    });
    await expect(stripe.transfers.create({ amount: 1_000, currency: "chf", destination: account.id })).resolves.toMatchObject({ amount: 1_000 });
  });
});
