import "server-only";
import PDFDocument from "pdfkit";
import { and, asc, eq } from "drizzle-orm";
import type { Tx } from "@/server/db/client";
import { paymentRunLines, paymentRuns, paymentTransfers, sites, studies } from "@/server/db/schema";
import { notFound } from "@/server/api/errors";
import { enqueueMail } from "@/server/mail/enqueue-mail";
import { env } from "@/env";
import { formatMinor } from "@/lib/money";
import { remittanceCsv, type RemittanceHeader, type RemittanceLine } from "@/lib/payments/remittance-csv";
import { siteFinanceEmails, sponsorFinanceEmails } from "./recipients";

export async function scopeOfTransfer(tx: Tx, transferId: string) {
  const [t] = await tx.select({ studyId: paymentTransfers.studyId, siteId: paymentTransfers.siteId }).from(paymentTransfers).where(eq(paymentTransfers.id, transferId)).limit(1);
  if (!t) throw notFound("That payment");
  return t;
}

export async function loadRemittance(tx: Tx, { transferId }: { transferId: string }): Promise<{ header: RemittanceHeader & { siteName: string; studyId: string; siteId: string; state: string }; lines: RemittanceLine[] }> {
  const [row] = await tx
    .select({ t: paymentTransfers, siteCode: sites.code, siteName: sites.name, studyCode: studies.code, runNumber: paymentRuns.number })
    .from(paymentTransfers)
    .innerJoin(sites, eq(sites.id, paymentTransfers.siteId))
    .innerJoin(studies, eq(studies.id, paymentTransfers.studyId))
    .innerJoin(paymentRuns, eq(paymentRuns.id, paymentTransfers.runId))
    .where(eq(paymentTransfers.id, transferId))
    .limit(1);
  if (!row) throw notFound("That payment");
  const lines = await tx
    .select({ lineKey: paymentRunLines.lineKey, kind: paymentRunLines.kind, description: paymentRunLines.description, serviceDate: paymentRunLines.serviceDate, dueDate: paymentRunLines.dueDate, amountMinor: paymentRunLines.amountMinor })
    .from(paymentRunLines)
    .where(and(eq(paymentRunLines.transferId, transferId)))
    .orderBy(asc(paymentRunLines.serviceDate), asc(paymentRunLines.lineKey));
  const t = row.t;
  return {
    header: {
      studyId: t.studyId,
      siteId: t.siteId,
      studyCode: row.studyCode,
      siteCode: row.siteCode,
      siteName: row.siteName,
      runNumber: row.runNumber,
      transferReference: t.stripeTransferId ?? t.id,
      currency: t.currency,
      amountMinor: t.amountMinor,
      sentOn: (t.paidAt ?? t.sentAt ?? t.createdAt).toISOString().slice(0, 10),
      state: t.state,
    },
    lines,
  };
}

export async function remittanceCsvFor(tx: Tx, { transferId }: { transferId: string }) {
  const { header, lines } = await loadRemittance(tx, { transferId });
  return { fileName: `remittance-${header.studyCode}-${header.siteCode}-run${header.runNumber}.csv`, body: remittanceCsv(header, lines) };
}

