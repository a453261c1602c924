// Ethics-committee package of a protocol version as one PDF (pdfkit): a clean copy, a
// tracked-changes copy against the parent version (insertions underlined in slate, deletions
// struck through in brick: never colour alone), and the summary-of-changes table. Every page
// has a footer with the study code, version label, date and content hash. Server-side.
import fs from "node:fs";
import path from "node:path";
import PDFDocument from "pdfkit";
import { computeRedline, diffVisitSchedules, type WordPart } from "./redline";
import { nodePlainText, topLevelBlocks } from "./plain-text";
import { sanitizeProtocolDoc } from "./sanitize";
import { blockSectionNumbers } from "./sections";
import { visitFieldLabels, type SummaryRow } from "./summary-of-changes";
import type { ProtocolNode } from "./types";
import type { ScheduledVisit } from "./visit-schedule";

export interface EthicsPackageInput {
  studyCode: string;
  studyTitle?: string;
  versionLabel: string;
  /** e.g. "Amendment 2 (substantial)" */
  amendmentLabel?: string;
  /** ISO date printed in the footer (the version's approval or release date). */
  date: string;
  contentHash: string;
  doc: unknown;
  visitSchedule: readonly ScheduledVisit[];
  parent?: { versionLabel: string; doc: unknown; visitSchedule: readonly ScheduledVisit[] } | null;
  summaryOfChanges: readonly SummaryRow[];
  /** Which parts to include (default all three): an ethics committee may want them as separate files. */
  parts?: readonly ("clean" | "tracked" | "summary")[];
  /** Tests pass false so the content streams can be read. */
  compress?: boolean;
  /** Folder of the @fontsource woff files (default: node_modules under the working directory). */
  fontDir?: string;
}

const INK = "#1F2421";
const INSERTED = "#3D5A80"; // slate
const DELETED = "#A4412E"; // brick
const MUTED = "#5B625E";
const RULE = "#C9C4BA";

const FONT_FILES = {
  regular: "atkinson-hyperlegible-next-latin-400-normal.woff",
  italic: "atkinson-hyperlegible-next-latin-400-italic.woff",
  bold: "atkinson-hyperlegible-next-latin-700-normal.woff",
  boldItalic: "atkinson-hyperlegible-next-latin-700-italic.woff",
} as const;

const MARGIN = 56;
const FOOTER_SPACE = 40;

type Doc = InstanceType<typeof PDFDocument>;

function defaultFontDir(): string {
  return path.join(process.cwd(), "node_modules", "@fontsource", "atkinson-hyperlegible-next", "files");
}

function registerFonts(pdf: Doc, dir: string) {
  for (const [name, file] of Object.entries(FONT_FILES)) pdf.registerFont(name, fs.readFileSync(path.join(dir, file)));
}

function contentWidth(pdf: Doc): number {
  return pdf.page.width - pdf.page.margins.left - pdf.page.margins.right;
}

function ensureSpace(pdf: Doc, height: number) {
  if (pdf.y + height > pdf.page.height - pdf.page.margins.bottom) pdf.addPage();
}

function partTitle(pdf: Doc, title: string, subtitle?: string) {
  pdf.addPage();
  writeRuns(pdf, [{ text: title, font: "bold", color: INK }], 18, 0);
  if (subtitle) writeRuns(pdf, [{ text: subtitle, font: "regular", color: MUTED }], 10, 0);
  pdf.moveDown(1).fillColor(INK);
}

function fontFor(bold: boolean, italic: boolean): FontName {
  return bold ? (italic ? "boldItalic" : "bold") : italic ? "italic" : "regular";
}

interface Run {
  text: string;
  font: FontName;
  color: string;
  underline?: boolean;
  strike?: boolean;
  link?: string;
}
type FontName = keyof typeof FONT_FILES;

// Characters Windows-1252 has beyond Latin-1: the standard Helvetica can draw them.
const WIN_ANSI_EXTRA = "€‚ƒ„…†‡ˆ‰Š‹ŒŽ‘’“”•–—˜™š›œžŸ";
const ASCII_FALLBACK: Record<string, string> = { "≥": ">=", "≤": "<=", "≠": "!=", "≈": "~", "→": "->", "←": "<-", "−": "-", "\u2009": " ", "\u202f": " " };
const STANDARD_FALLBACK: Record<FontName, string> = { regular: "Helvetica", italic: "Helvetica-Oblique", bold: "Helvetica-Bold", boldItalic: "Helvetica-BoldOblique" };

