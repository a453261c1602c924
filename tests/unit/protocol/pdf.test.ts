import { describe, expect, it } from "vitest";
import { inflateSync } from "node:zlib";
import { buildEthicsPackagePdf, type EthicsPackageInput } from "@/lib/protocol/pdf";
import { hashProtocolContent } from "@/lib/protocol/content-hash";
import { computeRedline, diffVisitSchedules } from "@/lib/protocol/redline";
import { prefillSummaryOfChanges } from "@/lib/protocol/summary-of-changes";
import { doc, h, p, v1Doc, v2Doc, visitsV1, visitsV2 } from "./fixtures";

/** Text drawn in standard fonts (footer hash) is written as hex WinAnsi strings in the page streams. */
function standardFontText(pdf: Buffer): string {
  const body = pdf.toString("latin1");
  return [...body.matchAll(/<([0-9a-fA-F]+)>/g)].map((m) => Buffer.from(m[1]!, "hex").toString("latin1")).join("");
}

function pageCount(pdf: Buffer): number {
  return [...pdf.toString("latin1").matchAll(/\/Type \/Page\b/g)].length;
}

function input(overrides: Partial<EthicsPackageInput> = {}): EthicsPackageInput {
  const rows = prefillSummaryOfChanges(computeRedline(v1Doc, v2Doc), diffVisitSchedules(visitsV1, visitsV2)).map((r) => ({ ...r, rationale: "Longer follow-up." }));
  return {
    studyCode: "KESTREL-VP",
    versionLabel: "2.0",
    amendmentLabel: "Amendment 1 (substantial)",
    date: "2026-11-30",
    contentHash: hashProtocolContent({ doc: v2Doc, visitSchedule: visitsV2 }),
    doc: v2Doc,
    visitSchedule: visitsV2,
    parent: { versionLabel: "1.0", doc: v1Doc, visitSchedule: visitsV1 },
    summaryOfChanges: rows,
    compress: false,
    ...overrides,
  };
}

describe("buildEthicsPackagePdf", () => {
  it("builds a PDF with clean copy, tracked changes and summary, the hash in every footer", async () => {
    const i = input();
    const pdf = await buildEthicsPackagePdf(i);
    expect(pdf.subarray(0, 5).toString("latin1")).toBe("%PDF-");
    const pages = pageCount(pdf);
    expect(pages).toBeGreaterThanOrEqual(3);
    expect(pages).toBeLessThanOrEqual(5);
    const text = standardFontText(pdf);
    const footers = text.split(`SHA-256 ${i.contentHash}`).length - 1;
    expect(footers).toBe(pages);
    // The Atkinson font is embedded (fontkit subset), not substituted.
    expect(pdf.toString("latin1")).toMatch(/\/BaseFont \/[A-Z]{6}\+AtkinsonHyperlegibleNext/);
  });

  it("has no tracked-changes part without a parent", async () => {
    const withParent = pageCount(await buildEthicsPackagePdf(input()));
    const original = pageCount(await buildEthicsPackagePdf(input({ parent: null, summaryOfChanges: [] })));
    expect(original).toBe(withParent - 1);
  });

  it("grows with the document and keeps a footer on every page", async () => {
    const long = doc(...Array.from({ length: 60 }, (_, n) => [h(1, `Section ${n + 1}`), p("Subjects attend the clinic at each scheduled visit. ".repeat(12))]).flat());
    const i = input({ doc: long, parent: { versionLabel: "1.0", doc: v1Doc, visitSchedule: visitsV1 }, contentHash: hashProtocolContent({ doc: long, visitSchedule: visitsV2 }) });
    const pdf = await buildEthicsPackagePdf(i);
    const pages = pageCount(pdf);
    expect(pages).toBeGreaterThan(10);
    expect(pages).toBeLessThan(60);
    expect(standardFontText(pdf).split(i.contentHash).length - 1).toBe(pages);
  });

  it("continues a summary row taller than a page on the next pages", async () => {
    const long = "Subjects attend the clinic at each scheduled visit and complete the reading test. ".repeat(120);
    const rows = [{ section: "2 Objectives", before: long, after: `${long} Then a final visit.`, rationale: "Longer follow-up." }];
    const short = pageCount(await buildEthicsPackagePdf(input({ parent: null, summaryOfChanges: [{ ...rows[0]!, before: "a", after: "b" }] })));
    const pdf = await buildEthicsPackagePdf(input({ parent: null, summaryOfChanges: rows }));
    expect(pageCount(pdf)).toBeGreaterThan(short + 2);
    expect(standardFontText(pdf).split(input().contentHash).length - 1).toBe(pageCount(pdf));
  });

  it("draws characters the Atkinson font lacks (µ, ≥) without failing", async () => {
    const d = doc(h(1, "Stimulation ≥ 2 µA"), p("Age ≥ 18 years; current ≤ 50 µA → stop."));
    const pdf = await buildEthicsPackagePdf(input({ doc: d, parent: null, summaryOfChanges: [] }));
    const body = pdf.toString("latin1");
    expect(body).toContain("/BaseFont /Helvetica"); // µ from the standard font
    expect(standardFontText(pdf)).toContain("µ");
  });

  it("compresses by default", async () => {
    const pdf = await buildEthicsPackagePdf(input({ compress: true }));
    expect(pdf.toString("latin1")).toContain("/FlateDecode");
    // Still the same hash once the streams are inflated.
    const body = pdf.toString("latin1");
    let inflated = "";
    for (const m of body.matchAll(/stream\r?\n/g)) {
      const start = m.index! + m[0].length;
      const end = body.indexOf("endstream", start);
      try {
        inflated += inflateSync(pdf.subarray(start, end)).toString("latin1");
      } catch {
        /* not a deflate stream */
      }
    }
    expect(standardFontText(Buffer.from(inflated, "latin1"))).toContain(input().contentHash);
  });
});
