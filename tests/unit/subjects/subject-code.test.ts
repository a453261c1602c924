import { describe, expect, it } from "vitest";
import { formatSubjectCode, looksLikeDate, looksLikePersonalName, siteCodeSchema, subjectCodeSchema, subjectCodeSchemaForSite } from "@/lib/subjects/subject-code";

// Pseudonymous codes only: no names, no dates (DESIGN.md capability 4; ISO 14155 and ICH E6
// expect subjects identified by code in study records — common practice).
const msg = (value: string, schema = subjectCodeSchema) => {
  const r = schema.safeParse(value);
  return r.success ? null : r.error.issues[0]?.message;
};

describe("subject codes", () => {
  it.each(["DE01-007", "DE01-12345", "JP03-100", "FRA2-0042", " DE01-007 "])("accepts %s", (code) => {
    expect(msg(code)).toBeNull();
  });

  it.each(["Anna Berg", "Berg, Anna", "anna", "DE01-ANNA", "BERG", "MÜLLER-001", "O'NEILL", "anna-007"])("refuses the name-like %s", (code) => {
    expect(msg(code)).toMatch(/personal name/);
  });

  it.each(["1980-03-12", "12.03.1980", "03/12/80", "19800312", "12031980", "12 Mar 1980", "March 12, 1980", "DE01-1980-03-12"])("refuses the date-like %s", (code) => {
    expect(msg(code)).toMatch(/looks like a date/);
  });

  it("capitalises a code typed in lower case", () => {
    expect(subjectCodeSchema.parse(" de01-007 ")).toBe("DE01-007");
  });

  it("refuses a 4-digit number that reads as a birth year", () => {
    expect(msg("DE01-1975")).toMatch(/looks like a year/);
    expect(msg("DE01-2004")).toMatch(/looks like a year/);
    expect(msg("DE01-0042")).toBeNull();
    expect(msg("DE01-3001")).toBeNull();
  });

  it("refuses the wrong shape", () => {
    for (const bad of ["DE01-07", "DE01-123456", "DE01007", "DE01_007", "D1-007", "DE01-", ""]) expect(msg(bad)).toMatch(/3 to 5 digits/);
  });

  it("site-bound schema: the prefix must be the site's code", () => {
    const de01 = subjectCodeSchemaForSite("DE01");
    expect(msg("DE01-007", de01)).toBeNull();
    expect(msg("DE02-007", de01)).toMatch(/start with DE01-/);
  });

  it("site codes contain a digit so they never spell a word", () => {
    expect(siteCodeSchema.safeParse("DE01").success).toBe(true);
    expect(siteCodeSchema.safeParse("BERLIN").success).toBe(false);
    expect(siteCodeSchema.safeParse("de01").success).toBe(false);
  });

  it("formats the n-th subject's code", () => {
    expect(formatSubjectCode("DE01", 7)).toBe("DE01-007");
    expect(formatSubjectCode("DE01", 999)).toBe("DE01-999");
    expect(formatSubjectCode("DE01", 1999)).toBe("DE01-01999");
    expect(() => formatSubjectCode("DE01", 0)).toThrow(RangeError);
  });

  it("detectors do not flag plain codes", () => {
    expect(looksLikeDate("DE01-007")).toBe(false);
    expect(looksLikePersonalName("DE01-007")).toBe(false);
  });
});
