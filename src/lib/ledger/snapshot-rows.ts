// The two large reads of the snapshot loader — visits and payments — come from PostgreSQL as one
// text column per row, fields joined by a unit separator, the free-text field last: pg then parses one
// field per row instead of eight. Parsing (and, for the benchmark and tests, writing) those rows lives
// here, pure, so that the server and the benchmark build the engine's input the same way.

/** Field separator of the one-column reads (never in a uuid, date, enum or amount). */
export const US = "\u001f";

export type VisitRow = {
  id: string;
  subjectId: string;
  /** Empty when the read did not ask for it (the engine needs it only for the projection). */
  versionId: string;
  outcome: "done" | "missed";
  actualDate: string | null;
  dataEnteredOn: string | null;
  verifiedOn: string | null;
  visitCode: string;
};

export type PaymentRow = { siteId: string; lineKey: string; amountMinor: bigint; paidOn: string };

/** SQL of a visit row: id, subject, version, outcome, date, data entry, verification, code (last). */
export const visitRowSql = (versionColumn: string) =>
  `concat_ws(E'\\x1f', vr.id, vr.subject_id, ${versionColumn}, vr.outcome, vr.actual_date, coalesce(vr.data_entered_on::text, ''), coalesce(vr.verified_on::text, ''), vr.visit_code)`;

/** SQL of a payment row: amount, date, site, line key (last). */
export const paymentRowSql = "concat_ws(E'\\x1f', amount_minor, paid_on, site_id, line_key)";

export function parseVisitRow(text: string): VisitRow {
  const f = text.split(US);
  return {
    id: f[0] as string,
    subjectId: f[1] as string,
    versionId: f[2] as string,
    outcome: f[3] as VisitRow["outcome"],
    actualDate: f[4] || null,
    dataEnteredOn: f[5] || null,
    verifiedOn: f[6] || null,
    visitCode: f.length === 8 ? (f[7] as string) : f.slice(7).join(US),
  };
}

export function parsePaymentRow(text: string): PaymentRow {
  const a = text.indexOf(US);
  const b = text.indexOf(US, a + 1);
  const c = text.indexOf(US, b + 1);
  return { siteId: text.slice(b + 1, c), lineKey: text.slice(c + 1), amountMinor: BigInt(text.slice(0, a)), paidOn: text.slice(a + 1, b) };
}

/** The text PostgreSQL returns for a visit row (concat_ws skips nulls; empty strings stay). */
export function visitRowText(v: VisitRow): string {
  return [v.id, v.subjectId, v.versionId, v.outcome, v.actualDate, v.dataEnteredOn ?? "", v.verifiedOn ?? "", v.visitCode].filter((x) => x !== null).join(US);
}

export function paymentRowText(p: PaymentRow): string {
  return [p.amountMinor.toString(), p.paidOn, p.siteId, p.lineKey].join(US);
}
