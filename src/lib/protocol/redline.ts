// Redline between two protocol versions: blocks (top-level nodes) are aligned with jsdiff's
// array diff over block signatures (their canonical JSON), removed/added blocks in the same
// hunk are paired when their words are alike, and each paired block is compared word by word
// (diffBlockWords: jsdiff's word tokens, whitespace kept exactly). Output serves an inline view and a side-by-side view.
// Also diffVisitSchedules for the structured schedule of visits. Client-safe.
import { diffArrays } from "diff";
import { canonicalJson } from "@/lib/canonical-json";
import { nodePlainText, topLevelBlocks } from "./plain-text";
import { sanitizeProtocolDoc } from "./sanitize";
import { blockSectionNumbers, listSections } from "./sections";
import type { ProtocolNode } from "./types";
import type { ScheduledVisit } from "./visit-schedule";

export type PartKind = "equal" | "inserted" | "deleted";
export interface WordPart {
  kind: PartKind;
  text: string;
}

/** One block as shown on one side. */
export interface BlockSide {
  /** Index among the top-level blocks of that version. */
  index: number;
  /** Section number ("2.1") of that version, null before the first heading. */
  section: string | null;
  /** Title of that section ("" before the first heading). */
  sectionTitle: string;
  type: string;
  /** Heading level for headings. */
  level?: number;
  text: string;
  /** Left side: equal + deleted parts; right side: equal + inserted parts. */
  parts: WordPart[];
}

export type RowKind = "equal" | "changed" | "inserted" | "deleted";

/** A side-by-side row: left is the earlier version, right the later one. */
export interface RedlineRow {
  kind: RowKind;
  left: BlockSide | null;
  right: BlockSide | null;
  /** A changed block whose text is the same (formatting, links or block type changed). */
  formatOnly: boolean;
}

/**
 * A block of the inline view: all parts in reading order (deletions before insertions), except
 * whitespace-only deletions next to an insertion (a line break replaced by a space reads as the space).
 */
export interface InlineBlock {
  kind: RowKind;
  section: string | null;
  sectionTitle: string;
  type: string;
  level?: number;
  parts: WordPart[];
  formatOnly: boolean;
  leftIndex: number | null;
  rightIndex: number | null;
}

export interface RedlineStats {
  equal: number;
  changed: number;
  inserted: number;
  deleted: number;
  wordsInserted: number;
  wordsDeleted: number;
}

export interface Redline {
  rows: RedlineRow[];
  inline: InlineBlock[];
  stats: RedlineStats;
  hasChanges: boolean;
}

/** Pairs in a hunk are considered the same block edited when this alike (Dice on words). */
const PAIR_SIMILARITY = 0.35;
/** Above this many candidate pairs in one hunk, pair in order instead of by similarity. */
const MAX_PAIRING_CELLS = 40_000;

interface PreparedBlock {
  node: ProtocolNode;
  index: number;
  section: string | null;
  sectionTitle: string;
  text: string;
  words: Map<string, number> | null;
  wordCount: number;
}

function prepare(doc: ProtocolNode): { blocks: PreparedBlock[]; signatures: string[] } {
  const numbers = blockSectionNumbers(doc);
  const titles = new Map(listSections(doc).map((s) => [s.number, s.title]));
  const blocks = topLevelBlocks(doc).map((node, index) => {
    const section = numbers[index] ?? null;
    return {
      node,
      index,
      section,
      sectionTitle: section ? titles.get(section) ?? "" : "",
      text: nodePlainText(node),
      words: null,
      wordCount: 0,
    };
  });
  return { blocks, signatures: blocks.map((b) => canonicalJson(b.node)) };
}

function wordBag(block: PreparedBlock): Map<string, number> {
  if (!block.words) {
    const bag = new Map<string, number>();
    let count = 0;
    for (const w of block.text.split(/\s+/)) {
      if (!w) continue;
      bag.set(w, (bag.get(w) ?? 0) + 1);
      count++;
    }
    block.words = bag;
    block.wordCount = count;
  }
  return block.words;
}

function similarity(a: PreparedBlock, b: PreparedBlock): number {
  if (a.node.type !== b.node.type) return 0;
  const bagA = wordBag(a);
  const bagB = wordBag(b);
  if (a.wordCount === 0 && b.wordCount === 0) return 1;
  let common = 0;
  for (const [w, n] of bagA) common += Math.min(n, bagB.get(w) ?? 0);
  return (2 * common) / (a.wordCount + b.wordCount);
}

