import { describe, expect, it } from "vitest";
import { parseSubjectImport, type SubjectImportResult } from "@/lib/subjects/csv-import";
import { scheduleV1, scheduleV2 } from "../visits/fixtures";

const HEADER =
  "row_type,subject_code,site_code,status,consent_date,screening_date,enrolled_date,implant_date,device_serial,screen_fail_reason,withdrawn_reason,visit_code,visit_date,outcome";
const options = { schedules: [scheduleV1, scheduleV2], today: "2025-06-30" };
const good = [
  "subject,DE01-001,DE01,follow_up,2025-01-02,2025-01-03,2025-01-08,2025-01-15,KV-0001,,,,,",
  "subject,DE01-002,DE01,screen_failed,2025-01-05,2025-01-06,,,,Inclusion criterion 4 not met,,,,",
  "subject,DE01-003,DE01,withdrawn,2025-01-07,,2025-01-20,,,,Moved abroad,,,",
  "subject,DE01-004,DE01,screening,2025-06-20,,,,,,,,,",
  "visit,DE01-001,DE01,,,,,,,,,W1,2025-01-22,done",
  "visit,DE01-001,,,,,,,,,,M1,,missed",
  "visit,DE01-001,,,,,,,,,,M3,2025-04-15,done",
];
const csv = (...rows: string[]) => [HEADER, ...rows].join("\n");
const errorsOf = (r: SubjectImportResult) => (r.ok ? [] : r.errors);

