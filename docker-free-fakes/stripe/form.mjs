// Decodes Stripe-style form bodies: `metadata[run]=7&enabled_events[0]=*&expand[]=x` into nested objects.

/** Splits `a[b][0]` into ["a", "b", "0"]. */
function keyPath(key) {
  const first = key.indexOf("[");
  if (first === -1) return [key];
  const parts = [key.slice(0, first)];
  const re = /\[([^\]]*)\]/g;
  let m;
  while ((m = re.exec(key.slice(first)))) parts.push(m[1] ?? "");
  return parts;
}

/** Objects whose keys are all "0".."n-1" (or pushed with "[]") become arrays. */
function arrayify(value) {
  if (Array.isArray(value)) return value.map(arrayify);
  if (value === null || typeof value !== "object") return value;
  const keys = Object.keys(value);
  const out = {};
  for (const k of keys) out[k] = arrayify(value[k]);
  if (keys.length > 0 && keys.every((k) => /^\d+$/.test(k))) {
    return keys.map(Number).sort((a, b) => a - b).map((i) => out[String(i)]);
  }
  return out;
}

/** @param {string} text application/x-www-form-urlencoded body or query string */
export function parseForm(text) {
  const root = {};
  if (!text) return root;
  for (const [rawKey, value] of new URLSearchParams(text)) {
    const parts = keyPath(rawKey);
    let node = root;
    for (let i = 0; i < parts.length; i += 1) {
      let part = parts[i];
      const last = i === parts.length - 1;
      if (part === "") {
        // "[]" appends: store under the next free numeric key.
        part = String(Object.keys(node).length);
      }
      if (part === "__proto__" || part === "constructor" || part === "prototype") break;
      if (last) {
        node[part] = value;
      } else {
        if (node[part] === undefined || typeof node[part] !== "object") node[part] = {};
        node = node[part];
      }
    }
  }
  return arrayify(root);
}

/** Stable string of parameters for idempotency comparison (key order does not matter). */
export function canonicalParams(value) {
  if (Array.isArray(value)) return `[${value.map(canonicalParams).join(",")}]`;
  if (value !== null && typeof value === "object") {
    return `{${Object.keys(value).sort().map((k) => `${JSON.stringify(k)}:${canonicalParams(value[k])}`).join(",")}}`;
  }
  return JSON.stringify(value);
}