function countWords(text: string): number {
  let n = 0;
  for (const w of text.split(/\s+/)) if (w) n++;
  return n;
}

function side(block: PreparedBlock, parts: WordPart[]): BlockSide {
  const level = block.node.type === "heading" ? Number(block.node.attrs?.level) : undefined;
  return {
    index: block.index,
    section: block.section,
    sectionTitle: block.sectionTitle,
    type: block.node.type,
    ...(level !== undefined ? { level } : {}),
    text: block.text,
    parts,
  };
}

function wholeText(text: string, kind: PartKind): WordPart[] {
  return text ? [{ kind, text }] : [];
}

// Word tokens as jsdiff's diffWords sees them: runs of (extended Latin) word characters, or
// single punctuation marks; whitespace runs are kept apart so both texts can be rebuilt exactly.
const WORD_CHARS = "a-zA-Z0-9_\\u{AD}\\u{C0}-\\u{D6}\\u{D8}-\\u{F6}\\u{F8}-\\u{2C6}\\u{2C8}-\\u{2D7}\\u{2DE}-\\u{2FF}\\u{1E00}-\\u{1EFF}";
const TOKEN = new RegExp(`[${WORD_CHARS}]+|\\s+|[^${WORD_CHARS}]`, "gu");
const SPACE = /^\s/;

interface Tokens {
  lead: string;
  words: string[];
  /** Whitespace after each word ("" when the next token follows directly). */
  trail: string[];
}

function tokenize(text: string): Tokens {
  const out: Tokens = { lead: "", words: [], trail: [] };
  for (const part of text.match(TOKEN) ?? []) {
    if (SPACE.test(part)) {
      if (out.words.length === 0) out.lead += part;
      else out.trail[out.trail.length - 1] += part;
    } else {
      out.words.push(part);
      out.trail.push("");
    }
  }
  return out;
}

/**
 * Word-level parts of a changed block. Words are aligned with jsdiff's array diff over the
 * same tokens diffWords uses, so the words marked inserted or deleted agree with diffWords;
 * unlike diffWords (which keeps only one side's spacing) each side's whitespace is kept exactly,
 * as diffWordsWithSpace does, but whitespace never anchors an alignment (with spaces as tokens a
 * minimal diff may keep the spaces and delete and re-insert common words).
 */
export function diffBlockWords(before: string, after: string): WordPart[] {
  const a = tokenize(before);
  const b = tokenize(after);
  const parts: WordPart[] = [];
  const emit = (kind: PartKind, text: string) => {
    if (!text) return;
    const last = parts[parts.length - 1];
    if (last && last.kind === kind) last.text += text;
    else parts.push({ kind, text });
  };
  const spacing = (x: string, y: string) => {
    if (x === y) emit("equal", x);
    else {
      emit("deleted", x);
      emit("inserted", y);
    }
  };
  spacing(a.lead, b.lead);
  let ia = 0;
  let ib = 0;
  let deleted = "";
  let inserted = "";
  const flushHunk = () => {
    // A replacement's shared trailing whitespace reads as unchanged: "[twelve][twenty-four] months".
    let common = "";
    if (deleted && inserted) {
      const wsA = /\s*$/.exec(deleted)![0];
      const wsB = /\s*$/.exec(inserted)![0];
      while (common.length < Math.min(wsA.length, wsB.length) && wsA[wsA.length - 1 - common.length] === wsB[wsB.length - 1 - common.length])
        common = wsA[wsA.length - 1 - common.length] + common;
    }
    emit("deleted", deleted.slice(0, deleted.length - common.length));
    emit("inserted", inserted.slice(0, inserted.length - common.length));
    emit("equal", common);
    deleted = inserted = "";
  };
  for (const change of diffArrays(a.words, b.words)) {
    if (change.removed) for (let n = 0; n < change.count; n++, ia++) deleted += a.words[ia]! + a.trail[ia]!;
    else if (change.added) for (let n = 0; n < change.count; n++, ib++) inserted += b.words[ib]! + b.trail[ib]!;
    else {
      flushHunk();
      for (let n = 0; n < change.count; n++, ia++, ib++) {
        emit("equal", a.words[ia]!);
        spacing(a.trail[ia]!, b.trail[ib]!);
      }
    }
  }
  flushHunk();
  return parts;
}

type Step = { op: "pair"; a: PreparedBlock; b: PreparedBlock } | { op: "del"; a: PreparedBlock } | { op: "ins"; b: PreparedBlock };

