// The Stripe fake: HTTP server, Bearer-key authentication, idempotency keys, injected faults, and
// event emission. Routes live in api.mjs (/v1) and control.mjs (/_fake).
import http from "node:http";
import path from "node:path";
import { API_ROUTES } from "./api.mjs";
import { CONTROL_ROUTES } from "./control.mjs";
import { StripeFakeError, apiError, invalidRequest } from "./errors.mjs";
import { canonicalParams, parseForm } from "./form.mjs";
import { Store, newId, nowSeconds } from "./store.mjs";
import { WebhookDispatcher } from "./webhooks.mjs";

// Stamped on events when the triggering request sent no Stripe-Version (the SDK always sends one).
export const DEFAULT_API_VERSION = "2026-10-28.endive";
const LOOPBACK_ADDRESSES = new Set(["127.0.0.1", "::1", "::ffff:127.0.0.1"]);
const MAX_BODY_BYTES = 1024 * 1024;
// Stripe keeps idempotency keys for at least 24 hours.
const IDEMPOTENCY_TTL_MS = 24 * 60 * 60 * 1000;

function readBody(req) {
  return new Promise((resolve, reject) => {
    const chunks = [];
    let size = 0;
    req.on("data", (c) => {
      size += c.length;
      if (size > MAX_BODY_BYTES) {
        reject(invalidRequest("Request body too large."));
        req.destroy();
      } else chunks.push(c);
    });
    req.on("end", () => resolve(Buffer.concat(chunks).toString("utf8")));
    req.on("error", reject);
  });
}

/** The secret key from `Authorization: Bearer sk_test_…` (or Basic with the key as user name). */
function apiKeyOf(req) {
  const h = req.headers.authorization ?? "";
  if (h.startsWith("Bearer ")) return h.slice(7).trim();
  if (h.startsWith("Basic ")) return Buffer.from(h.slice(6), "base64").toString("utf8").split(":")[0] ?? "";
  return "";
}

function authError(key) {
  if (!key) {
    return new StripeFakeError(401, {
      type: "invalid_request_error",
      message: "You did not provide an API key. You need to provide your API key in the Authorization header, using Bearer auth (e.g. 'Authorization: Bearer YOUR_SECRET_KEY').",
    });
  }
  if (!/^sk_test_\w+$/.test(key)) {
    const shown = key.length > 12 ? `${key.slice(0, 8)}*********${key.slice(-4)}` : key;
    return new StripeFakeError(401, { type: "invalid_request_error", code: "api_key_invalid", message: `Invalid API Key provided: ${shown}` });
  }
  return null;
}

export class StripeFake {
  /**
   * @param {{ dataDir: string | null, webhookUrl: string | null, webhookSecret: string,
   *   initialAccountState: string, startingBalance: number, defaultCurrency: string,
   *   webhookMaxAttempts: number, webhookRetryBaseMs: number, webhookRetryMaxMs: number,
   *   webhookTimeoutMs: number, autoDeliver: boolean, holdMs: number, log: (m: string) => void }} config
   */
  constructor(config) {
    this.config = config;
    this.store = new Store({ file: config.dataDir ? path.join(config.dataDir, "state.json") : null });
    this.webhooks = new WebhookDispatcher({
      store: this.store,
      envUrl: config.webhookUrl,
      envSecret: config.webhookSecret,
      maxAttempts: config.webhookMaxAttempts,
      baseDelayMs: config.webhookRetryBaseMs,
      maxDelayMs: config.webhookRetryMaxMs,
      timeoutMs: config.webhookTimeoutMs,
      autoDeliver: config.autoDeliver,
      log: config.log,
    });
    this.clearFaults();
    this.heldResponses = new Set();
    // Deliveries left pending by a previous run resume now.
    this.webhooks.schedule();
  }

  clearFaults() {
    this.faults = { failNext: [], timeoutNext: [], declineNextTransfer: [] };
    if (this.webhooks) {
      this.webhooks.duplicateNext = 0;
      this.webhooks.reorderNext = 0;
      if (this.webhooks.held.length) this.webhooks.releaseHeld();
    }
  }

