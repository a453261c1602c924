import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { addDays, differenceInCalendarDays, format } from "date-fns";
import {
  addCalendarDays,
  calendarDaysBetween,
  daysOutsideWindow,
  fromDayNumber,
  isCalendarDate,
  toDayNumber,
  visitWindow,
} from "@/lib/visits/calendar-date";

// Reference: date-fns addDays / differenceInCalendarDays on local dates, formatted yyyy-MM-dd.
const local = (iso: string) => new Date(Number(iso.slice(0, 4)), Number(iso.slice(5, 7)) - 1, Number(iso.slice(8, 10)));
const refAdd = (iso: string, n: number) => format(addDays(local(iso), n), "yyyy-MM-dd");
const refDiff = (a: string, b: string) => differenceInCalendarDays(local(b), local(a));

describe("visitWindow — REFERENCES.md visit windows (common practice), implant 2025-01-15 = day 0", () => {
  const implant = "2025-01-15";
  it.each([
    ["1 week", 7, 3, 3, "2025-01-22", "2025-01-19", "2025-01-25"],
    ["1 month", 30, 7, 7, "2025-02-14", "2025-02-07", "2025-02-21"],
    ["3 months", 90, 14, 14, "2025-04-15", "2025-04-01", "2025-04-29"],
    ["12 months", 365, 30, 30, "2026-01-15", "2025-12-16", "2026-02-14"],
  ])("%s (day %i)", (_name, dayOffset, windowBefore, windowAfter, target, start, end) => {
    const w = visitWindow(implant, { dayOffset, windowBefore, windowAfter });
    expect(w.windowStart).toBe(start);
    expect(w.windowEnd).toBe(end);
    // Target dates are not listed in REFERENCES.md; checked against date-fns addDays.
    expect(w.targetDate).toBe(target);
    expect(w.targetDate).toBe(refAdd(implant, dayOffset));
  });
});

describe("month ends and the leap day, against date-fns", () => {
  it("implant 2024-01-31 + 30 days lands on 2024-03-01 (2024 is a leap year)", () => {
    expect(addCalendarDays("2024-01-31", 30)).toBe(refAdd("2024-01-31", 30));
    expect(addCalendarDays("2024-01-31", 30)).toBe("2024-03-01");
  });
  it("a window across 2024-02-29", () => {
    const w = visitWindow("2024-01-30", { dayOffset: 30, windowBefore: 7, windowAfter: 7 });
    expect(w).toEqual({
      targetDate: refAdd("2024-01-30", 30),
      windowStart: refAdd("2024-01-30", 23),
      windowEnd: refAdd("2024-01-30", 37),
    });
    expect(w.targetDate).toBe("2024-02-29");
    expect(calendarDaysBetween(w.windowStart, w.windowEnd)).toBe(refDiff(w.windowStart, w.windowEnd));
  });
  it("the same window in 2025 (no leap day) ends a day later in March", () => {
    const w = visitWindow("2025-01-30", { dayOffset: 30, windowBefore: 7, windowAfter: 7 });
    expect(w.targetDate).toBe(refAdd("2025-01-30", 30));
    expect(w.windowEnd).toBe(refAdd("2025-01-30", 37));
  });
  it("month ends: 31 Jan, 30 Apr, 31 Dec across year end", () => {
    for (const [d, n] of [["2025-01-31", 1], ["2025-04-30", 1], ["2025-12-31", 1], ["2024-03-01", -1], ["2023-03-01", -1]] as const) {
      expect(addCalendarDays(d, n)).toBe(refAdd(d, n));
    }
  });
  it("negative day offsets (a visit before the anchor)", () => {
    const w = visitWindow("2024-03-01", { dayOffset: -14, windowBefore: 3, windowAfter: 0 });
    expect(w.targetDate).toBe(refAdd("2024-03-01", -14));
    expect(w.windowStart).toBe(refAdd("2024-03-01", -17));
    expect(w.windowEnd).toBe(w.targetDate);
  });
});

describe("property: agrees with date-fns for any date 1901–2099 and offset within ±4000 days", () => {
  const isoDates = fc.date({ min: new Date(1901, 0, 1), max: new Date(2099, 11, 31), noInvalidDate: true }).map((d) => format(d, "yyyy-MM-dd"));
  it("addCalendarDays = date-fns addDays", () => {
    fc.assert(
      fc.property(isoDates, fc.integer({ min: -4000, max: 4000 }), (d, n) => addCalendarDays(d, n) === refAdd(d, n)),
      { numRuns: 2000 },
    );
  });
  it("calendarDaysBetween = date-fns differenceInCalendarDays", () => {
    fc.assert(fc.property(isoDates, isoDates, (a, b) => calendarDaysBetween(a, b) === refDiff(a, b)), { numRuns: 2000 });
  });
});

describe("day numbers", () => {
  it("day 0 is 1970-01-01 (POSIX epoch, IEEE Std 1003.1 Base Definitions §4.16; clause from memory)", () => {
    expect(toDayNumber("1970-01-01")).toBe(0);
    expect(fromDayNumber(0)).toBe("1970-01-01");
  });
  it("agree with Date.UTC day counts (ECMA-262 Time Values: a day is 86 400 000 ms; clause from memory)", () => {
    for (const d of ["1900-03-01", "2000-02-29", "2024-02-29", "2100-03-01", "1969-12-31"]) {
      expect(toDayNumber(d)).toBe(Date.parse(`${d}T00:00:00Z`) / 86_400_000);
    }
  });
  it("Gregorian leap years: 2000 yes, 1900 and 2100 no (Gregorian rule as in ISO 8601-1 definitions of leap year; clause from memory)", () => {
    expect(isCalendarDate("2000-02-29")).toBe(true);
    expect(isCalendarDate("2024-02-29")).toBe(true);
    expect(isCalendarDate("1900-02-29")).toBe(false);
    expect(isCalendarDate("2100-02-29")).toBe(false);
    expect(isCalendarDate("2023-02-29")).toBe(false);
  });
  it("refuses what is not a real date written YYYY-MM-DD", () => {
    for (const bad of ["2025-04-31", "2025-13-01", "2025-00-10", "2025-1-5", "15.01.2025", "2025-01-15T00:00:00Z", ""]) {
      expect(isCalendarDate(bad)).toBe(false);
      expect(() => toDayNumber(bad)).toThrow(/Not a calendar date/);
    }
  });
  it("daysOutsideWindow: 0 inside, negative early, positive late", () => {
    const s = toDayNumber("2025-01-19");
    const e = toDayNumber("2025-01-25");
    expect(daysOutsideWindow(toDayNumber("2025-01-19"), s, e)).toBe(0);
    expect(daysOutsideWindow(toDayNumber("2025-01-25"), s, e)).toBe(0);
    expect(daysOutsideWindow(toDayNumber("2025-01-17"), s, e)).toBe(-2);
    expect(daysOutsideWindow(toDayNumber("2025-02-01"), s, e)).toBe(refDiff("2025-01-25", "2025-02-01"));
  });
});
