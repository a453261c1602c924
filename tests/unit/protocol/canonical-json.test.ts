import { describe, expect, it } from "vitest";
import fc from "fast-check";
import canonicalize from "canonicalize";
import { canonicalJson, CanonicalJsonError } from "@/lib/canonical-json";
import { canonicalProtocolContent, hashProtocolContent } from "@/lib/protocol/content-hash";
import { createHash } from "node:crypto";
import { v1Doc, visitsV1 } from "./fixtures";

function fromIeee754(bits: string): number {
  const view = new DataView(new ArrayBuffer(8));
  view.setBigUint64(0, BigInt(`0x${bits}`));
  return view.getFloat64(0);
}

describe("canonicalJson (RFC 8785)", () => {
  it("serialises the RFC 8785 §3.2.2 sample input to its published output", () => {
    // RFC 8785 §3.2.2: input {"numbers": [333333333.33333329, 1E30, 4.50, 2e-3, 0.000000000000000000000000001],
    // "string": "\u20ac$\u000F\u000aA'\u0042\u0022\u005c\\\"\/", "literals": [null, true, false]}
    const input = JSON.parse(
      '{"numbers": [333333333.33333329, 1E30, 4.50, 2e-3, 0.000000000000000000000000001], "string": "\\u20ac$\\u000F\\u000aA\'\\u0042\\u0022\\u005c\\\\\\"\\/", "literals": [null, true, false]}',
    );
    expect(canonicalJson(input)).toBe('{"literals":[null,true,false],"numbers":[333333333.3333333,1e+30,4.5,0.002,1e-27],"string":"€$\\u000f\\nA\'B\\"\\\\\\\\\\"/"}');
  });

  it("sorts property names by UTF-16 code units (RFC 8785 §3.2.3 example)", () => {
    const input = JSON.parse(
      '{"\\u20ac": "Euro Sign", "\\r": "Carriage Return", "\\ufb33": "Hebrew Letter Dalet With Dagesh", "1": "One", "\\ud83d\\ude00": "Emoji: Grinning Face", "\\u0080": "Control", "\\u00f6": "Latin Small Letter O With Diaeresis"}',
    );
    // RFC 8785 §3.2.3 expected order: \r, 1, U+0080, ö, €, 😀, U+FB33
    expect(canonicalJson(input)).toBe(
      '{"\\r":"Carriage Return","1":"One","\u0080":"Control","ö":"Latin Small Letter O With Diaeresis","€":"Euro Sign","😀":"Emoji: Grinning Face","\ufb33":"Hebrew Letter Dalet With Dagesh"}',
    );
  });

  // RFC 8785 Appendix B: IEEE 754 bit patterns and their canonical text.
  const appendixB: [string, string][] = [
    ["0000000000000000", "0"],
    ["8000000000000000", "0"],
    ["0000000000000001", "5e-324"],
    ["8000000000000001", "-5e-324"],
    ["7fefffffffffffff", "1.7976931348623157e+308"],
    ["ffefffffffffffff", "-1.7976931348623157e+308"],
    ["4340000000000000", "9007199254740992"],
    ["c340000000000000", "-9007199254740992"],
    ["4430000000000000", "295147905179352830000"],
    ["44b52d02c7e14af5", "9.999999999999997e+22"],
    ["44b52d02c7e14af6", "1e+23"],
    ["44b52d02c7e14af7", "1.0000000000000001e+23"],
    ["444b1ae4d6e2ef4e", "999999999999999700000"],
    ["444b1ae4d6e2ef4f", "999999999999999900000"],
    ["444b1ae4d6e2ef50", "1e+21"],
    ["3eb0c6f7a0b5ed8c", "9.999999999999997e-7"],
    ["3eb0c6f7a0b5ed8d", "0.000001"],
    ["41b3de4355555553", "333333333.3333332"],
    ["41b3de4355555554", "333333333.33333325"],
    ["41b3de4355555555", "333333333.3333333"],
    ["41b3de4355555556", "333333333.3333334"],
    ["41b3de4355555557", "333333333.33333343"],
    ["becbf647612f3696", "-0.0000033333333333333333"],
    ["43143ff3c1cb0959", "1424953923781206.2"],
  ];
  it.each(appendixB)("number 0x%s serialises as %s (RFC 8785 Appendix B)", (bits, expected) => {
    expect(canonicalJson(fromIeee754(bits))).toBe(expected);
  });

  it("rejects NaN and Infinity (RFC 8785 Appendix B: 7fffffffffffffff, 7ff0000000000000 are errors)", () => {
    expect(() => canonicalJson(fromIeee754("7fffffffffffffff"))).toThrow(CanonicalJsonError);
    expect(() => canonicalJson(fromIeee754("7ff0000000000000"))).toThrow(CanonicalJsonError);
  });

  it("rejects lone surrogates (RFC 8785 §3.1, I-JSON)", () => {
    expect(() => canonicalJson({ a: "\ud800" })).toThrow(/Lone surrogate/);
    expect(() => canonicalJson({ "\udc00": 1 })).toThrow(/Lone surrogate/);
  });

  it("rejects circular structures and non-JSON values", () => {
    const a: Record<string, unknown> = {};
    a.self = a;
    expect(() => canonicalJson(a)).toThrow(/Circular/);
    expect(() => canonicalJson({ f: () => 1 })).toThrow(CanonicalJsonError);
    expect(() => canonicalJson(new Map())).toThrow(/not plain JSON/);
  });

  it("agrees with the canonicalize package (reference) on generated JSON values", () => {
    // Strings without lone surrogates: both must accept them; numbers finite (fc.jsonValue).
    const value = fc.jsonValue({ maxDepth: 4, stringUnit: "grapheme" });
    fc.assert(
      fc.property(value, (v) => {
        expect(canonicalJson(v)).toBe(canonicalize(v));
      }),
      { numRuns: 500 },
    );
  });

  it("agrees with the canonicalize package on generated doubles", () => {
    fc.assert(
      fc.property(fc.double({ noNaN: true, noDefaultInfinity: true }), (n) => {
        expect(canonicalJson([n])).toBe(canonicalize([n]));
      }),
      { numRuns: 2000 },
    );
  });
});