/** Align the removed and added blocks of one hunk: an LCS-like alignment maximising similarity. */
function alignHunk(removed: PreparedBlock[], added: PreparedBlock[]): Step[] {
  const k = removed.length;
  const m = added.length;
  if (k === 0) return added.map((b) => ({ op: "ins", b }));
  if (m === 0) return removed.map((a) => ({ op: "del", a }));
  if (k * m > MAX_PAIRING_CELLS) {
    const steps: Step[] = [];
    for (let i = 0; i < Math.max(k, m); i++) {
      const a = removed[i];
      const b = added[i];
      if (a && b && similarity(a, b) >= PAIR_SIMILARITY) steps.push({ op: "pair", a, b });
      else {
        if (a) steps.push({ op: "del", a });
        if (b) steps.push({ op: "ins", b });
      }
    }
    return steps;
  }
  const sim: number[] = new Array(k * m);
  for (let i = 0; i < k; i++) for (let j = 0; j < m; j++) sim[i * m + j] = similarity(removed[i]!, added[j]!);
  // score[(i)*(m+1)+j] = best total similarity aligning removed[0..i) with added[0..j)
  const W = m + 1;
  const score = new Float64Array((k + 1) * W);
  for (let i = 1; i <= k; i++)
    for (let j = 1; j <= m; j++) {
      let best = Math.max(score[(i - 1) * W + j]!, score[i * W + j - 1]!);
      const s = sim[(i - 1) * m + (j - 1)]!;
      if (s >= PAIR_SIMILARITY) best = Math.max(best, score[(i - 1) * W + j - 1]! + s);
      score[i * W + j] = best;
    }
  const steps: Step[] = [];
  let i = k;
  let j = m;
  while (i > 0 || j > 0) {
    const here = score[i * W + j]!;
    if (i > 0 && j > 0) {
      const s = sim[(i - 1) * m + (j - 1)]!;
      if (s >= PAIR_SIMILARITY && here === score[(i - 1) * W + j - 1]! + s) {
        steps.push({ op: "pair", a: removed[i - 1]!, b: added[j - 1]! });
        i--;
        j--;
        continue;
      }
    }
    if (j > 0 && (i === 0 || here === score[i * W + j - 1]!)) {
      steps.push({ op: "ins", b: added[j - 1]! });
      j--;
    } else {
      steps.push({ op: "del", a: removed[i - 1]! });
      i--;
    }
  }
  return steps.reverse();
}

/** Compare two stored protocol documents (earlier first). */
export function computeRedline(beforeDoc: unknown, afterDoc: unknown): Redline {
  const before = prepare(sanitizeProtocolDoc(beforeDoc));
  const after = prepare(sanitizeProtocolDoc(afterDoc));
  // Intern signatures as small integers so the array diff compares numbers.
  const ids = new Map<string, number>();
  const intern = (s: string) => {
    let id = ids.get(s);
    if (id === undefined) ids.set(s, (id = ids.size));
    return id;
  };
  const changes = diffArrays(before.signatures.map(intern), after.signatures.map(intern));

  const rows: RedlineRow[] = [];
  const rowParts: WordPart[][] = []; // inline parts of each row, in reading order
  const push = (row: RedlineRow, parts: WordPart[]) => {
    rows.push(row);
    rowParts.push(parts);
  };
  let ai = 0;
  let bi = 0;
  let removed: PreparedBlock[] = [];
  let added: PreparedBlock[] = [];
  const flush = () => {
    for (const step of alignHunk(removed, added)) {
      if (step.op === "del") {
        const parts = wholeText(step.a.text, "deleted");
        push({ kind: "deleted", left: side(step.a, parts), right: null, formatOnly: false }, parts);
      } else if (step.op === "ins") {
        const parts = wholeText(step.b.text, "inserted");
        push({ kind: "inserted", left: null, right: side(step.b, parts), formatOnly: false }, parts);
      } else {
        const parts = step.a.text === step.b.text ? wholeText(step.a.text, "equal") : diffBlockWords(step.a.text, step.b.text);
        // The inline view shows the new layout: whitespace deleted where other whitespace is inserted is left out.
        const inlineParts = parts.filter(
          (x, i) => !(x.kind === "deleted" && !x.text.trim() && (parts[i + 1]?.kind === "inserted" || parts[i - 1]?.kind === "inserted")),
        );
        push({
          kind: "changed",
          left: side(step.a, parts.filter((p) => p.kind !== "inserted")),
          right: side(step.b, parts.filter((p) => p.kind !== "deleted")),
          formatOnly: step.a.text === step.b.text,
        }, inlineParts);
      }
    }
    removed = [];
    added = [];
  };
  for (const change of changes) {
    if (change.removed) {
      for (let n = 0; n < change.count; n++) removed.push(before.blocks[ai++]!);
    } else if (change.added) {
      for (let n = 0; n < change.count; n++) added.push(after.blocks[bi++]!);
    } else {
      flush();
      for (let n = 0; n < change.count; n++) {
        const a = before.blocks[ai++]!;
        const b = after.blocks[bi++]!;
        const parts = wholeText(b.text, "equal");
        push({ kind: "equal", left: side(a, parts), right: side(b, parts), formatOnly: false }, parts);
      }
    }
  }
  flush();

  const stats: RedlineStats = { equal: 0, changed: 0, inserted: 0, deleted: 0, wordsInserted: 0, wordsDeleted: 0 };
  const inline: InlineBlock[] = rows.map((row, r) => {
    stats[row.kind]++;
    const shown = (row.right ?? row.left)!;
    const parts = rowParts[r]!;
    for (const p of parts) {
      if (p.kind === "inserted") stats.wordsInserted += countWords(p.text);
      if (p.kind === "deleted") stats.wordsDeleted += countWords(p.text);
    }
    return {
      kind: row.kind,
      section: shown.section,
      sectionTitle: shown.sectionTitle,
      type: shown.type,
      ...(shown.level !== undefined ? { level: shown.level } : {}),
      parts,
      formatOnly: row.formatOnly,
      leftIndex: row.left?.index ?? null,
      rightIndex: row.right?.index ?? null,
    };
  });
  return { rows, inline, stats, hasChanges: stats.changed + stats.inserted + stats.deleted > 0 };
}

