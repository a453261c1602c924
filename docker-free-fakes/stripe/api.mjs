// The /v1 endpoints of the fake. Each handler gets (fake, ctx) and returns a JSON body or throws a
// StripeFakeError. POST handlers run under the idempotency layer in server.mjs.
import { VERIFICATION_STATES, applyVerification, buildAccount, canReceiveTransfers } from "./accounts.mjs";
import { StripeFakeError, invalidRequest, noSuch } from "./errors.mjs";
import {
  mergeMetadata,
  onlyParams,
  optionalString,
  parseAmount,
  parseCurrency,
  previousAttributes,
  requireParam,
} from "./params.mjs";
import { listPage, newId, nowSeconds } from "./store.mjs";

const ACCOUNT_CREATE_PARAMS = [
  "type", "country", "email", "business_type", "business_profile", "capabilities", "company", "controller",
  "default_currency", "external_account", "individual", "metadata", "settings", "tos_acceptance",
];
const ACCOUNT_UPDATE_PARAMS = ["email", "business_profile", "business_type", "metadata", "settings", "capabilities", "tos_acceptance", "individual", "company", "external_account", "default_currency"];
const TRANSFER_CREATE_PARAMS = ["amount", "currency", "destination", "transfer_group", "metadata", "description", "source_transaction", "source_type"];
const LIST_PARAMS = ["limit", "starting_after", "ending_before", "created"];

function accountRecord(fake, id, param) {
  const rec = fake.store.state.accounts[id];
  if (!rec) throw noSuch("account", id, param);
  return rec;
}

function transferRecord(fake, id) {
  const rec = fake.store.state.transfers[id];
  if (!rec) throw noSuch("transfer", id);
  return rec;
}

function balanceOf(fake, currency) {
  const b = fake.store.state.balance;
  if (b[currency] === undefined) b[currency] = fake.config.startingBalance;
  return b[currency];
}

// ---- accounts

function createAccount(fake, { params }) {
  onlyParams(params, ACCOUNT_CREATE_PARAMS);
  const type = params.type ?? "custom";
  if (!["custom", "express", "standard"].includes(type)) {
    throw invalidRequest(`Invalid type: must be one of custom, express, or standard`, "type", "parameter_invalid_string");
  }
  const metadata = mergeMetadata({}, params.metadata);
  const state = fake.config.initialAccountState;
  const seq = fake.store.nextSeq();
  const account = buildAccount({ id: newId("acct"), created: nowSeconds(), params: { ...params, type }, state });
  account.metadata = metadata;
  fake.store.state.accounts[account.id] = { seq, verification: state, object: account };
  return account;
}

function updateAccount(fake, { params, match, request }) {
  onlyParams(params, ACCOUNT_UPDATE_PARAMS);
  const rec = accountRecord(fake, match[1]);
  const before = structuredClone(rec.object);
  const a = rec.object;
  a.metadata = mergeMetadata(a.metadata, params.metadata);
  if (params.email !== undefined) a.email = optionalString(params, "email") || null;
  if (params.business_type !== undefined) a.business_type = params.business_type || null;
  if (params.business_profile?.name !== undefined) a.business_profile = { ...a.business_profile, name: params.business_profile.name || null };
  const prev = previousAttributes(before, a, ["metadata", "email", "business_type", "business_profile"]);
  if (Object.keys(prev).length) fake.emit("account.updated", a, { previous_attributes: prev, account: a.id, request });
  return a;
}

/** Control API: moves an account to a verification state and emits account.updated. */
export function setAccountVerification(fake, id, state) {
  if (!VERIFICATION_STATES.includes(state)) {
    throw invalidRequest(`state must be one of ${VERIFICATION_STATES.join(", ")}`, "state");
  }
  const rec = accountRecord(fake, id);
  const before = structuredClone(rec.object);
  rec.verification = state;
  applyVerification(rec.object, state);
  const prev = previousAttributes(before, rec.object, ["charges_enabled", "payouts_enabled", "capabilities", "requirements"]);
  if (Object.keys(prev).length) fake.emit("account.updated", rec.object, { previous_attributes: prev, account: id });
  return rec.object;
}

