// Separate ethics-committee files: the `parts` option of buildEthicsPackagePdf.
import { describe, expect, it } from "vitest";
import { buildEthicsPackagePdf } from "@/lib/protocol/pdf";
import { hashProtocolContent } from "@/lib/protocol/content-hash";
import { v1Doc, v2Doc, visitsV1, visitsV2 } from "./fixtures";

const pages = (pdf: Buffer) => [...pdf.toString("latin1").matchAll(/\/Type \/Page\b/g)].length;
const base = {
  studyCode: "KESTREL-VP",
  versionLabel: "2.0",
  date: "2026-11-30",
  contentHash: hashProtocolContent({ doc: v2Doc, visitSchedule: visitsV2 }),
  doc: v2Doc,
  visitSchedule: visitsV2,
  parent: { versionLabel: "1.0", doc: v1Doc, visitSchedule: visitsV1 },
  summaryOfChanges: [{ section: "1 Design", before: "24 months", after: "36 months", rationale: "Longer follow-up" }],
  compress: false,
};

describe("PDF parts", () => {
  it("each single part is shorter than the whole package, and together they make it up", async () => {
    const whole = pages(await buildEthicsPackagePdf(base));
    const each = await Promise.all((["clean", "tracked", "summary"] as const).map(async (p) => pages(await buildEthicsPackagePdf({ ...base, parts: [p] }))));
    for (const n of each) expect(n).toBeLessThan(whole);
    expect(each.reduce((a, b) => a + b, 0)).toBe(whole);
  });

  it("a tracked-changes copy of an original protocol says there is nothing to compare with", async () => {
    const pdf = await buildEthicsPackagePdf({ ...base, parent: null, parts: ["tracked"] });
    expect(pages(pdf)).toBe(1);
  });
});