// ---------------------------------------------------------------------------------------
// Schedule of visits

export const visitFields = ["label", "anchor", "dayOffset", "windowBefore", "windowAfter", "procedures"] as const;
export type VisitField = (typeof visitFields)[number];

export interface VisitFieldChange {
  field: VisitField;
  before: ScheduledVisit[VisitField];
  after: ScheduledVisit[VisitField];
}

export interface ChangedVisit {
  code: string;
  before: ScheduledVisit;
  after: ScheduledVisit;
  fields: VisitFieldChange[];
}

export interface VisitScheduleDiff {
  added: ScheduledVisit[];
  removed: ScheduledVisit[];
  changed: ChangedVisit[];
  unchanged: string[];
  /** The visits both versions share appear in another order. */
  orderChanged: boolean;
  hasChanges: boolean;
}

function sameField(a: unknown, b: unknown): boolean {
  if (Array.isArray(a) || Array.isArray(b)) {
    const x = Array.isArray(a) ? a : [];
    const y = Array.isArray(b) ? b : [];
    return x.length === y.length && x.every((v, i) => v === y[i]);
  }
  return a === b;
}

/** Visits are matched by code: added, removed, and changed with field-by-field before/after. */
export function diffVisitSchedules(before: readonly ScheduledVisit[], after: readonly ScheduledVisit[]): VisitScheduleDiff {
  const beforeByCode = new Map(before.map((v) => [v.code, v]));
  const afterByCode = new Map(after.map((v) => [v.code, v]));
  const added = after.filter((v) => !beforeByCode.has(v.code));
  const removed = before.filter((v) => !afterByCode.has(v.code));
  const changed: ChangedVisit[] = [];
  const unchanged: string[] = [];
  for (const b of after) {
    const a = beforeByCode.get(b.code);
    if (!a) continue;
    const fields: VisitFieldChange[] = [];
    for (const field of visitFields) {
      const x = field === "procedures" ? a.procedures ?? [] : a[field];
      const y = field === "procedures" ? b.procedures ?? [] : b[field];
      if (!sameField(x, y)) fields.push({ field, before: x, after: y } as VisitFieldChange);
    }
    if (fields.length) changed.push({ code: b.code, before: a, after: b, fields });
    else unchanged.push(b.code);
  }
  const sharedBefore = before.filter((v) => afterByCode.has(v.code)).map((v) => v.code);
  const sharedAfter = after.filter((v) => beforeByCode.has(v.code)).map((v) => v.code);
  const orderChanged = sharedBefore.some((code, i) => sharedAfter[i] !== code);
  return { added, removed, changed, unchanged, orderChanged, hasChanges: added.length + removed.length + changed.length > 0 || orderChanged };
}
