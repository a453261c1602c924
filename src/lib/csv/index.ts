// The one CSV writer for every export (RFC 4180: CRLF line ends; a field holding a comma, quote or
// line break is quoted, quotes doubled). A text cell that a spreadsheet would run as a formula — one
// starting with = + - @ tab or CR — gets a leading apostrophe (OWASP "CSV Injection"); plain numbers,
// negative ones included, are left as numbers.

export type CsvValue = string | number | bigint | boolean | null | undefined;

const formulaStart = /^[=+\-@\t\r]/;
const plainNumber = /^-?\d+(\.\d+)?$/;

export function csvCell(value: CsvValue): string {
  if (value === null || value === undefined) return "";
  let s = String(value);
  if (typeof value === "string" && formulaStart.test(s) && !plainNumber.test(s)) s = `'${s}`;
  return /[",\r\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

export function csvRow(values: readonly CsvValue[]): string {
  return values.map(csvCell).join(",");
}

/** A whole document: the header, then one line per row, each line ended by CRLF. */
export function toCsv(header: readonly string[], rows: readonly (readonly CsvValue[])[]): string {
  let out = csvRow(header) + "\r\n";
  for (const r of rows) out += csvRow(r) + "\r\n";
  return out;
}