/** Whether the embedded Atkinson font has a glyph (it lacks e.g. µ, ≥, ≤). */
function hasGlyph(pdf: Doc, font: FontName, ch: string): boolean {
  pdf.font(font);
  const embedded = (pdf as unknown as { _font?: { font?: { hasGlyphForCodePoint?: (cp: number) => boolean } } })._font?.font;
  return embedded?.hasGlyphForCodePoint ? embedded.hasGlyphForCodePoint(ch.codePointAt(0)!) : true;
}

/** Split a run where the font lacks glyphs: Helvetica for Windows-1252 characters, ASCII look-alikes otherwise. */
function withFallbacks(pdf: Doc, run: Run): { run: Run; fontFace: string }[] {
  const out: { run: Run; fontFace: string }[] = [];
  const push = (text: string, face: string) => {
    const last = out[out.length - 1];
    if (last && last.fontFace === face) last.run = { ...last.run, text: last.run.text + text };
    else out.push({ run: { ...run, text }, fontFace: face });
  };
  for (const ch of run.text) {
    if (ch === "\n" || hasGlyph(pdf, run.font, ch)) push(ch, run.font);
    else if (ch.codePointAt(0)! <= 0xff || WIN_ANSI_EXTRA.includes(ch)) push(ch, STANDARD_FALLBACK[run.font]);
    else push(ASCII_FALLBACK[ch] ?? "?", run.font);
  }
  return out;
}

/**
 * Write runs as one paragraph at the left margin + indent. Each "\n" starts a new line; a run's
 * leading spaces move to the end of the run before (pdfkit drops them at a fragment's start).
 */
function writeRuns(pdf: Doc, runs: Run[], size: number, indent: number) {
  drawRuns(pdf, runs, size, pdf.page.margins.left + indent, contentWidth(pdf) - indent);
  pdf.x = pdf.page.margins.left;
}

/** Draw runs from (x, pdf.y) within width, starting a new line at each "\n". */
function drawRuns(pdf: Doc, runs: Run[], size: number, x: number, width: number) {
  const lines: Run[][] = [[]];
  for (const run of runs)
    run.text.split("\n").forEach((piece, i) => {
      if (i > 0) lines.push([]);
      if (piece) lines[lines.length - 1]!.push({ ...run, text: piece });
    });
  for (const line of lines) {
    const pieces = line.flatMap((run) => withFallbacks(pdf, run));
    for (let i = 1; i < pieces.length; i++) {
      const lead = /^\s+/.exec(pieces[i]!.run.text)?.[0];
      if (lead) {
        pieces[i - 1]!.run.text += lead;
        pieces[i]!.run.text = pieces[i]!.run.text.slice(lead.length);
      }
    }
    const drawn = pieces.filter((piece) => piece.run.text.length > 0);
    if (!drawn.length) {
      pdf.font("regular").fontSize(size).text(" ", x, pdf.y, { width });
      continue;
    }
    // Align fallback glyphs on the Atkinson baseline (pdfkit places text by each font's ascender).
    pdf.font("regular").fontSize(size);
    const ascender = ((pdf as unknown as { _font: { ascender: number } })._font.ascender / 1000) * size;
    drawn.forEach(({ run, fontFace }, i) => {
      pdf.font(fontFace).fontSize(size).fillColor(run.color);
      const opts = {
        width,
        ...(fontFace in FONT_FILES ? {} : { baseline: -ascender }),
        continued: i < drawn.length - 1,
        underline: Boolean(run.underline),
        strike: Boolean(run.strike),
        ...(run.link ? { link: run.link } : {}),
      };
      if (i === 0) pdf.text(run.text, x, pdf.y, opts);
      else pdf.text(run.text, opts);
    });
  }
  pdf.fillColor(INK);
}

