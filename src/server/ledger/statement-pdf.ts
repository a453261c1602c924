import "server-only";
import fs from "node:fs";
import path from "node:path";
import PDFDocument from "pdfkit";
import { formatMinor } from "@/lib/money";
import type { EarnedLine } from "@/lib/payment-schedule";
import { describeLine, lineStateLabels, sumLines } from "@/lib/ledger";

// A site's statement for a period as PDF: one row per earned line and the period's totals, the
// same figures as the CSV statement. Amounts in a monospace font, right-aligned, with the currency.

const INK = "#1F2421";
const MUTED = "#5B625E";
const RULE = "#C9C4BA";
const MARGIN = 40;

const COLUMNS: { title: string; width: number; align: "left" | "right" }[] = [
  { title: "Trigger date", width: 62, align: "left" },
  { title: "Description", width: 170, align: "left" },
  { title: "Cycle", width: 50, align: "left" },
  { title: "Due", width: 62, align: "left" },
  { title: "Net", width: 74, align: "right" },
  { title: "Paid", width: 74, align: "right" },
  { title: "Outstanding", width: 74, align: "right" },
  { title: "State", width: 52, align: "left" },
];

export function buildStatementPdf(input: { studyCode: string; siteCode: string; siteName: string; currency: string; from: string; to: string; asOf: string; lines: readonly EarnedLine[] }): Promise<Buffer> {
  const pdf = new PDFDocument({ size: "A4", layout: "landscape", margins: { top: MARGIN, left: MARGIN, right: MARGIN, bottom: MARGIN }, info: { Title: `${input.studyCode} ${input.siteCode} statement ${input.from} to ${input.to}`, Creator: "Cairn" } });
  const chunks: Buffer[] = [];
  const done = new Promise<Buffer>((resolve, reject) => {
    pdf.on("data", (c: Buffer) => chunks.push(c));
    pdf.on("end", () => resolve(Buffer.concat(chunks)));
    pdf.on("error", reject);
  });
  const fontDir = path.join(process.cwd(), "node_modules", "@fontsource", "atkinson-hyperlegible-next", "files");
  pdf.registerFont("regular", fs.readFileSync(path.join(fontDir, "atkinson-hyperlegible-next-latin-400-normal.woff")));
  pdf.registerFont("bold", fs.readFileSync(path.join(fontDir, "atkinson-hyperlegible-next-latin-700-normal.woff")));
  const money = (m: bigint) => formatMinor(m, input.currency, { withCode: false });

  pdf.font("bold").fontSize(14).fillColor(INK).text(`Statement — ${input.siteCode} ${input.siteName}`);
  pdf.font("regular").fontSize(9).fillColor(MUTED).text(`${input.studyCode} · lines triggered ${input.from} to ${input.to} · as of ${input.asOf} · amounts in ${input.currency}`);
  pdf.moveDown(0.8);

  const left = pdf.page.margins.left;
  const row = (cells: string[], font: "regular" | "bold") => {
    if (pdf.y + 16 > pdf.page.height - pdf.page.margins.bottom - 30) pdf.addPage();
    const y = pdf.y;
    let x = left;
    COLUMNS.forEach((c, i) => {
      const amount = c.align === "right";
      pdf.font(amount ? "Courier" : font).fontSize(amount ? 8 : 8.5).fillColor(INK).text(cells[i] ?? "", x + 2, y, { width: c.width - 4, align: c.align, lineBreak: false, ellipsis: true });
      x += c.width;
    });
    pdf.y = y + 13;
    pdf.moveTo(left, pdf.y - 2).lineTo(x, pdf.y - 2).lineWidth(0.4).strokeColor(RULE).stroke();
  };
  row(COLUMNS.map((c) => c.title), "bold");
  for (const l of input.lines) row([l.triggerDate, describeLine(l), l.cycle.label, l.dueDate, money(l.netMinor), money(l.paidMinor), money(l.outstandingMinor), lineStateLabels[l.state]], "regular");
  const t = sumLines(input.lines);
  row(["Total", `${input.lines.length} lines · fee ${money(t.grossMinor)} · overhead ${money(t.overheadMinor)} · holdback ${money(t.holdbackMinor)}`, "", "", money(t.netMinor), money(t.paidMinor), money(t.outstandingMinor), ""], "bold");

  pdf.moveDown(1.2);
  pdf.font("regular").fontSize(8).fillColor(MUTED).text(
    "Cairn computes these figures from the recorded events and the budget in the system. The signed clinical trial agreement, the approved protocol and the ethics committee's and regulators' rules govern.",
    left,
    pdf.y,
    { width: COLUMNS.reduce((a, c) => a + c.width, 0) },
  );
  pdf.end();
  return done;
}
