import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { addDays, differenceInCalendarDays, differenceInHours, format } from "date-fns";
import { TZDate } from "@date-fns/tz";
import { acknowledgementDueOn, formatSiteLocalTime, lateFrom, siteDateAt, startOfSiteDay, utcOffsetMinutes } from "@/lib/acknowledgements/deadline";

// Reference library: date-fns 4 with @date-fns/tz (TZDate does calendar arithmetic in the named zone).
const refSiteDate = (instant: Date, tz: string) => format(new TZDate(instant.getTime(), tz), "yyyy-MM-dd");
const refDueOn = (instant: Date, tz: string, days: number) => format(addDays(new TZDate(instant.getTime(), tz), days), "yyyy-MM-dd");
const refStartOfDay = (iso: string, tz: string) => new Date(new TZDate(Number(iso.slice(0, 4)), Number(iso.slice(5, 7)) - 1, Number(iso.slice(8, 10)), tz).getTime());
const refLocal = (instant: Date, tz: string) => format(new TZDate(instant.getTime(), tz), "yyyy-MM-dd HH:mm:ss xxx");

const zones = ["Europe/Berlin", "America/New_York", "Asia/Tokyo", "Australia/Sydney", "America/Santiago", "Asia/Kolkata", "UTC"];

describe("site date of an instant — against @date-fns/tz", () => {
  it("every 20 minutes around the Berlin spring change (2026-03-29 02:00 → 03:00) and the month end", () => {
    for (let t = Date.UTC(2026, 2, 28, 12); t <= Date.UTC(2026, 3, 1, 12); t += 20 * 60_000) {
      const d = new Date(t);
      expect(siteDateAt(d, "Europe/Berlin"), d.toISOString()).toBe(refSiteDate(d, "Europe/Berlin"));
      expect(formatSiteLocalTime(d, "Europe/Berlin"), d.toISOString()).toBe(refLocal(d, "Europe/Berlin"));
    }
  });

  it("any instant 2020–2035 in several zones", () => {
    fc.assert(
      fc.property(fc.integer({ min: Date.UTC(2020, 0, 1) / 1000, max: Date.UTC(2035, 11, 31) / 1000 }), fc.constantFrom(...zones), (sec, tz) => {
        const d = new Date(sec * 1000);
        expect(siteDateAt(d, tz)).toBe(refSiteDate(d, tz));
        expect(formatSiteLocalTime(d, tz)).toBe(refLocal(d, tz));
        expect(utcOffsetMinutes(d, tz)).toBe(-new TZDate(d.getTime(), tz).getTimezoneOffset());
      }),
      { numRuns: 2000 },
    );
  });
});

describe("due date = site date at the request + deadline days — against date-fns addDays in the zone", () => {
  it.each([
    // Released 23:30 UTC on 25 January: already 26 January in Tokyo; 14 days cross the month end.
    ["2026-01-25T23:30:00Z", "Asia/Tokyo", 14, "2026-02-09"],
    // Same instant is still 25 January in New York.
    ["2026-01-25T23:30:00Z", "America/New_York", 14, "2026-02-08"],
    // Leap year February: 2028-02-20 + 14 → 2028-03-05.
    ["2028-02-20T10:00:00Z", "Europe/Berlin", 14, "2028-03-05"],
    // Across the Berlin spring change and the March → April month end.
    ["2026-03-20T23:30:00Z", "Europe/Berlin", 14, "2026-04-04"],
    // Across the New York autumn change (2026-11-01).
    ["2026-10-25T03:30:00Z", "America/New_York", 14, "2026-11-07"],
  ])("%s in %s + %i days → %s", (iso, tz, days, expected) => {
    const at = new Date(iso);
    expect(refDueOn(at, tz, days)).toBe(expected);
    expect(acknowledgementDueOn(at, tz, days)).toBe(expected);
  });

  it("any request instant and deadline", () => {
    fc.assert(
      fc.property(fc.integer({ min: Date.UTC(2020, 0, 1) / 1000, max: Date.UTC(2035, 11, 31) / 1000 }), fc.constantFrom(...zones), fc.integer({ min: 0, max: 90 }), (sec, tz, days) => {
        const d = new Date(sec * 1000);
        expect(acknowledgementDueOn(d, tz, days)).toBe(refDueOn(d, tz, days));
      }),
      { numRuns: 1000 },
    );
  });

  it("refuses a negative or fractional deadline", () => {
    expect(() => acknowledgementDueOn(new Date(), "UTC", -1)).toThrow(/whole number/);
    expect(() => acknowledgementDueOn(new Date(), "UTC", 1.5)).toThrow(/whole number/);
  });
});

describe("late from = the start of the day after the due date at the site", () => {
  it("a due date on the Berlin spring-change day lasts 23 hours; on the autumn-change day 25", () => {
    // Spring 2026-03-29 and autumn 2026-10-25 changes in the EU (Directive 2000/84/EC: last Sunday of March / October — from memory; the hours are checked against date-fns).
    expect(differenceInHours(lateFrom("2026-03-29", "Europe/Berlin"), lateFrom("2026-03-28", "Europe/Berlin"))).toBe(23);
    expect(differenceInHours(lateFrom("2026-10-25", "Europe/Berlin"), lateFrom("2026-10-24", "Europe/Berlin"))).toBe(25);
    expect(lateFrom("2026-03-29", "Europe/Berlin").toISOString()).toBe(refStartOfDay("2026-03-30", "Europe/Berlin").toISOString());
    expect(lateFrom("2026-03-28", "Europe/Berlin").toISOString()).toBe("2026-03-28T23:00:00.000Z");
    expect(lateFrom("2026-03-29", "Europe/Berlin").toISOString()).toBe("2026-03-29T22:00:00.000Z");
  });

  it("start of any day in several zones agrees with TZDate's local midnight", () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 365 * 15 }), fc.constantFrom(...zones.filter((z) => z !== "America/Santiago")), (n, tz) => {
        const iso = format(addDays(new Date(2020, 0, 1), n), "yyyy-MM-dd");
        expect(startOfSiteDay(iso, tz).toISOString()).toBe(refStartOfDay(iso, tz).toISOString());
      }),
      { numRuns: 1000 },
    );
  });

  it("where midnight does not exist (Santiago springs forward at 00:00), the day starts at 01:00", () => {
    // Chile's 2026 change: Sunday 6 September 00:00 → 01:00 (tz database, America/Santiago).
    const start = startOfSiteDay("2026-09-06", "America/Santiago");
    expect(siteDateAt(start, "America/Santiago")).toBe("2026-09-06");
    expect(siteDateAt(new Date(start.getTime() - 1000), "America/Santiago")).toBe("2026-09-05");
    expect(formatSiteLocalTime(start, "America/Santiago")).toBe("2026-09-06 01:00:00 -03:00");
    expect(start.toISOString()).toBe(refStartOfDay("2026-09-06", "America/Santiago").toISOString());
  });
});