  faultSummary() {
    const sum = (list) => list.reduce((n, f) => n + f.count, 0);
    return {
      fail_next: sum(this.faults.failNext),
      timeout_next: sum(this.faults.timeoutNext),
      decline_next_transfer: this.faults.declineNextTransfer.length,
      duplicate_next_webhook: this.webhooks.duplicateNext,
      reorder_next_webhooks: this.webhooks.reorderNext,
      held_webhook_events: this.webhooks.held.length,
    };
  }

  /** Takes one unit from the first fault of a kind, or null. */
  takeFault(kind) {
    const list = this.faults[kind];
    const f = list[0];
    if (!f) return null;
    f.count -= 1;
    if (f.count <= 0) list.shift();
    return f;
  }

  async reset() {
    this.clearFaults();
    this.webhooks.held = [];
    this.store.reset();
  }

  /** Records an event (snapshot of the object now) and queues its webhook deliveries. */
  emit(type, object, { previous_attributes, account, request } = {}) {
    const event = {
      id: newId("evt"),
      object: "event",
      ...(account ? { account } : {}),
      api_version: request?.apiVersion ?? DEFAULT_API_VERSION,
      created: nowSeconds(),
      data: { object: structuredClone(object), ...(previous_attributes ? { previous_attributes } : {}) },
      livemode: false,
      pending_webhooks: 0,
      request: { id: request?.id ?? null, idempotency_key: request?.idempotencyKey ?? null },
      type,
    };
    this.store.state.events[event.id] = { seq: this.store.nextSeq(), object: event };
    event.pending_webhooks = this.webhooks.enqueue(event);
    return event;
  }

  /** Forgets idempotency keys older than the TTL. */
  pruneIdempotency() {
    const cutoff = Date.now() - IDEMPOTENCY_TTL_MS;
    for (const [k, v] of Object.entries(this.store.state.idempotency)) if (v.createdAt < cutoff) delete this.store.state.idempotency[k];
  }

  /** Node request handler. */
  async handle(req, res) {
    const send = (status, body, headers = {}) => {
      if (res.writableEnded || res.destroyed) return;
      const text = JSON.stringify(body, null, 2);
      res.writeHead(status, { "content-type": "application/json", "content-length": Buffer.byteLength(text), ...headers });
      res.end(text);
    };
    try {
      if (!LOOPBACK_ADDRESSES.has(req.socket.remoteAddress ?? "")) {
        return send(403, { error: { type: "invalid_request_error", message: "The Stripe fake answers loopback clients only." } });
      }
      const url = new URL(req.url ?? "/", "http://127.0.0.1");
      const raw = await readBody(req);
      if (url.pathname.startsWith("/_fake/")) return await this.handleControl(req, url, raw, send);
      if (url.pathname.startsWith("/v1/")) return await this.handleApi(req, res, url, raw, send);
      return send(404, { error: { type: "invalid_request_error", message: `Unrecognized request URL (${req.method}: ${url.pathname}).` } });
    } catch (err) {
      if (err instanceof StripeFakeError) return send(err.status, err.toJSON());
      this.config.log(`internal error: ${err?.stack ?? err}`);
      return send(500, { error: { type: "api_error", message: `Stripe fake internal error: ${err?.message ?? err}` } });
    }
  }

  async handleControl(req, url, raw, send) {
    const route = CONTROL_ROUTES.find(([m, re]) => m === req.method && re.test(url.pathname));
    if (!route) return send(404, { error: { type: "invalid_request_error", message: `No control route ${req.method} ${url.pathname}` } });
    let body = {};
    if (raw.trim()) {
      try {
        body = JSON.parse(raw);
      } catch {
        throw invalidRequest("Control API bodies are JSON.");
      }
    }
    const result = await route[2](this, { body, match: url.pathname.match(route[1]) });
    this.store.save();
    return send(200, result);
  }