/** A one-table PDF: the payment, then its lines with amounts right-aligned. */
export async function remittancePdfFor(tx: Tx, { transferId }: { transferId: string }): Promise<{ fileName: string; body: Buffer }> {
  const { header, lines } = await loadRemittance(tx, { transferId });
  const pdf = new PDFDocument({ size: "A4", margin: 50, info: { Title: `Remittance advice ${header.studyCode} ${header.siteCode} run ${header.runNumber}`, Producer: "Cairn" } });
  const chunks: Buffer[] = [];
  pdf.on("data", (c: Buffer) => chunks.push(c));
  const done = new Promise<Buffer>((resolve) => pdf.on("end", () => resolve(Buffer.concat(chunks))));
  const left = pdf.page.margins.left;
  const width = pdf.page.width - left - pdf.page.margins.right;
  pdf.font("Helvetica-Bold").fontSize(16).text("Remittance advice");
  pdf.moveDown(0.5).font("Helvetica").fontSize(10);
  pdf.text(`Study ${header.studyCode} · Site ${header.siteCode} ${header.siteName}`);
  pdf.text(`Payment run ${header.runNumber} · Transfer ${header.transferReference} · ${header.sentOn}`);
  pdf.font("Helvetica-Bold").text(`Amount ${formatMinor(header.amountMinor, header.currency)}`);
  pdf.moveDown();
  const cols = [
    { title: "Service date", w: 70 },
    { title: "Due date", w: 70 },
    { title: "Line", w: width - 70 - 70 - 100 },
    { title: `Amount (${header.currency})`, w: 100, right: true },
  ];
  const row = (cells: string[], bold = false) => {
    if (pdf.y > pdf.page.height - pdf.page.margins.bottom - 30) pdf.addPage();
    const y = pdf.y;
    let x = left;
    let h = 0;
    pdf.font(bold ? "Helvetica-Bold" : "Helvetica").fontSize(9);
    cells.forEach((c, i) => {
      const col = cols[i]!;
      pdf.text(c, x, y, { width: col.w - 6, align: col.right ? "right" : "left" });
      h = Math.max(h, pdf.y - y);
      x += col.w;
    });
    pdf.y = y + h + 3;
    pdf.x = left;
  };
  row(cols.map((c) => c.title), true);
  for (const l of lines) row([l.serviceDate, l.dueDate, `${l.description} (${l.lineKey})`, formatMinor(l.amountMinor, header.currency, { withCode: false })]);
  row(["", "", "Total", formatMinor(header.amountMinor, header.currency, { withCode: false })], true);
  pdf.moveDown();
  pdf.font("Helvetica").fontSize(8).fillColor("#555555").text("The signed clinical trial agreement governs what is owed. Cairn computes and records; it does not replace the agreement.", left, pdf.y, { width });
  pdf.end();
  return { fileName: `remittance-${header.studyCode}-${header.siteCode}-run${header.runNumber}.pdf`, body: await done };
}

/** When Stripe confirms a payment: the site's finance people get its remittance advice. */
export async function enqueueRemittanceMail(tx: Tx, { transferId }: { transferId: string }) {
  const { header, lines } = await loadRemittance(tx, { transferId });
  const to = await siteFinanceEmails(tx, { studyId: header.studyId, siteId: header.siteId });
  const base = `${env.NEXTAUTH_URL}/api/v1/payments/${transferId}/remittance`;
  const text = [
    `A payment to ${header.siteCode} ${header.siteName} for study ${header.studyCode} was made: ${formatMinor(header.amountMinor, header.currency)}.`,
    `Payment run ${header.runNumber}, transfer ${header.transferReference}, ${header.sentOn}.`,
    "",
    ...lines.map((l) => `${l.serviceDate}  ${l.description} (${l.lineKey})  ${formatMinor(l.amountMinor, header.currency)}`),
    "",
    `Remittance advice: ${base}?format=pdf  (CSV: ${base}?format=csv)`,
    "Please confirm receipt in Cairn when the money reaches your account, or raise a query.",
  ].join("\n");
  for (const email of to) {
    await enqueueMail(tx, { dedupeKey: `remittance:${transferId}:${email}`, to: email, subject: `[${header.studyCode}] Remittance advice — ${header.siteCode}, run ${header.runNumber}`, text });
  }
}

/** A failed or reversed payment is told to sponsor finance: its lines are due again. */
export async function enqueueFailureMail(tx: Tx, { transferId, reason }: { transferId: string; reason: string }) {
  const { header } = await loadRemittance(tx, { transferId });
  for (const email of await sponsorFinanceEmails(tx, { studyId: header.studyId })) {
    await enqueueMail(tx, {
      dedupeKey: `transfer-failed:${transferId}:${email}`,
      to: email,
      subject: `[${header.studyCode}] Payment to ${header.siteCode} did not go through`,
      text: `The payment of ${formatMinor(header.amountMinor, header.currency)} to ${header.siteCode} in run ${header.runNumber} did not go through. ${reason}\nIts lines are due again and can go into a new run.`,
    });
  }
}