/** Write inline content of a paragraph or heading with its marks. */
function writeInline(pdf: Doc, node: ProtocolNode, size: number, baseBold: boolean, indent: number) {
  const runs: Run[] = [];
  for (const child of node.content ?? []) {
    if (child.type === "hardBreak") runs.push({ text: "\n", font: "regular", color: INK });
    else if (child.type === "text" && child.text) {
      const marks = child.marks ?? [];
      const link = marks.find((m) => m.type === "link")?.attrs?.href;
      const font = fontFor(baseBold || marks.some((m) => m.type === "bold"), marks.some((m) => m.type === "italic"));
      runs.push({ text: child.text, font, color: typeof link === "string" ? INSERTED : INK, ...(typeof link === "string" ? { link, underline: true } : {}) });
    }
  }
  writeRuns(pdf, runs, size, indent);
}

/** The longest word-boundary prefix of text that fits maxHeight at width (at least one word). */
function splitToFit(pdf: Doc, text: string, width: number, maxHeight: number): [string, string] {
  if (pdf.heightOfString(text, { width }) <= maxHeight) return [text, ""];
  const words = text.split(/(?<=\s)/);
  let lo = 1;
  let hi = words.length;
  while (lo < hi) {
    const mid = (lo + hi + 1) >> 1;
    if (pdf.heightOfString(words.slice(0, mid).join(""), { width }) <= maxHeight) lo = mid;
    else hi = mid - 1;
  }
  return [words.slice(0, lo).join(""), words.slice(lo).join("")];
}

/** A grid table; a row taller than the room left continues on the next page. */
function writeTable(pdf: Doc, rows: string[][], opts: { header: boolean; size?: number; widths?: number[] }) {
  const size = opts.size ?? 9;
  const cols = Math.max(1, ...rows.map((r) => r.length));
  const total = contentWidth(pdf);
  const widths = opts.widths ?? new Array(cols).fill(total / cols);
  const pad = 4;
  rows.forEach((row, r) => {
    const font: FontName = opts.header && r === 0 ? "bold" : "regular";
    let cells = widths.map((_, c) => row[c] ?? "");
    for (;;) {
      pdf.font(font).fontSize(size);
      let h = Math.max(...cells.map((text, c) => pdf.heightOfString(text, { width: widths[c]! - 2 * pad }))) + 2 * pad;
      const room = pdf.page.height - pdf.page.margins.bottom - pdf.y;
      if (h > room && room < Math.min(h, 72)) {
        pdf.addPage();
        continue;
      }
      let rest: string[] = [];
      if (h > room) {
        const split = cells.map((text, c) => splitToFit(pdf, text, widths[c]! - 2 * pad, room - 2 * pad));
        cells = split.map(([head]) => head);
        rest = split.map(([, tail]) => tail);
        h = room;
      }
      const y = pdf.y;
      let x = pdf.page.margins.left;
      widths.forEach((w, c) => {
        pdf.rect(x, y, w, h).lineWidth(0.5).strokeColor(RULE).stroke();
        pdf.y = y + pad;
        drawRuns(pdf, [{ text: cells[c]!, font, color: INK }], size, x + pad, w - 2 * pad);
        x += w;
      });
      pdf.x = pdf.page.margins.left;
      pdf.y = y + h;
      if (!rest.some(Boolean)) break;
      pdf.addPage();
      cells = rest;
    }
  });
  pdf.moveDown(0.5);
}

function writeBlock(pdf: Doc, node: ProtocolNode, section: string | null, indent = 0) {
  switch (node.type) {
    case "heading": {
      const level = Number(node.attrs?.level) || 1;
      const size = level === 1 ? 15 : level === 2 ? 13 : 11.5;
      ensureSpace(pdf, size * 3);
      pdf.moveDown(0.4);
      const numbered = section && indent === 0 ? { ...node, content: [{ type: "text", text: `${section}  ` }, ...(node.content ?? [])] } : node;
      writeInline(pdf, numbered, size, true, indent);
      pdf.moveDown(0.3);
      return;
    }
    case "paragraph":
      writeInline(pdf, node, 10.5, false, indent);
      pdf.moveDown(0.4);
      return;
    case "bulletList":
    case "orderedList": {
      let n = Number(node.attrs?.start) || 1;
      for (const item of node.content ?? []) {
        const marker = node.type === "bulletList" ? "•" : `${n++}.`;
        ensureSpace(pdf, 14);
        const y = pdf.y;
        pdf.font("regular").fontSize(10.5).fillColor(INK).text(marker, pdf.page.margins.left + indent, y, { width: 18 });
        pdf.y = y;
        for (const child of item.content ?? []) writeBlock(pdf, child, null, indent + 18);
      }
      pdf.x = pdf.page.margins.left;
      return;
    }
    case "table": {
      const rows = (node.content ?? []).map((row) => (row.content ?? []).map((cell) => nodePlainText(cell)));
      const header = (node.content?.[0]?.content ?? []).every((c) => c.type === "tableHeader");
      writeTable(pdf, rows, { header });
      return;
    }
    default:
      return;
  }
}