  /** Keeps the connection open without answering, so the client's timeout fires. */
  hold(res) {
    this.heldResponses.add(res);
    const timer = setTimeout(() => res.destroy(), this.config.holdMs);
    timer.unref?.();
    res.on("close", () => {
      clearTimeout(timer);
      this.heldResponses.delete(res);
    });
  }

  async handleApi(req, res, url, raw, send) {
    const requestId = newId("req");
    const apiVersion = req.headers["stripe-version"] ?? DEFAULT_API_VERSION;
    const idempotencyKey = req.method === "POST" ? (req.headers["idempotency-key"] ?? null) : null;
    const baseHeaders = { "request-id": requestId, "stripe-version": apiVersion, ...(idempotencyKey ? { "idempotency-key": idempotencyKey } : {}) };
    const reply = (status, body, extra = {}) => send(status, body, { ...baseHeaders, ...extra });

    const keyError = authError(apiKeyOf(req));
    if (keyError) return reply(keyError.status, keyError.toJSON());

    const timeoutBefore = this.faults.timeoutNext[0] && !this.faults.timeoutNext[0].after ? this.takeFault("timeoutNext") : null;
    if (timeoutBefore) return this.hold(res);
    const failBefore = this.faults.failNext[0] && !this.faults.failNext[0].after ? this.takeFault("failNext") : null;
    if (failBefore) return reply(failBefore.status, apiError().toJSON());

    const route = API_ROUTES.find(([m, re]) => m === req.method && re.test(url.pathname));
    if (!route) {
      return reply(404, { error: { type: "invalid_request_error", message: `Unrecognized request URL (${req.method}: ${url.pathname}).` } });
    }
    const params = req.method === "POST" ? parseForm(raw) : parseForm(url.search.slice(1));

    let status;
    let body;
    let extra = {};
    const fingerprint = `${req.method} ${url.pathname} ${canonicalParams(params)}`;
    const cached = idempotencyKey ? this.store.state.idempotency[idempotencyKey] : undefined;
    if (cached && cached.fingerprint !== fingerprint) {
      const e = new StripeFakeError(400, {
        type: "idempotency_error",
        message: `Keys for idempotent requests can only be used with the same parameters they were first used with. Try using a key other than '${idempotencyKey}' if you meant to execute a different request.`,
      });
      status = e.status;
      body = e.toJSON();
    } else if (cached) {
      status = cached.status;
      body = cached.body;
      extra = { "idempotent-replayed": "true", "original-request": cached.requestId };
    } else {
      try {
        body = await route[2](this, { params, match: url.pathname.match(route[1]), request: { id: requestId, idempotencyKey, apiVersion } });
        status = 200;
        // Only completed requests are remembered: a refused one may be retried with the same key.
        if (idempotencyKey) {
          this.pruneIdempotency();
          this.store.state.idempotency[idempotencyKey] = { fingerprint, status, body, requestId, createdAt: Date.now() };
        }
        this.store.save();
      } catch (err) {
        if (!(err instanceof StripeFakeError)) throw err;
        status = err.status;
        body = err.toJSON();
      }
    }

    // "after" faults: the request has taken effect, but the client sees a failure.
    const timeoutAfter = this.faults.timeoutNext[0]?.after ? this.takeFault("timeoutNext") : null;
    if (timeoutAfter) return this.hold(res);
    const failAfter = this.faults.failNext[0]?.after ? this.takeFault("failNext") : null;
    if (failAfter) return reply(failAfter.status, apiError().toJSON());
    return reply(status, body, extra);
  }

  async close() {
    for (const res of this.heldResponses) res.destroy();
    await this.webhooks.close();
    this.store.writeNow();
  }
}

/** Creates the HTTP server for a fake and listens on 127.0.0.1. */
export function listen(fake, port) {
  const server = http.createServer((req, res) => void fake.handle(req, res));
  server.keepAliveTimeout = 5000;
  return new Promise((resolve, reject) => {
    server.once("error", reject);
    server.listen(port, "127.0.0.1", () => {
      server.off("error", reject);
      resolve(server);
    });
  });
}
