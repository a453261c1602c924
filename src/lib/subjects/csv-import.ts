import Papa from "papaparse";
import type { AnchorEvent, IsoDate, VisitSchedule } from "@/lib/protocol/visit-schedule";
import { isCalendarDate, toDayNumber } from "@/lib/visits/calendar-date";
import { siteCodeSchema, subjectCodeSchema, subjectCodeSchemaForSite } from "./subject-code";
import { isSubjectStatus, subjectStatuses, type SubjectStatus } from "./subject-states";

/*
 * Subject import file (CSV, UTF-8, comma-separated, first row = column names, any column order).
 *
 *   row_type,subject_code,site_code,status,consent_date,screening_date,enrolled_date,implant_date,
 *   device_serial,screen_fail_reason,withdrawn_reason,visit_code,visit_date,outcome
 *
 * - row_type `subject`: one row per subject; the subject columns are filled, the visit columns empty.
 * - row_type `visit`: one row per recorded visit; subject_code, visit_code, outcome (`done` or
 *   `missed`) and visit_date (required when done) are filled; site_code may repeat the subject's;
 *   the other subject columns stay empty. Visit rows may come before or after their subject row.
 * - Without a row_type column every row is a subject row (and visit columns are not allowed).
 * - status: screening, screen_failed, enrolled, implanted, follow_up, completed, withdrawn.
 * - Dates are YYYY-MM-DD and must be real; consent ≤ screening ≤ enrolled ≤ implant.
 * - A visit code must be in the schedule of some protocol version; a done visit needs the
 *   subject's anchor date for it (an implant-anchored visit needs an implant date).
 * - Blank lines are ignored. Row numbers in errors count the header as row 1.
 *
 * Import is all-or-nothing: either every row parses, or the result lists every problem found as
 * (row, column, message) and nothing is imported.
 */

export const subjectImportColumns = [
  "row_type",
  "subject_code",
  "site_code",
  "status",
  "consent_date",
  "screening_date",
  "enrolled_date",
  "implant_date",
  "device_serial",
  "screen_fail_reason",
  "withdrawn_reason",
  "visit_code",
  "visit_date",
  "outcome",
] as const;
export type SubjectImportColumn = (typeof subjectImportColumns)[number];

const subjectOnlyColumns: readonly SubjectImportColumn[] = [
  "status",
  "consent_date",
  "screening_date",
  "enrolled_date",
  "implant_date",
  "device_serial",
  "screen_fail_reason",
  "withdrawn_reason",
];
const visitOnlyColumns: readonly SubjectImportColumn[] = ["visit_code", "visit_date", "outcome"];
const requiredColumns: readonly SubjectImportColumn[] = ["subject_code", "site_code", "status", "consent_date"];

export const MAX_IMPORT_ROWS = 50_000;

export interface ImportedVisit {
  row: number;
  visitCode: string;
  visitDate: IsoDate | null;
  outcome: "done" | "missed";
}

export interface ImportedSubject {
  row: number;
  subjectCode: string;
  siteCode: string;
  status: SubjectStatus;
  consentDate: IsoDate;
  screeningDate: IsoDate | null;
  enrolmentDate: IsoDate | null;
  implantDate: IsoDate | null;
  deviceSerial: string | null;
  screenFailReason: string | null;
  withdrawnReason: string | null;
  visits: ImportedVisit[];
}

export interface ImportError {
  /** 1 = the header row. */
  row: number;
  column: SubjectImportColumn | null;
  message: string;
}

export type SubjectImportResult = { ok: true; subjects: ImportedSubject[] } | { ok: false; errors: ImportError[] };

export interface SubjectImportOptions {
  /** Schedules of the study's protocol versions: visit codes must appear in one of them. */
  schedules: readonly VisitSchedule[];
  /** When given, every row must belong to one of these sites (e.g. the importer's own site). */
  allowedSiteCodes?: readonly string[];
  /** When given, no date may be after this day (the site's today). */
  today?: IsoDate;
}

const DEVICE_SERIAL = /^[A-Za-z0-9][A-Za-z0-9._/-]{0,39}$/;
const MAX_REASON = 500;

