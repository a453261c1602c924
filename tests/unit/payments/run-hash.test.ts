import { createHash } from "node:crypto";
import { describe, expect, it } from "vitest";
import canonicalize from "canonicalize";
import { canonicalRunContent, groupBySiteAndCurrency, hashRunContent, transferIdempotencyKey } from "@/lib/payments/run-hash";

const lines = [
  { lineKey: "visit:v1", siteId: "s1", currency: "EUR", amountMinor: 138_888n },
  { lineKey: "startup:s2", siteId: "s2", currency: "JPY", amountMinor: 500_000n },
  { lineKey: "visit:v2", siteId: "s1", currency: "EUR", amountMinor: 25n },
];

describe("run content hash (RFC 8785 canonical JSON, SHA-256)", () => {
  it("is the SHA-256 of the canonical JSON the canonicalize package produces", () => {
    const expected = canonicalize({
      run: "r1",
      lines: [
        { lineKey: "visit:v1", siteId: "s1", currency: "EUR", amountMinor: "138888" },
        { lineKey: "visit:v2", siteId: "s1", currency: "EUR", amountMinor: "25" },
        { lineKey: "startup:s2", siteId: "s2", currency: "JPY", amountMinor: "500000" },
      ],
    })!;
    expect(canonicalRunContent("r1", lines)).toBe(expected);
    expect(hashRunContent("r1", lines)).toBe(createHash("sha256").update(expected, "utf8").digest("hex"));
  });

  it("does not depend on line order, but on every amount, key and the run", () => {
    const h = hashRunContent("r1", lines);
    expect(hashRunContent("r1", [...lines].reverse())).toBe(h);
    expect(hashRunContent("r1", lines.map((l, i) => (i === 2 ? { ...l, amountMinor: 26n } : l)))).not.toBe(h);
    expect(hashRunContent("r1", lines.slice(1))).not.toBe(h);
    expect(hashRunContent("r2", lines)).not.toBe(h);
  });

  it("groups one transfer per site and currency with the exact sum", () => {
    const g = groupBySiteAndCurrency(lines);
    expect(g.map((x) => [x.siteId, x.currency, x.amountMinor])).toEqual([
      ["s1", "EUR", 138_913n],
      ["s2", "JPY", 500_000n],
    ]);
  });

  it("derives the idempotency key from run, site and currency only", () => {
    expect(transferIdempotencyKey("r1", "s1", "EUR")).toBe(transferIdempotencyKey("r1", "s1", "eur"));
    expect(transferIdempotencyKey("r1", "s1", "EUR")).not.toBe(transferIdempotencyKey("r1", "s2", "EUR"));
    expect(transferIdempotencyKey("r1", "s1", "EUR").length).toBeLessThanOrEqual(255); // Stripe's key length limit (from memory)
  });
});
