// Webhook delivery: every event goes to each matching endpoint, signed the way Stripe signs
// (Stripe-Signature: t=<unix seconds>,v1=<hex HMAC-SHA256 of "<t>.<payload>">), one delivery at a
// time in queue order, retried with exponential back-off while the receiver answers non-2xx or is down.
import crypto from "node:crypto";
import { newId, nowSeconds } from "./store.mjs";

/** The Stripe-Signature header value for a payload. */
export function signatureHeader(payload, secret, t = nowSeconds()) {
  const v1 = crypto.createHmac("sha256", secret).update(`${t}.${payload}`, "utf8").digest("hex");
  return `t=${t},v1=${v1}`;
}

const ENV_ENDPOINT_ID = "we_env";

export class WebhookDispatcher {
  /**
   * @param {{ store: import("./store.mjs").Store, envUrl: string | null, envSecret: string,
   *   maxAttempts: number, baseDelayMs: number, maxDelayMs: number, timeoutMs: number,
   *   autoDeliver: boolean, log: (msg: string) => void }} options
   */
  constructor(options) {
    Object.assign(this, options);
    this.duplicateNext = 0; // next N events are delivered twice to each endpoint
    this.reorderNext = 0; // next K events are held, then queued in reverse order
    this.held = [];
    this.timer = null;
    this.pumping = null;
    this.closed = false;
    this.abort = new AbortController();
  }

  get deliveries() {
    return this.store.state.deliveries;
  }

  /** Endpoints an event goes to: the env URL (if set) and every enabled registered endpoint. */
  endpointsFor(type) {
    const out = [];
    if (this.envUrl) out.push({ id: ENV_ENDPOINT_ID, url: this.envUrl });
    for (const rec of Object.values(this.store.state.webhookEndpoints)) {
      const ep = rec.object;
      if (ep.status !== "enabled") continue;
      if (ep.enabled_events.includes("*") || ep.enabled_events.includes(type)) out.push({ id: ep.id, url: ep.url });
    }
    return out;
  }

  secretFor(endpointId) {
    if (endpointId === ENV_ENDPOINT_ID) return this.envSecret;
    return this.store.state.webhookEndpoints[endpointId]?.secret ?? null;
  }

  /** Queues deliveries for a new event (the caller saves the store). Returns the delivery count. */
  enqueue(event) {
    if (this.reorderNext > 0) {
      this.held.push(event);
      this.reorderNext -= 1;
      if (this.reorderNext === 0) this.releaseHeld();
      return this.endpointsFor(event.type).length;
    }
    return this.queueEvent(event);
  }

  /** Queues held events newest first, so the receiver sees them out of order. */
  releaseHeld() {
    const held = this.held.reverse();
    this.held = [];
    for (const e of held) this.queueEvent(e);
    this.reorderNext = 0;
  }

  queueEvent(event) {
    const copies = this.duplicateNext > 0 ? 2 : 1;
    if (this.duplicateNext > 0) this.duplicateNext -= 1;
    const endpoints = this.endpointsFor(event.type);
    for (const ep of endpoints) {
      for (let copy = 1; copy <= copies; copy += 1) {
        this.deliveries.push({
          id: newId("whd"),
          event_id: event.id,
          event_type: event.type,
          endpoint_id: ep.id,
          url: ep.url,
          copy,
          status: "pending",
          attempts: [],
          next_attempt_at: Date.now(),
        });
      }
    }
    this.schedule();
    return endpoints.length;
  }

  /** Arms the timer for the earliest pending delivery (when automatic delivery is on). */
  schedule() {
    if (this.closed || !this.autoDeliver) return;
    if (this.timer) clearTimeout(this.timer);
    this.timer = null;
    const pending = this.deliveries.filter((d) => d.status === "pending");
    if (pending.length === 0) return;
    const next = Math.min(...pending.map((d) => d.next_attempt_at));
    this.timer = setTimeout(() => {
      this.timer = null;
      void this.pump(false);
    }, Math.max(0, next - Date.now()));
    this.timer.unref?.();
  }

  /** Attempts due deliveries one at a time (all pending ones when `all`). Serialised. */
  pump(all) {
    const run = async () => {
      const attempted = [];
      for (;;) {
        if (this.closed) break;
        const now = Date.now();
        const d = this.deliveries.find(
          (x) => x.status === "pending" && (all ? !attempted.includes(x.id) : x.next_attempt_at <= now),
        );
        if (!d) break;
        attempted.push(d.id);
        await this.attempt(d);
      }
      return attempted;
    };
    // Chain after any pump in progress so deliveries never overlap.
    const current = (this.pumping ?? Promise.resolve()).catch(() => {}).then(run);
    const settled = current.catch(() => {}).finally(() => {
      if (this.pumping === settled) this.pumping = null;
      this.schedule();
    });
    this.pumping = settled;
    return current;
  }

  /** Delivers every pending delivery once now, including held out-of-order events. */
  async flush() {
    if (this.held.length) this.releaseHeld();
    const ids = await this.pump(true);
    return this.deliveries.filter((d) => ids.includes(d.id));
  }

  async attempt(d) {
    const rec = this.store.state.events[d.event_id];
    const secret = this.secretFor(d.endpoint_id);
    const at = new Date().toISOString();
    if (!rec || !secret) {
      d.status = "failed";
      d.attempts.push({ at, error: !rec ? "event no longer exists" : "endpoint no longer exists" });
      this.store.save();
      return;
    }
    const payload = JSON.stringify(rec.object, null, 2);
    let outcome;
    try {
      const signal = AbortSignal.any([AbortSignal.timeout(this.timeoutMs), this.abort.signal]);
      const res = await fetch(d.url, {
        method: "POST",
        headers: {
          "content-type": "application/json; charset=utf-8",
          "stripe-signature": signatureHeader(payload, secret),
          "user-agent": "Stripe/1.0 (+https://stripe.com/docs/webhooks)",
        },
        body: payload,
        signal,
      });
      await res.text().catch(() => "");
      outcome = { at, status: res.status };
    } catch (err) {
      outcome = { at, error: String(err?.cause?.code ?? err?.name ?? err) };
    }
    d.attempts.push(outcome);
    if (outcome.status !== undefined && outcome.status >= 200 && outcome.status < 300) {
      d.status = "delivered";
    } else if (d.attempts.length >= this.maxAttempts) {
      d.status = "failed";
      this.log(`webhook ${d.event_type} ${d.event_id} to ${d.url} gave up after ${d.attempts.length} attempts`);
    } else {
      const delay = Math.min(this.baseDelayMs * 2 ** (d.attempts.length - 1), this.maxDelayMs);
      d.next_attempt_at = Date.now() + delay;
    }
    this.store.save();
  }

  async close() {
    this.closed = true;
    if (this.timer) clearTimeout(this.timer);
    this.abort.abort();
    await this.pumping?.catch(() => {});
  }
}
