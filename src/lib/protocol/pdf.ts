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
  pdf.font("bold").fontSize(18).fillColor(INK).text(title);
  if (subtitle) pdf.font("regular").fontSize(10).fillColor(MUTED).text(subtitle);
  pdf.moveDown(1).fillColor(INK);
}

function fontFor(bold: boolean, italic: boolean): string {
  return bold ? (italic ? "boldItalic" : "bold") : italic ? "italic" : "regular";
}

/** Write inline content of a paragraph or heading with its marks. */
function writeInline(pdf: Doc, node: ProtocolNode, size: number, baseBold: boolean, indent: number) {
  const runs: { text: string; bold: boolean; italic: boolean; link?: string }[] = [];
  for (const child of node.content ?? []) {
    if (child.type === "hardBreak") runs.push({ text: "\n", bold: baseBold, italic: false });
    else if (child.type === "text" && child.text) {
      const marks = child.marks ?? [];
      const link = marks.find((m) => m.type === "link")?.attrs?.href;
      runs.push({
        text: child.text,
        bold: baseBold || marks.some((m) => m.type === "bold"),
        italic: marks.some((m) => m.type === "italic"),
        ...(typeof link === "string" ? { link } : {}),
      });
    }
  }
  const width = contentWidth(pdf) - indent;
  const x = pdf.page.margins.left + indent;
  if (!runs.length) {
    pdf.font("regular").fontSize(size).text(" ", x, pdf.y, { width });
    return;
  }
  runs.forEach((run, i) => {
    pdf
      .font(fontFor(run.bold, run.italic))
      .fontSize(size)
      .fillColor(run.link ? INSERTED : INK);
    const opts = { width, continued: i < runs.length - 1, underline: Boolean(run.link), ...(run.link ? { link: run.link } : {}) };
    if (i === 0) pdf.text(run.text, x, pdf.y, opts);
    else pdf.text(run.text, opts);
  });
  pdf.fillColor(INK);
}

function writeTable(pdf: Doc, rows: string[][], opts: { header: boolean; size?: number; widths?: number[] }) {
  const size = opts.size ?? 9;
  const cols = Math.max(1, ...rows.map((r) => r.length));
  const total = contentWidth(pdf);
  const widths = opts.widths ?? new Array(cols).fill(total / cols);
  const pad = 4;
  rows.forEach((row, r) => {
    const bold = opts.header && r === 0;
    pdf.font(bold ? "bold" : "regular").fontSize(size);
    const heights = widths.map((w, c) => pdf.heightOfString(row[c] ?? "", { width: w - 2 * pad }));
    const h = Math.max(...heights) + 2 * pad;
    ensureSpace(pdf, Math.min(h, 400));
    const y = pdf.y;
    let x = pdf.page.margins.left;
    widths.forEach((w, c) => {
      pdf.rect(x, y, w, h).lineWidth(0.5).strokeColor(RULE).stroke();
      pdf.fillColor(INK).text(row[c] ?? "", x + pad, y + pad, { width: w - 2 * pad });
      x += w;
    });
    pdf.x = pdf.page.margins.left;
    pdf.y = y + h;
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
  const all: WordPart[] = prefix ? [{ kind: "equal", text: prefix }, ...parts] : parts;
  const nonEmpty = all.filter((p) => p.text.length > 0);
  if (!nonEmpty.length) {
    pdf.font("regular").fontSize(size).text(" ");
    return;
  }
  const x = pdf.page.margins.left;
  const width = contentWidth(pdf);
  nonEmpty.forEach((p, i) => {
    pdf
      .font(bold ? "bold" : "regular")
      .fontSize(size)
      .fillColor(p.kind === "inserted" ? INSERTED : p.kind === "deleted" ? DELETED : INK);
    const opts = { width, continued: i < nonEmpty.length - 1, underline: p.kind === "inserted", strike: p.kind === "deleted" };
    if (i === 0) pdf.text(p.text, x, pdf.y, opts);
    else pdf.text(p.text, opts);
  });
  pdf.fillColor(INK);
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

  // Part 1: clean copy.
  partTitle(pdf, title, `${subtitle} · Clean copy`);
  const numbers = blockSectionNumbers(doc);
  topLevelBlocks(doc).forEach((block, i) => writeBlock(pdf, block, numbers[i] ?? null));
  ensureSpace(pdf, 60);
  pdf.moveDown(0.6).font("bold").fontSize(13).fillColor(INK).text("Schedule of visits", pdf.page.margins.left, pdf.y);
  pdf.moveDown(0.3);
  writeTable(pdf, visitRows(input.visitSchedule), { header: true, size: 8.5, widths: visitWidths(contentWidth(pdf)) });

  // Part 2: tracked changes against the parent.
  if (input.parent) {
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
      const prefix = heading && block.section ? `${block.section}  ` : "";
      writeParts(pdf, block.parts, size, heading, prefix);
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

  writeFooters(pdf, input);
  pdf.end();
  return done;
}