// ---- transfers

function createTransfer(fake, { params, request }) {
  onlyParams(params, TRANSFER_CREATE_PARAMS);
  const amount = parseAmount(requireParam(params, "amount"));
  const currency = parseCurrency(requireParam(params, "currency"));
  const destination = requireParam(params, "destination");
  const metadata = mergeMetadata({}, params.metadata);
  const dest = fake.store.state.accounts[destination];
  if (!dest) throw invalidRequest(`No such destination: '${destination}'`, "destination", "resource_missing");
  if (fake.faults.declineNextTransfer.length > 0) {
    const d = fake.faults.declineNextTransfer.shift();
    throw new StripeFakeError(400, {
      type: d.type ?? "invalid_request_error",
      code: d.code ?? "balance_insufficient",
      param: d.param,
      message: d.message ?? "You have insufficient available funds in your Stripe account (declined by the Stripe fake).",
    });
  }
  if (!canReceiveTransfers(dest.object)) {
    throw invalidRequest(
      "Your destination account needs to have at least one of the following capabilities enabled: transfers, crypto_transfers, legacy_payments",
      "destination",
      "insufficient_capabilities_for_transfer",
    );
  }
  const available = balanceOf(fake, currency);
  if (available < amount) {
    throw invalidRequest("You have insufficient available funds in your Stripe account.", undefined, "balance_insufficient");
  }
  fake.store.state.balance[currency] = available - amount;
  const id = newId("tr");
  const transfer = {
    id,
    object: "transfer",
    amount,
    amount_reversed: 0,
    balance_transaction: newId("txn"),
    created: nowSeconds(),
    currency,
    description: optionalString(params, "description") ?? null,
    destination,
    destination_payment: newId("py"),
    livemode: false,
    metadata,
    reversals: { object: "list", data: [], has_more: false, total_count: 0, url: `/v1/transfers/${id}/reversals` },
    reversed: false,
    source_transaction: params.source_transaction ?? null,
    source_type: params.source_type ?? "card",
    transfer_group: optionalString(params, "transfer_group") ?? null,
  };
  fake.store.state.transfers[id] = { seq: fake.store.nextSeq(), object: transfer };
  fake.emit("transfer.created", transfer, { request });
  return transfer;
}

function updateTransfer(fake, { params, match, request }) {
  onlyParams(params, ["description", "metadata"]);
  const rec = transferRecord(fake, match[1]);
  const before = structuredClone(rec.object);
  rec.object.metadata = mergeMetadata(rec.object.metadata, params.metadata);
  if (params.description !== undefined) rec.object.description = optionalString(params, "description") || null;
  const prev = previousAttributes(before, rec.object, ["metadata", "description"]);
  if (Object.keys(prev).length) fake.emit("transfer.updated", rec.object, { previous_attributes: prev, request });
  return rec.object;
}

function listTransfers(fake, { params }) {
  onlyParams(params, [...LIST_PARAMS, "destination", "transfer_group"]);
  let rows = Object.values(fake.store.state.transfers);
  if (params.destination) rows = rows.filter((r) => r.object.destination === params.destination);
  if (params.transfer_group) rows = rows.filter((r) => r.object.transfer_group === params.transfer_group);
  return listPage(rows, params, "/v1/transfers", invalidRequest);
}

