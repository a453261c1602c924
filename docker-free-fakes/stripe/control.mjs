// Test control API under /_fake/… (JSON in, JSON out, no auth, loopback only).
import { VERIFICATION_STATES } from "./accounts.mjs";
import { failTransfer, setAccountVerification } from "./api.mjs";
import { invalidRequest } from "./errors.mjs";

const values = (map) => Object.values(map).sort((a, b) => a.seq - b.seq).map((r) => r.object);

function count(body, name = "count", fallback = 1) {
  const n = body[name] ?? fallback;
  if (!Number.isInteger(n) || n < 0) throw invalidRequest(`${name} must be a non-negative integer`, name);
  return n;
}

/** Everything the fake recorded, oldest first. */
export function snapshot(fake) {
  const s = fake.store.state;
  return {
    accounts: values(s.accounts).map((a) => ({ ...a, fake_verification: s.accounts[a.id].verification })),
    transfers: values(s.transfers),
    reversals: values(s.reversals),
    events: values(s.events),
    webhook_endpoints: Object.values(s.webhookEndpoints).sort((a, b) => a.seq - b.seq).map((r) => ({ ...r.object, secret: r.secret })),
    deliveries: s.deliveries,
    balance: s.balance,
    idempotency_keys: Object.keys(s.idempotency).length,
    faults: fake.faultSummary(),
  };
}

/** [method, path pattern, handler(fake, { body, match })] */
export const CONTROL_ROUTES = [
  ["GET", /^\/_fake\/health$/, () => ({ ok: true })],
  ["POST", /^\/_fake\/reset$/, async (fake) => (await fake.reset(), { ok: true })],
  ["GET", /^\/_fake\/state$/, (fake) => snapshot(fake)],
  ["GET", /^\/_fake\/accounts$/, (fake) => snapshot(fake).accounts],
  ["GET", /^\/_fake\/transfers$/, (fake) => values(fake.store.state.transfers)],
  ["GET", /^\/_fake\/events$/, (fake) => values(fake.store.state.events)],
  ["GET", /^\/_fake\/deliveries$/, (fake) => fake.store.state.deliveries],
  [
    "POST",
    /^\/_fake\/accounts\/([^/]+)\/verification$/,
    (fake, { body, match }) => {
      if (!VERIFICATION_STATES.includes(body.state)) {
        throw invalidRequest(`state must be one of ${VERIFICATION_STATES.join(", ")}`, "state");
      }
      return setAccountVerification(fake, match[1], body.state);
    },
  ],
  ["POST", /^\/_fake\/transfers\/([^/]+)\/fail$/, (fake, { body, match }) => failTransfer(fake, match[1], body)],
  [
    "POST",
    /^\/_fake\/balance$/,
    (fake, { body }) => {
      if (typeof body.currency !== "string" || !/^[a-z]{3}$/.test(body.currency)) throw invalidRequest("currency: three lower-case letters", "currency");
      if (!Number.isSafeInteger(body.amount) || body.amount < 0) throw invalidRequest("amount: a non-negative integer in minor units", "amount");
      fake.store.state.balance[body.currency] = body.amount;
      return fake.store.state.balance;
    },
  ],
  ["GET", /^\/_fake\/faults$/, (fake) => fake.faultSummary()],
  ["DELETE", /^\/_fake\/faults$/, (fake) => (fake.clearFaults(), fake.faultSummary())],
  [
    "POST",
    /^\/_fake\/faults\/fail-next$/,
    (fake, { body }) => {
      const status = body.status ?? 500;
      if (!Number.isInteger(status) || status < 500 || status > 599) throw invalidRequest("status must be 5xx", "status");
      fake.faults.failNext.push({ count: count(body), status, after: body.after === true });
      return fake.faultSummary();
    },
  ],
  [
    "POST",
    /^\/_fake\/faults\/timeout-next$/,
    (fake, { body }) => {
      fake.faults.timeoutNext.push({ count: count(body), after: body.after === true });
      return fake.faultSummary();
    },
  ],
  [
    "POST",
    /^\/_fake\/faults\/decline-next-transfer$/,
    (fake, { body }) => {
      const n = count(body);
      for (let i = 0; i < n; i += 1) fake.faults.declineNextTransfer.push({ type: body.type, code: body.code, param: body.param, message: body.message });
      return fake.faultSummary();
    },
  ],
  [
    "POST",
    /^\/_fake\/faults\/duplicate-next-webhook$/,
    (fake, { body }) => ((fake.webhooks.duplicateNext += count(body)), fake.faultSummary()),
  ],
  [
    "POST",
    /^\/_fake\/faults\/reorder-next-webhooks$/,
    (fake, { body }) => {
      const k = count(body, "count", 2);
      if (k < 2) throw invalidRequest("count must be at least 2 to reorder", "count");
      fake.webhooks.reorderNext = k;
      return fake.faultSummary();
    },
  ],
  [
    "POST",
    /^\/_fake\/webhooks\/flush$/,
    async (fake) => {
      const attempted = await fake.webhooks.flush();
      return { attempted, pending: fake.store.state.deliveries.filter((d) => d.status === "pending").length };
    },
  ],
  [
    "POST",
    /^\/_fake\/webhooks\/auto$/,
    (fake, { body }) => {
      if (typeof body.enabled !== "boolean") throw invalidRequest("enabled must be true or false", "enabled");
      fake.webhooks.autoDeliver = body.enabled;
      fake.webhooks.schedule();
      return { enabled: body.enabled };
    },
  ],
];
