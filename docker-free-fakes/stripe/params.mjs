// Parameter checks with Stripe's error wording for the few cases the fake validates.
import { invalidRequest, missingParam, unknownParam } from "./errors.mjs";

/** Refuses parameters an endpoint does not know (Stripe does the same); `expand` is always allowed. */
export function onlyParams(params, allowed) {
  for (const key of Object.keys(params)) {
    if (key !== "expand" && !allowed.includes(key)) throw unknownParam(key);
  }
}

export function requireParam(params, name) {
  const v = params[name];
  if (v === undefined || v === "") throw missingParam(name);
  return v;
}

/** A positive integer in minor units. */
export function parseAmount(raw, param = "amount") {
  if (typeof raw !== "string" || !/^-?\d+$/.test(raw)) {
    throw invalidRequest(`Invalid integer: ${typeof raw === "string" ? raw : JSON.stringify(raw)}`, param, "parameter_invalid_integer");
  }
  const n = Number(raw);
  if (!Number.isSafeInteger(n)) throw invalidRequest(`Invalid integer: ${raw}`, param, "parameter_invalid_integer");
  if (n < 1) throw invalidRequest("This value must be greater than or equal to 1.", param, "parameter_invalid_integer");
  return n;
}

export function parseCurrency(raw) {
  if (typeof raw !== "string" || !/^[a-zA-Z]{3}$/.test(raw)) throw invalidRequest(`Invalid currency: ${raw}`, "currency", "parameter_invalid_string");
  return raw.toLowerCase();
}

export function optionalString(params, name) {
  const v = params[name];
  if (v === undefined) return undefined;
  if (typeof v !== "string") throw invalidRequest(`Invalid string: ${name}`, name, "parameter_invalid_string");
  return v;
}

/** Stripe metadata: strings, at most 50 keys, key ≤ 40 chars, value ≤ 500 chars; "" unsets a key. */
export function mergeMetadata(existing, incoming) {
  if (incoming === undefined) return existing;
  if (incoming === "") return {};
  if (typeof incoming !== "object" || Array.isArray(incoming)) {
    throw invalidRequest("Invalid metadata: metadata must be a hash", "metadata", "parameter_invalid_string");
  }
  const out = { ...existing };
  for (const [k, v] of Object.entries(incoming)) {
    if (typeof v !== "string") throw invalidRequest(`Invalid value for metadata[${k}]: must be a string`, `metadata[${k}]`);
    if (k.length > 40) throw invalidRequest(`Metadata key too long: ${k}`, `metadata[${k}]`);
    if (v.length > 500) throw invalidRequest(`Metadata value too long for key ${k}`, `metadata[${k}]`);
    if (v === "") delete out[k];
    else out[k] = v;
  }
  if (Object.keys(out).length > 50) throw invalidRequest("Metadata can have at most 50 keys", "metadata");
  return out;
}

/** Field-by-field previous values of changed top-level fields, for event data.previous_attributes. */
export function previousAttributes(before, after, fields) {
  const prev = {};
  for (const f of fields) {
    if (JSON.stringify(before[f]) !== JSON.stringify(after[f])) prev[f] = before[f] ?? null;
  }
  return prev;
}