function createReversal(fake, { params, match, request }) {
  onlyParams(params, ["amount", "description", "metadata", "refund_application_fee"]);
  const rec = transferRecord(fake, match[1]);
  const t = rec.object;
  const remaining = t.amount - t.amount_reversed;
  if (remaining <= 0) throw invalidRequest(`Transfer ${t.id} has already been fully reversed.`, "amount");
  const amount = params.amount === undefined ? remaining : parseAmount(params.amount);
  if (amount > remaining) {
    throw invalidRequest(`Reversal amount (${amount}) is greater than the amount left on transfer ${t.id} (${remaining}).`, "amount");
  }
  const reversal = {
    id: newId("trr"),
    object: "transfer_reversal",
    amount,
    balance_transaction: newId("txn"),
    created: nowSeconds(),
    currency: t.currency,
    destination_payment_refund: newId("pyr"),
    metadata: mergeMetadata({}, params.metadata),
    source_refund: null,
    transfer: t.id,
  };
  fake.store.state.reversals[reversal.id] = { seq: fake.store.nextSeq(), object: reversal };
  const before = { amount_reversed: t.amount_reversed, reversed: t.reversed };
  t.amount_reversed += amount;
  t.reversed = t.amount_reversed === t.amount;
  t.reversals.data.unshift(reversal);
  t.reversals.total_count += 1;
  fake.store.state.balance[t.currency] = balanceOf(fake, t.currency) + amount;
  fake.emit("transfer.reversed", t, { previous_attributes: previousAttributes(before, t, ["amount_reversed", "reversed"]), request });
  return reversal;
}

/**
 * Control API: the fake's convention for a transfer that fails after creation. The transfer is
 * fully reversed (money back in the platform balance), gains failure_code / failure_message, and a
 * `transfer.failed` event carries it (metadata included).
 */
export function failTransfer(fake, id, { code, message } = {}) {
  const rec = transferRecord(fake, id);
  const t = rec.object;
  if (t.failure_code) throw new StripeFakeError(409, { type: "invalid_request_error", message: `Transfer ${id} has already failed.` });
  const remaining = t.amount - t.amount_reversed;
  const before = { amount_reversed: t.amount_reversed, reversed: t.reversed };
  t.amount_reversed = t.amount;
  t.reversed = true;
  t.failure_code = code ?? "account_closed";
  t.failure_message = message ?? "The destination account could not receive the funds (failure injected by the Stripe fake).";
  fake.store.state.balance[t.currency] = balanceOf(fake, t.currency) + remaining;
  fake.emit("transfer.failed", t, { previous_attributes: previousAttributes(before, t, ["amount_reversed", "reversed"]) });
  return t;
}

// ---- webhook endpoints

function createWebhookEndpoint(fake, { params }) {
  onlyParams(params, ["url", "enabled_events", "description", "metadata", "api_version", "connect"]);
  const url = requireParam(params, "url");
  try {
    const u = new URL(url);
    if (!["http:", "https:"].includes(u.protocol)) throw new Error();
  } catch {
    throw invalidRequest(`Invalid URL: ${url}`, "url", "url_invalid");
  }
  const events = requireParam(params, "enabled_events");
  if (!Array.isArray(events) || events.some((e) => typeof e !== "string")) {
    throw invalidRequest("Invalid array: enabled_events", "enabled_events", "parameter_invalid_string");
  }
  const secret = newId("whsec");
  const endpoint = {
    id: newId("we"),
    object: "webhook_endpoint",
    api_version: params.api_version ?? null,
    application: null,
    created: nowSeconds(),
    description: params.description ?? null,
    enabled_events: events,
    livemode: false,
    metadata: mergeMetadata({}, params.metadata),
    status: "enabled",
    url,
  };
  fake.store.state.webhookEndpoints[endpoint.id] = { seq: fake.store.nextSeq(), secret, object: endpoint };
  // Like Stripe, the secret is shown only in the creation response.
  return { ...endpoint, secret };
}

function webhookEndpointRecord(fake, id) {
  const rec = fake.store.state.webhookEndpoints[id];
  if (!rec) throw noSuch("webhook endpoint", id);
  return rec;
}

// ---- events and balance

function listEvents(fake, { params }) {
  onlyParams(params, [...LIST_PARAMS, "type", "types", "delivery_success"]);
  let rows = Object.values(fake.store.state.events);
  if (params.type) {
    const pattern = new RegExp(`^${params.type.replace(/[.]/g, "\\.").replace(/\*/g, "[^.]+")}$`);
    rows = rows.filter((r) => pattern.test(r.object.type));
  }
  if (Array.isArray(params.types)) rows = rows.filter((r) => params.types.includes(r.object.type));
  return listPage(rows, params, "/v1/events", invalidRequest);
}

