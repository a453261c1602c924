import { describe, expect, it } from "vitest";
import { blockSectionNumbers, listSections, sectionLabel, sectionNumberingCss, sectionOfBlock } from "@/lib/protocol/sections";
import { doc, h, p, v1Doc } from "./fixtures";

// Numbering rule (common practice for protocols, and the CSS counter rule the stylesheet uses):
// a heading increments its level and resets the deeper levels.
describe("sections", () => {
  it("numbers headings 1, 1.1, 1.1.1 and restarts deeper levels", () => {
    const d = doc(h(1, "Introduction"), h(2, "Background"), h(3, "Bench work"), h(3, "Animal work"), h(2, "Rationale"), h(1, "Objectives"), h(2, "Primary"), h(3, "Safety"));
    expect(listSections(d).map((s) => [s.number, s.title])).toEqual([
      ["1", "Introduction"],
      ["1.1", "Background"],
      ["1.1.1", "Bench work"],
      ["1.1.2", "Animal work"],
      ["1.2", "Rationale"],
      ["2", "Objectives"],
      ["2.1", "Primary"],
      ["2.1.1", "Safety"],
    ]);
  });

  it("gives path and block index of each heading, and levels", () => {
    expect(listSections(v1Doc)).toEqual([
      { number: "1", title: "Introduction", level: 1, blockIndex: 1, path: [1] },
      { number: "1.1", title: "Background", level: 2, blockIndex: 3, path: [3] },
      { number: "2", title: "Objectives", level: 1, blockIndex: 5, path: [5] },
      { number: "3", title: "Visits", level: 1, blockIndex: 8, path: [8] },
    ]);
  });

  // These edge numbers were compared with the CSS counters rendered by headless Chromium.
  it("numbers orphan and skipped levels as CSS counters do (0.1, 2.0.1)", () => {
    const d = doc(h(3, "Orphan 3"), h(2, "Orphan 2"), h(1, "First"), h(2, "A"), h(1, "Second"), h(3, "Skipped"), h(2, "B"));
    expect(listSections(d).map((s) => s.number)).toEqual(["0.0.1", "0.1", "1", "1.1", "2", "2.0.1", "2.1"]);
  });

  it("tells the section of every block, null before the first heading", () => {
    expect(blockSectionNumbers(v1Doc)).toEqual([null, "1", "1", "1.1", "1.1", "2", "2", "2", "3", "3"]);
    expect(sectionOfBlock(v1Doc, 0)).toBeNull();
    expect(sectionOfBlock(v1Doc, 4)?.number).toBe("1.1");
    expect(sectionOfBlock(v1Doc, 5)?.title).toBe("Objectives");
    expect(sectionLabel(sectionOfBlock(v1Doc, 7))).toBe("2 Objectives");
    expect(sectionLabel(null)).toBe("Front matter");
  });

  it("ignores headings nested in lists or cells and empty docs", () => {
    const nested = doc({ type: "bulletList", content: [{ type: "listItem", content: [h(1, "Not a section")] }] }, h(1, "Real"), p("x"));
    expect(listSections(nested).map((s) => s.number)).toEqual(["1"]);
    expect(listSections({ type: "doc" })).toEqual([]);
  });

  it("ships CSS counters for the three levels on direct children", () => {
    expect(sectionNumberingCss).toContain(".cairn-section-numbers { counter-reset: cairn-s1; }");
    expect(sectionNumberingCss).toContain("> h1 { counter-increment: cairn-s1; counter-reset: cairn-s2 cairn-s3; }");
    expect(sectionNumberingCss).toContain("> h2 { counter-increment: cairn-s2; counter-reset: cairn-s3; }");
    expect(sectionNumberingCss).toContain('> h3::before { content: counter(cairn-s1) "." counter(cairn-s2) "." counter(cairn-s3)');
  });
});