describe("hashProtocolContent", () => {
  it("is the SHA-256 of the canonical JSON of { doc, visitSchedule }", () => {
    const content = { doc: v1Doc, visitSchedule: visitsV1 };
    // Reference: the canonicalize package's output hashed by node:crypto.
    const expected = createHash("sha256").update(canonicalize(content)!, "utf8").digest("hex");
    expect(hashProtocolContent(content)).toBe(expected);
    expect(hashProtocolContent(content)).toMatch(/^[0-9a-f]{64}$/);
  });

  it("gives the same hash whatever the key order", () => {
    const reordered = JSON.parse(JSON.stringify({ doc: v1Doc, visitSchedule: visitsV1 }), (_k, v) =>
      v && typeof v === "object" && !Array.isArray(v) ? Object.fromEntries(Object.entries(v).reverse()) : v,
    );
    expect(Object.keys(reordered)[0]).toBe("visitSchedule"); // every object's keys reversed
    expect(canonicalProtocolContent(reordered)).toBe(canonicalProtocolContent({ doc: v1Doc, visitSchedule: visitsV1 }));
    expect(hashProtocolContent(reordered)).toBe(hashProtocolContent({ doc: v1Doc, visitSchedule: visitsV1 }));
  });

  it("changes when one character of the text changes", () => {
    const changed = JSON.parse(JSON.stringify(v1Doc).replace("96 electrodes", "97 electrodes"));
    expect(hashProtocolContent({ doc: changed, visitSchedule: visitsV1 })).not.toBe(hashProtocolContent({ doc: v1Doc, visitSchedule: visitsV1 }));
  });
});