function getBalance(fake, { params }) {
  onlyParams(params, []);
  const entries = Object.entries(fake.store.state.balance);
  if (entries.length === 0) entries.push([fake.config.defaultCurrency, fake.config.startingBalance]);
  return {
    object: "balance",
    available: entries.map(([currency, amount]) => ({ amount, currency, source_types: { card: amount } })),
    connect_reserved: entries.map(([currency]) => ({ amount: 0, currency })),
    livemode: false,
    pending: entries.map(([currency]) => ({ amount: 0, currency, source_types: { card: 0 } })),
  };
}

const list = (fake, key, url) => ({ params }) => {
  onlyParams(params, LIST_PARAMS);
  return listPage(Object.values(fake.store.state[key]), params, url, invalidRequest);
};

/** [method, path pattern, handler(fake, ctx)] */
export const API_ROUTES = [
  ["POST", /^\/v1\/accounts$/, createAccount],
  ["GET", /^\/v1\/accounts$/, (fake, ctx) => list(fake, "accounts", "/v1/accounts")(ctx)],
  ["GET", /^\/v1\/accounts\/([^/]+)$/, (fake, { params, match }) => (onlyParams(params, []), accountRecord(fake, match[1]).object)],
  ["POST", /^\/v1\/accounts\/([^/]+)$/, updateAccount],
  ["POST", /^\/v1\/transfers$/, createTransfer],
  ["GET", /^\/v1\/transfers$/, listTransfers],
  ["GET", /^\/v1\/transfers\/([^/]+)$/, (fake, { params, match }) => (onlyParams(params, []), transferRecord(fake, match[1]).object)],
  ["POST", /^\/v1\/transfers\/([^/]+)$/, updateTransfer],
  ["POST", /^\/v1\/transfers\/([^/]+)\/reversals$/, createReversal],
  [
    "GET",
    /^\/v1\/transfers\/([^/]+)\/reversals$/,
    (fake, { params, match }) => {
      onlyParams(params, LIST_PARAMS);
      const id = transferRecord(fake, match[1]).object.id;
      const rows = Object.values(fake.store.state.reversals).filter((r) => r.object.transfer === id);
      return listPage(rows, params, `/v1/transfers/${id}/reversals`, invalidRequest);
    },
  ],
  [
    "GET",
    /^\/v1\/transfers\/([^/]+)\/reversals\/([^/]+)$/,
    (fake, { match }) => {
      const rec = fake.store.state.reversals[match[2]];
      if (!rec || rec.object.transfer !== match[1]) throw noSuch("transfer reversal", match[2]);
      return rec.object;
    },
  ],
  ["GET", /^\/v1\/balance$/, getBalance],
  ["GET", /^\/v1\/events$/, listEvents],
  [
    "GET",
    /^\/v1\/events\/([^/]+)$/,
    (fake, { match }) => {
      const rec = fake.store.state.events[match[1]];
      if (!rec) throw noSuch("event", match[1]);
      return rec.object;
    },
  ],
  ["POST", /^\/v1\/webhook_endpoints$/, createWebhookEndpoint],
  ["GET", /^\/v1\/webhook_endpoints$/, (fake, ctx) => list(fake, "webhookEndpoints", "/v1/webhook_endpoints")(ctx)],
  ["GET", /^\/v1\/webhook_endpoints\/([^/]+)$/, (fake, { match }) => webhookEndpointRecord(fake, match[1]).object],
  [
    "DELETE",
    /^\/v1\/webhook_endpoints\/([^/]+)$/,
    (fake, { match }) => {
      const rec = webhookEndpointRecord(fake, match[1]);
      delete fake.store.state.webhookEndpoints[rec.object.id];
      return { id: rec.object.id, object: "webhook_endpoint", deleted: true };
    },
  ],
];
