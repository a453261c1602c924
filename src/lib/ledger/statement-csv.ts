import { toCsv } from "@/lib/csv";
import { formatMinor } from "@/lib/money";
import type { EarnedLine } from "@/lib/payment-schedule";
import { describeLine, lineKindLabels, lineStateLabels } from "./line-labels";

// A site's statement for a period as CSV (the shared writer in src/lib/csv). Amounts in major units
// without grouping, so spreadsheets read them as numbers; the currency is its own column.

export const statementColumns = [
  "Line",
  "Kind",
  "Description",
  "Service date",
  "Trigger date",
  "Cycle",
  "Due date",
  "Budget version",
  "Currency",
  "Fee",
  "Overhead",
  "Holdback",
  "Net",
  "Paid",
  "Outstanding",
  "State",
] as const;

export interface StatementTotals {
  grossMinor: bigint;
  overheadMinor: bigint;
  holdbackMinor: bigint;
  netMinor: bigint;
  paidMinor: bigint;
  outstandingMinor: bigint;
}

export function sumLines(lines: readonly EarnedLine[]): StatementTotals {
  const t = { grossMinor: 0n, overheadMinor: 0n, holdbackMinor: 0n, netMinor: 0n, paidMinor: 0n, outstandingMinor: 0n };
  for (const l of lines) {
    t.grossMinor += l.grossMinor;
    t.overheadMinor += l.overheadMinor;
    t.holdbackMinor += l.holdbackMinor;
    t.netMinor += l.netMinor;
    t.paidMinor += l.paidMinor;
    t.outstandingMinor += l.outstandingMinor;
  }
  return t;
}

export function statementCsv(input: { siteCode: string; currency: string; from: string; to: string; asOf: string; lines: readonly EarnedLine[] }): string {
  const { currency } = input;
  const amount = (m: bigint) => formatMinor(m, currency, { grouping: false, withCode: false });
  const rows: string[][] = [];
  for (const l of input.lines) {
    rows.push([
      l.key,
      lineKindLabels[l.kind],
      describeLine(l),
      l.serviceDate,
      l.triggerDate,
      l.cycle.label,
      l.dueDate,
      String(l.budgetVersionNumber),
      currency,
      amount(l.grossMinor),
      amount(l.overheadMinor),
      amount(l.holdbackMinor),
      amount(l.netMinor),
      amount(l.paidMinor),
      amount(l.outstandingMinor),
      lineStateLabels[l.state],
    ]);
  }
  const t = sumLines(input.lines);
  rows.push(["Total", "", `${input.siteCode} ${input.from} to ${input.to}, as of ${input.asOf}`, "", "", "", "", "", currency, amount(t.grossMinor), amount(t.overheadMinor), amount(t.holdbackMinor), amount(t.netMinor), amount(t.paidMinor), amount(t.outstandingMinor), ""]);
  return toCsv(statementColumns, rows);
}