// Which dates each status requires (R) or forbids (F); withdrawn allows any recorded so far.
const datesByStatus: Record<SubjectStatus, { enrolled: "R" | "F" | "O"; implant: "R" | "F" | "O" }> = {
  screening: { enrolled: "F", implant: "F" },
  screen_failed: { enrolled: "F", implant: "F" },
  enrolled: { enrolled: "R", implant: "F" },
  implanted: { enrolled: "R", implant: "R" },
  follow_up: { enrolled: "R", implant: "R" },
  completed: { enrolled: "R", implant: "R" },
  withdrawn: { enrolled: "O", implant: "O" },
};

export function parseSubjectImport(csv: string, options: SubjectImportOptions): SubjectImportResult {
  const errors: ImportError[] = [];
  const fail = (row: number, column: SubjectImportColumn | null, message: string) => errors.push({ row, column, message });

  const parsed = Papa.parse<string[]>(csv.replace(/^\uFEFF/, ""), { header: false, skipEmptyLines: false });
  for (const e of parsed.errors) {
    // Papa reports a 0-based data-row index; +1 for our 1-based rows.
    fail((e.row ?? 0) + 1, null, `The file could not be read here: ${e.message}`);
  }
  const records = parsed.data;
  const header = (records[0] ?? []).map((h) => h.trim().toLowerCase());
  if (header.length === 0 || header.every((h) => h === "")) {
    return { ok: false, errors: [{ row: 1, column: null, message: "The file is empty: expected a header row with column names" }] };
  }
  const colIndex = new Map<SubjectImportColumn, number>();
  header.forEach((h, i) => {
    if (!(subjectImportColumns as readonly string[]).includes(h)) {
      fail(1, null, `Unknown column "${h}"; the columns are ${subjectImportColumns.join(", ")}`);
    } else if (colIndex.has(h as SubjectImportColumn)) {
      fail(1, h as SubjectImportColumn, `Column ${h} appears twice`);
    } else colIndex.set(h as SubjectImportColumn, i);
  });
  for (const c of requiredColumns) if (!colIndex.has(c)) fail(1, c, `Missing column ${c}`);
  const hasRowType = colIndex.has("row_type");
  if (!hasRowType) for (const c of visitOnlyColumns) if (colIndex.has(c)) fail(1, c, `Column ${c} needs a row_type column to mark visit rows`);
  if (records.length - 1 > MAX_IMPORT_ROWS) fail(1, null, `Too many rows: at most ${MAX_IMPORT_ROWS} per file`);
  if (errors.length > 0) return { ok: false, errors };

  const knownVisitCodes = new Set(options.schedules.flatMap((s) => s.map((v) => v.code)));
  // The anchor events each code hangs on, over all versions (normally one).
  const anchorsByCode = new Map<string, Set<AnchorEvent>>();
  for (const s of options.schedules) for (const v of s) anchorsByCode.set(v.code, (anchorsByCode.get(v.code) ?? new Set()).add(v.anchor));
  const allowedSites = options.allowedSiteCodes ? new Set(options.allowedSiteCodes) : null;
  const todayDay = options.today ? toDayNumber(options.today) : null;

  const subjects = new Map<string, ImportedSubject>();
  const rejectedSubjectRows = new Map<string, number>();
  const pendingVisits: { row: number; subjectCode: string; siteCode: string | null; visit: ImportedVisit }[] = [];

  for (let i = 1; i < records.length; i++) {
    const rec = records[i] ?? [];
    const row = i + 1;
    if (rec.every((f) => f.trim() === "")) continue; // blank line
    if (rec.length !== header.length) {
      fail(row, null, `Row has ${rec.length} fields; the header has ${header.length}`);
      continue;
    }
    const get = (c: SubjectImportColumn): string => {
      const idx = colIndex.get(c);
      return idx === undefined ? "" : (rec[idx] ?? "").trim();
    };
    const date = (c: SubjectImportColumn, required: boolean): IsoDate | null | undefined => {
      const v = get(c);
      if (v === "") {
        if (required) fail(row, c, `${c} is required`);
        return required ? undefined : null;
      }
      if (!isCalendarDate(v)) {
        fail(row, c, `"${v}" is not a real date written YYYY-MM-DD`);
        return undefined;
      }
      if (todayDay !== null && toDayNumber(v) > todayDay) {
        fail(row, c, `${v} is in the future`);
        return undefined;
      }
      return v;
    };
    const rowType = hasRowType ? get("row_type").toLowerCase() : "subject";

    if (rowType === "visit") {
      for (const c of subjectOnlyColumns) if (get(c) !== "") fail(row, c, `Leave ${c} empty on a visit row`);
      const rawCode = get("subject_code");
      if (rawCode === "") fail(row, "subject_code", "subject_code is required");
      const parsedCode = subjectCodeSchema.safeParse(rawCode);
      const subjectCode = parsedCode.success ? parsedCode.data : rawCode;
      const siteCode = get("site_code") || null;
      const visitCode = get("visit_code");
      if (visitCode === "") fail(row, "visit_code", "visit_code is required");
      else if (!knownVisitCodes.has(visitCode)) fail(row, "visit_code", `Unknown visit code ${visitCode}: not in the schedule of any protocol version`);
      const outcome = get("outcome").toLowerCase();
      if (outcome !== "done" && outcome !== "missed") fail(row, "outcome", `outcome must be done or missed, got "${get("outcome")}"`);
      const visitDate = date("visit_date", outcome === "done");
      if (subjectCode !== "" && knownVisitCodes.has(visitCode) && (outcome === "done" || outcome === "missed") && visitDate !== undefined) {
        pendingVisits.push({ row, subjectCode, siteCode, visit: { row, visitCode, visitDate, outcome } });
      }
      continue;
    }
    if (rowType !== "subject") {
      fail(row, "row_type", `row_type must be subject or visit, got "${get("row_type")}"`);
      continue;
    }

    const before = errors.length;
    if (hasRowType) for (const c of visitOnlyColumns) if (get(c) !== "") fail(row, c, `Leave ${c} empty on a subject row`);
    const siteCode = get("site_code");
    const site = siteCodeSchema.safeParse(siteCode);
    if (!site.success) fail(row, "site_code", site.error.issues[0]?.message ?? "Invalid site code");
    else if (allowedSites && !allowedSites.has(site.data)) fail(row, "site_code", `Site ${site.data} is not one you may import into`);
    let subjectCode = get("subject_code");
    if (site.success) {
      const code = subjectCodeSchemaForSite(site.data).safeParse(subjectCode);
      if (!code.success) fail(row, "subject_code", code.error.issues[0]?.message ?? "Invalid subject code");
      else {
        subjectCode = code.data;
        const earlier = subjects.get(subjectCode)?.row ?? rejectedSubjectRows.get(subjectCode);
        if (earlier !== undefined) fail(row, "subject_code", `Subject ${subjectCode} already appears on row ${earlier}`);
      }
    }
    const statusRaw = get("status");
    const status = isSubjectStatus(statusRaw) ? statusRaw : null;
    if (!status) fail(row, "status", `status must be one of ${subjectStatuses.join(", ")}; got "${statusRaw}"`);

    const consent = date("consent_date", true);
    const screening = date("screening_date", false);
    const enrolled = date("enrolled_date", status !== null && datesByStatus[status].enrolled === "R");
    const implant = date("implant_date", status !== null && datesByStatus[status].implant === "R");
    if (status) {
      const rule = datesByStatus[status];
      if (rule.enrolled === "F" && enrolled) fail(row, "enrolled_date", `A subject in ${status} has no enrolment date`);
      if (rule.implant === "F" && implant) fail(row, "implant_date", `A subject in ${status} has no implant date`);
      if (implant && !get("enrolled_date")) fail(row, "enrolled_date", "An implanted subject needs an enrolment date");
    }
    // consent ≤ screening ≤ enrolment ≤ implant (informed consent precedes any study procedure).
    const ordered: [SubjectImportColumn, IsoDate | null | undefined][] = [
      ["consent_date", consent],
      ["screening_date", screening],
      ["enrolled_date", enrolled],
      ["implant_date", implant],
    ];
    let prev: [SubjectImportColumn, IsoDate] | null = null;
    for (const [c, d] of ordered) {
      if (!d) continue;
      if (prev && d < prev[1]) fail(row, c, `${c} ${d} is before ${prev[0]} ${prev[1]}`);
      prev = [c, d];
    }

    const serial = get("device_serial");
    if (serial !== "" && !DEVICE_SERIAL.test(serial)) fail(row, "device_serial", "device_serial: up to 40 letters, digits, '.', '_', '/' or '-'");
    if (implant && serial === "") fail(row, "device_serial", "An implanted subject needs the device serial number");
    if (!get("implant_date") && serial !== "") fail(row, "device_serial", "A device serial is recorded only with an implant date");

    const screenFailReason = get("screen_fail_reason");
    const withdrawnReason = get("withdrawn_reason");
    if (status === "screen_failed" && screenFailReason === "") fail(row, "screen_fail_reason", "Give the reason for the screen failure");
    if (status !== "screen_failed" && screenFailReason !== "") fail(row, "screen_fail_reason", "screen_fail_reason is only for screen_failed subjects");
    if (status === "withdrawn" && withdrawnReason === "") fail(row, "withdrawn_reason", "Give the reason for the withdrawal");
    if (status !== "withdrawn" && withdrawnReason !== "") fail(row, "withdrawn_reason", "withdrawn_reason is only for withdrawn subjects");
    for (const [c, v] of [["screen_fail_reason", screenFailReason], ["withdrawn_reason", withdrawnReason]] as const) {
      if (v.length > MAX_REASON) fail(row, c, `${c} is longer than ${MAX_REASON} characters`);
    }

    if (errors.length === before && site.success && status && consent) {
      subjects.set(subjectCode, {
        row,
        subjectCode,
        siteCode: site.data,
        status,
        consentDate: consent,
        screeningDate: screening ?? null,
        enrolmentDate: enrolled ?? null,
        implantDate: implant ?? null,
        deviceSerial: serial || null,
        screenFailReason: screenFailReason || null,
        withdrawnReason: withdrawnReason || null,
        visits: [],
      });
    } else if (subjectCode !== "" && !subjects.has(subjectCode)) {
      // Remembered so its visit rows are not also reported as having no subject row.
      rejectedSubjectRows.set(subjectCode, row);
    }
  }

  for (const { row, subjectCode, siteCode, visit } of pendingVisits) {
    if (rejectedSubjectRows.has(subjectCode)) continue; // its subject row's errors are reported there
    const subject = subjects.get(subjectCode);
    if (!subject) {
      fail(row, "subject_code", `No subject row for ${subjectCode} in this file`);
      continue;
    }
    if (siteCode !== null && siteCode !== subject.siteCode) {
      fail(row, "site_code", `Subject ${subjectCode} belongs to site ${subject.siteCode}, not ${siteCode}`);
      continue;
    }
    if (subject.status === "screen_failed") {
      fail(row, "visit_code", `Subject ${subjectCode} failed screening and has no study visits`);
      continue;
    }
    if (subject.visits.some((v) => v.visitCode === visit.visitCode)) {
      fail(row, "visit_code", `Visit ${visit.visitCode} of ${subjectCode} appears twice`);
      continue;
    }
    const anchorDates: Record<AnchorEvent, IsoDate | null> = {
      consent: subject.consentDate,
      enrolment: subject.enrolmentDate,
      implant: subject.implantDate,
    };
    const anchorsOfCode = [...(anchorsByCode.get(visit.visitCode) ?? [])];
    if (visit.outcome === "done" && !anchorsOfCode.some((a) => anchorDates[a] !== null)) {
      fail(row, "visit_code", `Visit ${visit.visitCode} counts from the ${anchorsOfCode.join("/")} date, which subject ${subjectCode} does not have`);
      continue;
    }
    if (visit.visitDate && visit.visitDate < subject.consentDate) {
      fail(row, "visit_date", `Visit date ${visit.visitDate} is before the consent date ${subject.consentDate}`);
      continue;
    }
    subject.visits.push(visit);
  }

  if (errors.length > 0) {
    errors.sort((a, b) => a.row - b.row);
    return { ok: false, errors };
  }
  return { ok: true, subjects: [...subjects.values()] };
}
