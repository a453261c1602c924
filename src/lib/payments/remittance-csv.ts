import { toCsv } from "@/lib/csv";
import { formatMinor } from "@/lib/money";

// Remittance advice as CSV (the shared writer in src/lib/csv). Amounts in major units without
// grouping so spreadsheets read numbers.

export interface RemittanceLine {
  lineKey: string;
  kind: string;
  description: string;
  serviceDate: string;
  dueDate: string;
  amountMinor: bigint;
}

export interface RemittanceHeader {
  studyCode: string;
  siteCode: string;
  runNumber: number;
  transferReference: string;
  currency: string;
  amountMinor: bigint;
  sentOn: string;
}

export const remittanceColumns = ["Study", "Site", "Run", "Transfer", "Line", "Kind", "Description", "Service date", "Due date", "Currency", "Amount"] as const;

export function remittanceCsv(header: RemittanceHeader, lines: readonly RemittanceLine[]): string {
  const rows: string[][] = [];
  let total = 0n;
  for (const l of lines) {
    total += l.amountMinor;
    rows.push([
      header.studyCode,
      header.siteCode,
      String(header.runNumber),
      header.transferReference,
      l.lineKey,
      l.kind,
      l.description,
      l.serviceDate,
      l.dueDate,
      header.currency,
      formatMinor(l.amountMinor, header.currency, { grouping: false, withCode: false }),
    ]);
  }
  if (total !== header.amountMinor) throw new Error(`Remittance lines sum to ${total}, the payment is ${header.amountMinor}`);
  rows.push([header.studyCode, header.siteCode, String(header.runNumber), header.transferReference, "TOTAL", "", "", "", "", header.currency, formatMinor(total, header.currency, { grouping: false, withCode: false })]);
  return toCsv(remittanceColumns, rows);
}
