// Section numbers (1, 1.1, 1.1.1) for the top-level headings of a protocol.
// The numbering follows CSS counter semantics so that `sectionNumberingCss` shows the same
// numbers in the editor and the rendered view: a heading increments its level's counter and
// resets the deeper ones; a level-2 heading before any level-1 heading is numbered "0.1".
// Headings nested in lists or table cells are not sections. Client-safe.
import type { ProtocolNode } from "./types";
import { nodePlainText, topLevelBlocks } from "./plain-text";

export interface Section {
  /** "1", "1.2", "1.2.3" */
  number: string;
  title: string;
  level: 1 | 2 | 3;
  /** Index of the heading among the document's top-level blocks. */
  blockIndex: number;
  /** ProseMirror-style path from the doc to the heading: [blockIndex]. */
  path: number[];
}

function headingLevel(node: ProtocolNode): 1 | 2 | 3 | null {
  if (node.type !== "heading") return null;
  const level = node.attrs?.level;
  return level === 1 || level === 2 || level === 3 ? level : null;
}

/** Section number of each top-level block: the number of the nearest heading at or before it (null before the first). */
export function blockSectionNumbers(doc: ProtocolNode): (string | null)[] {
  const counters = [0, 0, 0];
  let current: string | null = null;
  return topLevelBlocks(doc).map((block) => {
    const level = headingLevel(block);
    if (level !== null) {
      counters[level - 1]! += 1;
      for (let i = level; i < 3; i++) counters[i] = 0;
      current = counters.slice(0, level).join(".");
    }
    return current;
  });
}

export function listSections(doc: ProtocolNode): Section[] {
  const numbers = blockSectionNumbers(doc);
  const sections: Section[] = [];
  topLevelBlocks(doc).forEach((block, index) => {
    const level = headingLevel(block);
    if (level === null) return;
    sections.push({ number: numbers[index]!, title: nodePlainText(block).trim(), level, blockIndex: index, path: [index] });
  });
  return sections;
}

/** Section a top-level block belongs to (the heading itself for a heading), or null before the first heading. */
export function sectionOfBlock(doc: ProtocolNode, blockIndex: number): Section | null {
  let found: Section | null = null;
  for (const s of listSections(doc)) {
    if (s.blockIndex > blockIndex) break;
    found = s;
  }
  return found;
}

/** Label used in tables: "3.2 Title", or "Front matter" for blocks before the first heading. */
export function sectionLabel(section: Pick<Section, "number" | "title"> | null): string {
  return section ? `${section.number} ${section.title}`.trim() : "Front matter";
}

/** Class to put on the element that directly contains the document's blocks. */
export const sectionNumberingClass = "cairn-section-numbers";

/**
 * CSS for section numbers. The wrapper resets only the top counter: a wrapper-level reset of the
 * deeper counters would outlive the headings' own resets (seen in Chromium: "2.2.3" after "1.2").
 * Checked in headless Chromium against listSections on a document with orphan and skipped levels. In the editor put the class on the ProseMirror element
 * (editorProps.attributes.class), in the rendered view on the wrapper of renderProtocolHtml's output.
 */
export const sectionNumberingCss = `
.${sectionNumberingClass} { counter-reset: cairn-s1; }
.${sectionNumberingClass} > h1 { counter-increment: cairn-s1; counter-reset: cairn-s2 cairn-s3; }
.${sectionNumberingClass} > h2 { counter-increment: cairn-s2; counter-reset: cairn-s3; }
.${sectionNumberingClass} > h3 { counter-increment: cairn-s3; }
.${sectionNumberingClass} > h1::before { content: counter(cairn-s1) "\\2002"; }
.${sectionNumberingClass} > h2::before { content: counter(cairn-s1) "." counter(cairn-s2) "\\2002"; }
.${sectionNumberingClass} > h3::before { content: counter(cairn-s1) "." counter(cairn-s2) "." counter(cairn-s3) "\\2002"; }
`.trim();
