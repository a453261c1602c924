// In-memory state of the Stripe fake, saved to a JSON file after every change so a restart keeps it.
import crypto from "node:crypto";
import fs from "node:fs";
import path from "node:path";

const ALPHABET = "0123456789ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz";

/** Stripe-looking id: prefix + 24 random base-62 characters. */
export function newId(prefix) {
  const bytes = crypto.randomBytes(24);
  let s = "";
  for (const b of bytes) s += ALPHABET[b % 62];
  return `${prefix}_${s}`;
}

const SAVE_DELAY_MS = 50;

export const nowSeconds = () => Math.floor(Date.now() / 1000);

function emptyState() {
  return {
    version: 1,
    seq: 0,
    accounts: {}, // id -> { seq, verification, object }
    transfers: {}, // id -> { seq, object }
    reversals: {}, // id -> { seq, object }
    events: {}, // id -> { seq, object }
    webhookEndpoints: {}, // id -> { seq, secret, object }
    deliveries: [], // see webhooks.mjs
    idempotency: {}, // key -> { fingerprint, status, body, createdAt }
    balance: {}, // currency -> available minor units
  };
}

export class Store {
  /** @param {{ file?: string | null }} options file null keeps state in memory only */
  constructor({ file }) {
    this.file = file ?? null;
    this.saveTimer = null;
    this.state = emptyState();
    if (this.file && fs.existsSync(this.file)) {
      const loaded = JSON.parse(fs.readFileSync(this.file, "utf8"));
      if (loaded?.version !== 1) throw new Error(`Stripe fake: unknown state file version in ${this.file}`);
      this.state = { ...emptyState(), ...loaded };
    }
  }

  nextSeq() {
    this.state.seq += 1;
    return this.state.seq;
  }

  /**
   * Marks the state changed; the file is written at most every SAVE_DELAY_MS (rewriting the whole
   * file per request made 1,000 transfers quadratic). close() writes at once.
   */
  save() {
    if (!this.file || this.saveTimer) return;
    this.saveTimer = setTimeout(() => this.writeNow(), SAVE_DELAY_MS);
  }

  /** Writes atomically (temp file + rename) so a crash never leaves half a file. */
  writeNow() {
    if (this.saveTimer) clearTimeout(this.saveTimer);
    this.saveTimer = null;
    if (!this.file) return;
    fs.mkdirSync(path.dirname(this.file), { recursive: true });
    const tmp = `${this.file}.${process.pid}.tmp`;
    fs.writeFileSync(tmp, JSON.stringify(this.state));
    fs.renameSync(tmp, this.file);
  }

  reset() {
    this.state = emptyState();
    this.save();
  }
}

/**
 * Stripe list semantics: newest first, `limit` (1..100, default 10), `starting_after` / `ending_before`
 * cursors, and `created[gt|gte|lt|lte]` or `created=<ts>`.
 * @param {Array<{ seq: number, object: any }>} records
 */
export function listPage(records, params, url, invalid) {
  let rows = [...records].sort((a, b) => b.seq - a.seq).map((r) => r.object);
  const created = params.created;
  if (created !== undefined) {
    if (typeof created === "string") rows = rows.filter((o) => o.created === Number(created));
    else {
      for (const [op, raw] of Object.entries(created)) {
        const v = Number(raw);
        const test = { gt: (c) => c > v, gte: (c) => c >= v, lt: (c) => c < v, lte: (c) => c <= v }[op];
        if (!test || !Number.isFinite(v)) throw invalid(`Invalid created[${op}]`, `created[${op}]`);
        rows = rows.filter((o) => test(o.created));
      }
    }
  }
  const limit = params.limit === undefined ? 10 : Number(params.limit);
  if (!Number.isInteger(limit) || limit < 1 || limit > 100) {
    throw invalid("Invalid integer: limit must be between 1 and 100", "limit");
  }
  let hasMore;
  if (params.starting_after) {
    const i = rows.findIndex((o) => o.id === params.starting_after);
    if (i === -1) throw invalid(`No such object: '${params.starting_after}'`, "starting_after");
    rows = rows.slice(i + 1);
    hasMore = rows.length > limit;
    rows = rows.slice(0, limit);
  } else if (params.ending_before) {
    const i = rows.findIndex((o) => o.id === params.ending_before);
    if (i === -1) throw invalid(`No such object: '${params.ending_before}'`, "ending_before");
    rows = rows.slice(0, i);
    hasMore = rows.length > limit;
    rows = rows.slice(Math.max(0, rows.length - limit));
  } else {
    hasMore = rows.length > limit;
    rows = rows.slice(0, limit);
  }
  return { object: "list", data: rows, has_more: hasMore, url };
}