function visitRows(visits: readonly ScheduledVisit[]): string[][] {
  return [
    ["Code", "Visit", "Anchor", "Day", "Window (days)", "Procedures"],
    ...visits.map((v) => [
      v.code,
      v.label,
      v.anchor,
      String(v.dayOffset),
      `-${v.windowBefore} / +${v.windowAfter}`,
      (v.procedures ?? []).join(", "),
    ]),
  ];
}

const visitWidths = (total: number) => [0.1, 0.22, 0.12, 0.08, 0.14, 0.34].map((f) => f * total);

/** Parts of a block with insertions underlined and deletions struck through. */
function writeParts(pdf: Doc, parts: WordPart[], size: number, bold: boolean, prefix: string) {
  const font: FontName = bold ? "bold" : "regular";
  const runs: Run[] = (prefix ? [{ kind: "equal" as const, text: prefix }, ...parts] : parts).map((p) => ({
    text: p.text,
    font,
    color: p.kind === "inserted" ? INSERTED : p.kind === "deleted" ? DELETED : INK,
    underline: p.kind === "inserted",
    strike: p.kind === "deleted",
  }));
  writeRuns(pdf, runs, size, 0);
}

function writeFooters(pdf: Doc, input: EthicsPackageInput) {
  const range = pdf.bufferedPageRange();
  for (let i = range.start; i < range.start + range.count; i++) {
    pdf.switchToPage(i);
    const bottom = pdf.page.margins.bottom;
    pdf.page.margins.bottom = 0; // writing inside the margin must not add a page
    const y = pdf.page.height - MARGIN + 6;
    const width = contentWidth(pdf);
    pdf.moveTo(pdf.page.margins.left, y - 6).lineTo(pdf.page.margins.left + width, y - 6).lineWidth(0.5).strokeColor(RULE).stroke();
    pdf
      .font("regular")
      .fontSize(8)
      .fillColor(MUTED)
      .text(`${input.studyCode} · Protocol version ${input.versionLabel} · ${input.date} · Page ${i - range.start + 1} of ${range.count}`, pdf.page.margins.left, y, {
        width,
        lineBreak: false,
      });
    // The hash in a standard monospace font: exact characters, easy to compare by eye.
    pdf.font("Courier").fontSize(7).text(`SHA-256 ${input.contentHash}`, pdf.page.margins.left, y + 11, { width, lineBreak: false });
    pdf.page.margins.bottom = bottom;
  }
}

