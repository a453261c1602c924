// RFC 8785 JSON Canonicalization Scheme (JCS), our one implementation, used for protocol content
// hashes, redline block signatures and payment-run hashes. Client-safe. Checked in tests against
// the `canonicalize` package (kept as a test-only oracle).
// §3.2.2.1 literals, §3.2.2.2 strings (JSON.stringify's escaping is exactly the RFC's:
// \b \t \n \f \r \" \\ and \u00xx lower-case hex for other controls, everything else as is),
// §3.2.2.3 numbers (ECMAScript Number::toString, -0 as 0, NaN/Infinity rejected),
// §3.2.3 object members sorted by the UTF-16 code units of their names.
// §3.1 I-JSON: lone surrogates are rejected rather than escaped.

export class CanonicalJsonError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "CanonicalJsonError";
  }
}

const LONE_SURROGATE = /[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/;

function serializeString(s: string, where: string): string {
  if (LONE_SURROGATE.test(s)) throw new CanonicalJsonError(`Lone surrogate in a string at ${where} (not I-JSON, RFC 8785 §3.1)`);
  return JSON.stringify(s);
}

function serializeNumber(n: number, where: string): string {
  if (!Number.isFinite(n)) throw new CanonicalJsonError(`${n} at ${where} cannot be represented in JSON (RFC 8785 §3.2.2.3)`);
  // ECMAScript Number::toString gives the shortest round-trip form the RFC requires; -0 prints "0".
  return String(n);
}

/** Compare two strings by UTF-16 code units (what JS's default < does on strings). */
function byCodeUnits(a: string, b: string): number {
  return a < b ? -1 : a > b ? 1 : 0;
}

function serialize(value: unknown, where: string, out: string[], seen: Set<object>): void {
  if (value === null) {
    out.push("null");
    return;
  }
  switch (typeof value) {
    case "boolean":
      out.push(value ? "true" : "false");
      return;
    case "number":
      out.push(serializeNumber(value, where));
      return;
    case "string":
      out.push(serializeString(value, where));
      return;
    case "object":
      break;
    default:
      throw new CanonicalJsonError(`A ${typeof value} at ${where} is not JSON`);
  }
  const obj = value as object;
  if (seen.has(obj)) throw new CanonicalJsonError(`Circular reference at ${where}`);
  seen.add(obj);
  if (Array.isArray(obj)) {
    out.push("[");
    obj.forEach((item, i) => {
      if (i > 0) out.push(",");
      // JSON.stringify writes undefined array members as null; so do we.
      serialize(item === undefined ? null : item, `${where}[${i}]`, out, seen);
    });
    out.push("]");
  } else {
    const proto = Object.getPrototypeOf(obj);
    if (proto !== Object.prototype && proto !== null) {
      if (typeof (obj as { toJSON?: unknown }).toJSON === "function") {
        seen.delete(obj);
        serialize((obj as { toJSON: () => unknown }).toJSON(), where, out, seen);
        return;
      }
      throw new CanonicalJsonError(`Object of type ${proto?.constructor?.name ?? "unknown"} at ${where} is not plain JSON`);
    }
    // Members whose value is undefined are omitted, as JSON.stringify does.
    const keys = Object.keys(obj)
      .filter((k) => (obj as Record<string, unknown>)[k] !== undefined)
      .sort(byCodeUnits);
    out.push("{");
    keys.forEach((key, i) => {
      if (i > 0) out.push(",");
      out.push(serializeString(key, `${where}.${key}`), ":");
      serialize((obj as Record<string, unknown>)[key], `${where}.${key}`, out, seen);
    });
    out.push("}");
  }
  seen.delete(obj);
}

/** The RFC 8785 canonical form of a JSON value, as a string (encode it as UTF-8 to hash it). */
export function canonicalJson(value: unknown): string {
  const out: string[] = [];
  serialize(value, "$", out, new Set());
  return out.join("");
}