describe("subject CSV import", () => {
  it("parses a valid file: subjects with their visits", () => {
    const r = parseSubjectImport(csv(...good), options);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.subjects.map((s) => [s.subjectCode, s.status])).toEqual([
      ["DE01-001", "follow_up"],
      ["DE01-002", "screen_failed"],
      ["DE01-003", "withdrawn"],
      ["DE01-004", "screening"],
    ]);
    expect(r.subjects[0]).toMatchObject({ implantDate: "2025-01-15", deviceSerial: "KV-0001", enrolmentDate: "2025-01-08" });
    expect(r.subjects[0]?.visits.map((v) => [v.visitCode, v.outcome, v.visitDate])).toEqual([
      ["W1", "done", "2025-01-22"],
      ["M1", "missed", null],
      ["M3", "done", "2025-04-15"],
    ]);
    expect(r.subjects[1]?.screenFailReason).toBe("Inclusion criterion 4 not met");
  });

  it("one bad row imports nothing and reports that row", () => {
    const rows = [...good];
    rows.splice(2, 0, "subject,DE01-005,DE01,enrolled,2025-02-30,,2025-03-01,,,,,,,"); // 30 February
    const r = parseSubjectImport(csv(...rows), options);
    expect(r.ok).toBe(false);
    expect(errorsOf(r)).toEqual([{ row: 4, column: "consent_date", message: expect.stringContaining("not a real date") }]);
    expect("subjects" in r).toBe(false);
  });

  it("checks the date order consent ≤ screening ≤ enrolment ≤ implant", () => {
    const r = parseSubjectImport(csv("subject,DE01-001,DE01,implanted,2025-01-10,2025-01-09,2025-01-12,2025-01-11,KV-1,,,,,"), options);
    expect(errorsOf(r).map((e) => [e.row, e.column])).toEqual([
      [2, "screening_date"],
      [2, "implant_date"],
    ]);
  });

  it("checks dates against the status", () => {
    const errors = errorsOf(
      parseSubjectImport(
        csv(
          "subject,DE01-001,DE01,implanted,2025-01-02,,2025-01-08,,,,,,,", // implant date and serial missing
          "subject,DE01-002,DE01,screening,2025-01-02,,2025-01-08,,,,,,,", // screening with an enrolment date
          "subject,DE01-003,DE01,screen_failed,2025-01-02,,,,,,,,,", // no reason
          "subject,DE01-004,DE01,enrolled,2025-01-02,,2025-01-08,,,,Lost,,,", // reason for the wrong status
          "subject,DE01-005,DE01,follow_up,2025-01-02,,2025-01-08,2025-07-15,KV-5,,,,,", // implant in the future
          "subject,DE01-006,DE01,retired,2025-01-02,,,,,,,,,", // unknown status
        ),
        options,
      ),
    );
    expect(errors.map((e) => [e.row, e.column])).toEqual([
      [2, "implant_date"],
      [3, "enrolled_date"],
      [4, "screen_fail_reason"],
      [5, "withdrawn_reason"],
      [6, "implant_date"],
      [7, "status"],
    ]);
  });

  it("refuses subject codes that look like names or dates, and codes of another site", () => {
    const errors = errorsOf(
      parseSubjectImport(
        csv(
          "subject,Anna Berg,DE01,screening,2025-01-02,,,,,,,,,",
          "subject,1980-03-12,DE01,screening,2025-01-02,,,,,,,,,",
          "subject,DE02-001,DE01,screening,2025-01-02,,,,,,,,,",
          "subject,DE01-001,DE01,screening,2025-01-02,,,,,,,,,",
          "subject,DE01-001,DE01,screening,2025-01-03,,,,,,,,,",
        ),
        options,
      ),
    );
    expect(errors).toEqual([
      { row: 2, column: "subject_code", message: expect.stringMatching(/personal name/) },
      { row: 3, column: "subject_code", message: expect.stringMatching(/looks like a date/) },
      { row: 4, column: "subject_code", message: expect.stringMatching(/start with DE01-/) },
      { row: 6, column: "subject_code", message: expect.stringMatching(/already appears on row 5/) },
    ]);
  });

  it("checks visit rows: known codes, outcome, a subject row, no visits after screen failure", () => {
    const errors = errorsOf(
      parseSubjectImport(
        csv(
          good[0]!,
          good[1]!,
          "visit,DE01-001,,,,,,,,,,M18,2025-04-15,done", // unknown visit code
          "visit,DE01-001,,,,,,,,,,M1,,done", // done without a date
          "visit,DE01-001,,,,,,,,,,M3,2025-04-15,attended", // bad outcome
          "visit,DE01-009,,,,,,,,,,W1,2025-01-22,done", // no subject row
          "visit,DE01-002,,,,,,,,,,SCR,2025-01-06,done", // screen failed
          "visit,DE01-001,,,,,,,,,,W1,2024-12-30,done", // before consent
          "visit,DE01-001,,follow_up,,,,,,,,M6,2025-06-14,done", // subject column on a visit row
          good[3]!,
          "visit,DE01-004,,,,,,,,,,W1,2025-06-25,done", // implant-anchored, but no implant yet
          "visit,DE01-004,,,,,,,,,,SCR,2025-06-21,done", // consent-anchored: fine
        ),
        options,
      ),
    );
    expect(errors.map((e) => [e.row, e.column])).toEqual([
      [4, "visit_code"],
      [5, "visit_date"],
      [6, "outcome"],
      [7, "subject_code"],
      [8, "visit_code"],
      [9, "visit_date"],
      [10, "status"],
      [12, "visit_code"],
    ]);
  });

  it("reports header problems on row 1, and ragged rows", () => {
    expect(errorsOf(parseSubjectImport("subject_code,site_code,status\nDE01-001,DE01,screening", options))).toEqual([
      { row: 1, column: "consent_date", message: "Missing column consent_date" },
    ]);
    expect(errorsOf(parseSubjectImport("subject_code,site_code,status,consent_date,birth_date\n", options))[0]).toMatchObject({ row: 1, message: expect.stringContaining('Unknown column "birth_date"') });
    expect(errorsOf(parseSubjectImport(csv("subject,DE01-001,DE01,screening,2025-01-02"), options))[0]).toMatchObject({ row: 2, message: expect.stringContaining("5 fields") });
    expect(errorsOf(parseSubjectImport("", options))[0]).toMatchObject({ row: 1, message: expect.stringContaining("empty") });
  });

  it("without a row_type column every row is a subject; blank lines are skipped but counted", () => {
    const r = parseSubjectImport("subject_code,site_code,status,consent_date\n\nDE01-001,DE01,screening,2025-01-02\nDE01-002,DE01,screening,2025-13-02\n", options);
    expect(errorsOf(r)).toEqual([{ row: 4, column: "consent_date", message: expect.stringContaining("not a real date") }]);
    const ok = parseSubjectImport("\uFEFFsubject_code,site_code,status,consent_date\r\nde01-001,DE01,screening,2025-01-02\r\n", options);
    expect(ok.ok && ok.subjects[0]?.subjectCode).toBe("DE01-001");
  });

  it("limits rows to the importer's sites", () => {
    const r = parseSubjectImport(csv(good[3]!), { ...options, allowedSiteCodes: ["FR02"] });
    expect(errorsOf(r)).toEqual([{ row: 2, column: "site_code", message: "Site DE01 is not one you may import into" }]);
  });
});