/** Build the package; resolves to the PDF bytes. */
export function buildEthicsPackagePdf(input: EthicsPackageInput): Promise<Buffer> {
  const pdf = new PDFDocument({
    size: "A4",
    margins: { top: MARGIN, left: MARGIN, right: MARGIN, bottom: MARGIN + FOOTER_SPACE },
    bufferPages: true,
    autoFirstPage: false,
    compress: input.compress ?? true,
    info: {
      Title: `${input.studyCode} protocol version ${input.versionLabel}`,
      Subject: `Ethics committee package; content SHA-256 ${input.contentHash}`,
      Creator: "Cairn",
    },
  });
  const chunks: Buffer[] = [];
  const done = new Promise<Buffer>((resolve, reject) => {
    pdf.on("data", (c: Buffer) => chunks.push(c));
    pdf.on("end", () => resolve(Buffer.concat(chunks)));
    pdf.on("error", reject);
  });
  registerFonts(pdf, input.fontDir ?? defaultFontDir());

  const doc = sanitizeProtocolDoc(input.doc);
  const title = `${input.studyCode}${input.studyTitle ? ` — ${input.studyTitle}` : ""}`;
  const subtitle = `Protocol version ${input.versionLabel}${input.amendmentLabel ? ` · ${input.amendmentLabel}` : ""} · ${input.date}`;

  const parts = new Set(input.parts ?? ["clean", "tracked", "summary"]);
  // Part 1: clean copy.
  if (parts.has("clean")) {
    partTitle(pdf, title, `${subtitle} · Clean copy`);
    const numbers = blockSectionNumbers(doc);
    topLevelBlocks(doc).forEach((block, i) => writeBlock(pdf, block, numbers[i] ?? null));
    ensureSpace(pdf, 60);
    pdf.moveDown(0.6).font("bold").fontSize(13).fillColor(INK).text("Schedule of visits", pdf.page.margins.left, pdf.y);
    pdf.moveDown(0.3);
    writeTable(pdf, visitRows(input.visitSchedule), { header: true, size: 8.5, widths: visitWidths(contentWidth(pdf)) });
  }

  // Part 2: tracked changes against the parent.
  if (input.parent && parts.has("tracked")) {
    partTitle(pdf, `${title}: tracked changes`, `Version ${input.versionLabel} compared with version ${input.parent.versionLabel}`);
    pdf.font("regular").fontSize(9).fillColor(INK).text("Key: ", { continued: true });
    pdf.fillColor(INSERTED).text("inserted text is underlined", { underline: true, continued: true });
    pdf.fillColor(INK).text(" · ", { underline: false, continued: true });
    pdf.fillColor(DELETED).text("deleted text is struck through", { strike: true, continued: true });
    pdf.fillColor(INK).text(".", { strike: false });
    pdf.moveDown(0.8);
    const redline = computeRedline(input.parent.doc, doc);
    for (const block of redline.inline) {
      const heading = block.type === "heading";
      const size = heading ? (block.level === 1 ? 15 : block.level === 2 ? 13 : 11.5) : 10.5;
      ensureSpace(pdf, size * (heading ? 3 : 1.5));
      if (heading) pdf.moveDown(0.4);
      const list = block.type === "bulletList" || block.type === "orderedList";
      const prefix = heading && block.section ? `${block.section}  ` : list ? "•  " : "";
      // Lists and tables arrive as plain text: items on new lines, cells separated by tabs.
      const parts = list || block.type === "table" ? block.parts.map((x) => ({ ...x, text: x.text.replace(/\n/g, list ? "\n•  " : "\n").replace(/\t/g, "  |  ") })) : block.parts;
      writeParts(pdf, parts, size, heading, prefix);
      if (block.formatOnly) pdf.font("italic").fontSize(8).fillColor(MUTED).text("(formatting changed)").fillColor(INK);
      pdf.moveDown(heading ? 0.3 : 0.4);
    }
    const visits = diffVisitSchedules(input.parent.visitSchedule, input.visitSchedule);
    ensureSpace(pdf, 60);
    pdf.moveDown(0.6).font("bold").fontSize(13).fillColor(INK).text("Schedule of visits: changes", pdf.page.margins.left, pdf.y);
    pdf.moveDown(0.3);
    const changeRows: string[][] = [["Visit", "Change", "Before", "After"]];
    for (const v of visits.removed) changeRows.push([v.code, "Removed", v.label, ""]);
    for (const v of visits.added) changeRows.push([v.code, "Added", "", v.label]);
    for (const c of visits.changed)
      for (const f of c.fields)
        changeRows.push([c.code, visitFieldLabels[f.field], Array.isArray(f.before) ? f.before.join(", ") : String(f.before), Array.isArray(f.after) ? f.after.join(", ") : String(f.after)]);
    if (changeRows.length === 1) pdf.font("regular").fontSize(10).text("No change to the schedule of visits.");
    else writeTable(pdf, changeRows, { header: true, size: 8.5 });
  }

  // Part 3: summary of changes.
  if (parts.has("summary")) {
    partTitle(pdf, `${title}: summary of changes`, subtitle);
    if (!input.summaryOfChanges.length) pdf.font("regular").fontSize(10).text("No changes recorded.");
    else {
      const total = contentWidth(pdf);
      writeTable(pdf, [["Section", "Before", "After", "Rationale"], ...input.summaryOfChanges.map((r) => [r.section, r.before, r.after, r.rationale])], {
        header: true,
        size: 8.5,
        widths: [0.18, 0.28, 0.28, 0.26].map((f) => f * total),
      });
    }
  }
  if (!input.parent && parts.size === 1 && parts.has("tracked")) partTitle(pdf, `${title}: tracked changes`, "The original protocol has no earlier version to compare with.");

  writeFooters(pdf, input);
  pdf.end();
  return done;
}
