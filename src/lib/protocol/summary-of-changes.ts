// Summary-of-changes table of an amendment: one row per section (and one per changed visit),
// prefilled from the computed differences; the writer edits the texts and writes the
// rationale of each row, which is required before the version is submitted. Client-safe.
import { z } from "zod";
import type { Redline, VisitScheduleDiff, VisitField } from "./redline";
import type { ScheduledVisit } from "./visit-schedule";

export const scheduleSectionLabel = "Schedule of visits";

export const summaryRowSchema = z.object({
  section: z.string().trim().min(1, "Name the section").max(300),
  before: z.string().max(20_000),
  after: z.string().max(20_000),
  rationale: z.string().max(5_000),
});
export type SummaryRow = z.infer<typeof summaryRowSchema>;

/** Rows as saved while drafting (rationale may still be empty). */
export const summaryOfChangesSchema = z.array(summaryRowSchema).max(500);

/** Rows as submitted for review: every row has a rationale. */
export const submittedSummaryOfChangesSchema = z.array(
  summaryRowSchema.extend({ rationale: z.string().trim().min(1, "Give the rationale of this change").max(5_000) }),
);

export interface MissingRationale {
  index: number;
  section: string;
  message: string;
}

/** Rows that still lack a rationale (empty list: ready to submit). */
export function rowsMissingRationale(rows: readonly SummaryRow[]): MissingRationale[] {
  return rows.flatMap((row, index) =>
    row.rationale.trim() ? [] : [{ index, section: row.section, message: `Row ${index + 1} (${row.section}): give the rationale of this change.` }],
  );
}

function sectionName(section: string | null, title: string): string {
  return section ? `${section} ${title}`.trim() : "Front matter";
}

/** Plain words for the fields of a visit, as shown in tables. */
export const visitFieldLabels: Record<VisitField, string> = {
  label: "label",
  anchor: "anchor",
  dayOffset: "day",
  windowBefore: "window before",
  windowAfter: "window after",
  procedures: "procedures",
};

function describeVisit(v: ScheduledVisit): string {
  const day = v.dayOffset >= 0 ? `+${v.dayOffset}` : String(v.dayOffset);
  const procedures = v.procedures?.length ? `; procedures: ${v.procedures.join(", ")}` : "";
  return `${v.code} ${v.label}: day ${day} from ${v.anchor} (window −${v.windowBefore}/+${v.windowAfter} days)${procedures}`;
}

function describeField(field: VisitField, value: unknown): string {
  if (Array.isArray(value)) return `${visitFieldLabels[field]}: ${value.length ? value.join(", ") : "none"}`;
  return `${visitFieldLabels[field]}: ${String(value)}`;
}

/** Prefilled rows: text changes grouped by section (order of the new version), then visit changes. */
export function prefillSummaryOfChanges(redline: Redline, visits?: VisitScheduleDiff): SummaryRow[] {
  const groups = new Map<string, { before: string[]; after: string[] }>();
  for (const row of redline.rows) {
    if (row.kind === "equal") continue;
    const shown = (row.right ?? row.left)!;
    const key = sectionName(shown.section, shown.sectionTitle);
    let g = groups.get(key);
    if (!g) groups.set(key, (g = { before: [], after: [] }));
    if (row.left) g.before.push(row.left.text);
    if (row.right) g.after.push(row.right.text);
  }
  const rows: SummaryRow[] = [...groups].map(([section, g]) => ({
    section,
    before: g.before.join("\n\n"),
    after: g.after.join("\n\n"),
    rationale: "",
  }));
  if (visits) {
    for (const v of visits.removed) rows.push({ section: `${scheduleSectionLabel}: ${v.code}`, before: describeVisit(v), after: "", rationale: "" });
    for (const v of visits.added) rows.push({ section: `${scheduleSectionLabel}: ${v.code}`, before: "", after: describeVisit(v), rationale: "" });
    for (const c of visits.changed)
      rows.push({
        section: `${scheduleSectionLabel}: ${c.code}`,
        before: c.fields.map((f) => describeField(f.field, f.before)).join("; "),
        after: c.fields.map((f) => describeField(f.field, f.after)).join("; "),
        rationale: "",
      });
    if (visits.orderChanged && !visits.added.length && !visits.removed.length && !visits.changed.length)
      rows.push({ section: scheduleSectionLabel, before: "Previous order of visits", after: "Visits reordered", rationale: "" });
  }
  return rows;
}
