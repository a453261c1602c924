// Redline benchmark: two invented protocols of about 25,000 words, about 5% of the words
// changed (seeded, so every run compares the same pair). Prints the median time of our
// block-then-word redline and of jsdiff's diffWords over the same plain text.
// Run: npx tsx scripts/bench/redline.ts [runs]
import { performance } from "node:perf_hooks";
import { diffWords } from "diff";
import { computeRedline } from "../../src/lib/protocol/redline";
import { nodePlainText } from "../../src/lib/protocol/plain-text";
import type { ProtocolDoc, ProtocolNode } from "../../src/lib/protocol/types";
import { seededRandom } from "../lib/seeded-random";

const mulberry32 = seededRandom;

const vocabulary = (
  "subject visit implant electrode stimulation threshold phosphene safety adverse event device investigator site " +
  "window month follow-up consent enrolment screening procedure assessment acuity reading mapping cortex array " +
  "the a of to and in at on with for by within after before each every all is are be shall may must not " +
  "report record review record sponsor monitor committee approval deviation schedule protocol amendment version"
).split(" ");

const TARGET_WORDS = 25_000;

function words(rand: () => number, n: number): string[] {
  return Array.from({ length: n }, () => vocabulary[Math.floor(rand() * vocabulary.length)]!);
}

const text = (s: string): ProtocolNode => ({ type: "text", text: s });
const para = (w: string[]): ProtocolNode => ({ type: "paragraph", content: [text(`${w.join(" ")}.`)] });

function generate(seed: number): ProtocolDoc {
  const rand = mulberry32(seed);
  const content: ProtocolNode[] = [];
  let count = 0;
  let section = 0;
  while (count < TARGET_WORDS) {
    const r = rand();
    if (content.length === 0 || r < 0.08) {
      const level = section++ % 5 === 0 ? 1 : rand() < 0.6 ? 2 : 3;
      const title = words(rand, 2 + Math.floor(rand() * 4));
      content.push({ type: "heading", attrs: { level }, content: [text(title.join(" "))] });
      count += title.length;
    } else if (r < 0.14) {
      const items = Array.from({ length: 2 + Math.floor(rand() * 4) }, () => words(rand, 5 + Math.floor(rand() * 15)));
      content.push({ type: "bulletList", content: items.map((w) => ({ type: "listItem", content: [para(w)] })) });
      count += items.reduce((s, w) => s + w.length, 0);
    } else if (r < 0.16) {
      const rows = Array.from({ length: 4 }, () => Array.from({ length: 4 }, () => words(rand, 1 + Math.floor(rand() * 3))));
      content.push({
        type: "table",
        content: rows.map((row, i) => ({
          type: "tableRow",
          content: row.map((w) => ({ type: i === 0 ? "tableHeader" : "tableCell", attrs: { colspan: 1, rowspan: 1, colwidth: null }, content: [para(w)] })),
        })),
      });
      count += rows.flat().reduce((s, w) => s + w.length, 0);
    } else {
      const w = words(rand, 40 + Math.floor(rand() * 80));
      content.push(para(w));
      count += w.length;
    }
  }
  return { type: "doc", content };
}

/** Change about `share` of the words (replace, insert or delete, spread over the text nodes). */
function amend(doc: ProtocolDoc, share: number, seed: number): { doc: ProtocolDoc; changed: number; blocksMoved: number } {
  const rand = mulberry32(seed);
  let changed = 0;
  const visit = (node: ProtocolNode): ProtocolNode => {
    if (node.type === "text") {
      const out: string[] = [];
      for (const w of node.text!.split(" ")) {
        if (rand() >= share) {
          out.push(w);
          continue;
        }
        changed++;
        const op = rand();
        const other = vocabulary[Math.floor(rand() * vocabulary.length)]!;
        if (op < 0.5) out.push(other);
        else if (op < 0.75) out.push(w, other);
        // else: deleted
      }
      return { ...node, text: out.join(" ") || "x" };
    }
    return node.content ? { ...node, content: node.content.map(visit) } : node;
  };
  // A few whole paragraphs also go or come, so the block alignment has hunks to pair.
  const content: ProtocolNode[] = [];
  let blocksMoved = 0;
  for (const block of (visit(doc) as ProtocolDoc).content ?? []) {
    const r = rand();
    if (block.type === "paragraph" && r < 0.01) {
      blocksMoved++;
      continue;
    }
    content.push(block);
    if (r > 0.99) {
      content.push(para(words(rand, 30)));
      blocksMoved++;
    }
  }
  return { doc: { type: "doc", content }, changed, blocksMoved };
}

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m]! : (s[m - 1]! + s[m]!) / 2;
}

function time(fn: () => unknown, runs: number): number {
  fn(); // warm-up
  const times: number[] = [];
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now();
    fn();
    times.push(performance.now() - t0);
  }
  return median(times);
}

const runs = Number(process.argv[2] ?? 7);
const before = generate(20261201);
const { doc: after, changed, blocksMoved } = amend(before, 0.05, 8785);
const plain = (d: ProtocolDoc) => (d.content ?? []).map(nodePlainText).join("\n\n");
const beforeText = plain(before);
const afterText = plain(after);
const wordCount = beforeText.split(/\s+/).filter(Boolean).length;

const redline = computeRedline(before, after);
const oursMs = time(() => computeRedline(before, after), runs);
const jsdiffMs = time(() => diffWords(beforeText, afterText), Math.max(3, Math.min(runs, 5)));

console.log(`documents: ${wordCount} words, ${before.content!.length} blocks; ${changed} words changed (${((100 * changed) / wordCount).toFixed(1)}%), ${blocksMoved} paragraphs removed or added`);
console.log(
  `redline: ${redline.stats.changed} changed, ${redline.stats.inserted} inserted, ${redline.stats.deleted} deleted blocks; ` +
    `${redline.stats.wordsInserted} words inserted, ${redline.stats.wordsDeleted} deleted`,
);
console.log(`median computeRedline (block + word): ${oursMs.toFixed(1)} ms over ${runs} runs (target < 500 ms: ${oursMs < 500 ? "met" : "NOT met"})`);
console.log(`median jsdiff diffWords on the plain text: ${jsdiffMs.toFixed(1)} ms`);
