import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { addDays as dfAddDays, endOfMonth, endOfQuarter, format, parseISO } from "date-fns";
import { addDays, cyclePeriodOf, dueDateOf, localDate } from "@/lib/payment-schedule/calendar";

// date-fns is the outside reference for the calendar arithmetic.
const isoDate = fc.date({ min: new Date(1990, 0, 1), max: new Date(2100, 11, 31), noInvalidDate: true }).map((d) => format(d, "yyyy-MM-dd"));

describe("calendar arithmetic against date-fns", () => {
  it("addDays agrees with date-fns addDays", () => {
    fc.assert(
      fc.property(isoDate, fc.integer({ min: -2000, max: 2000 }), (d, n) => {
        expect(addDays(d, n)).toBe(format(dfAddDays(parseISO(d), n), "yyyy-MM-dd"));
      }),
      { numRuns: 2000, seed: 1 },
    );
  });

  it("cycle ends agree with endOfMonth and endOfQuarter; due = end + net days", () => {
    fc.assert(
      fc.property(isoDate, fc.constantFrom(0, 30, 45, 60, 90), (d, net) => {
        expect(cyclePeriodOf(d, "monthly").end).toBe(format(endOfMonth(parseISO(d)), "yyyy-MM-dd"));
        const q = cyclePeriodOf(d, "quarterly");
        expect(q.end).toBe(format(endOfQuarter(parseISO(d)), "yyyy-MM-dd"));
        expect(dueDateOf(q, net)).toBe(format(dfAddDays(endOfQuarter(parseISO(d)), net), "yyyy-MM-dd"));
      }),
      { numRuns: 2000, seed: 2 },
    );
  });

  it("leap years: 2028-Q1 net 30 is due 2028-04-30; Feb 2028 ends on the 29th", () => {
    expect(dueDateOf(cyclePeriodOf("2028-02-10", "quarterly"), 30)).toBe(format(dfAddDays(endOfQuarter(new Date(2028, 1, 10)), 30), "yyyy-MM-dd"));
    expect(cyclePeriodOf("2028-02-10", "monthly").end).toBe("2028-02-29");
  });

  it("turns a UTC timestamp into the site's calendar date (IANA zones)", () => {
    expect(localDate("2026-12-01T23:30:00Z", "Asia/Tokyo")).toBe("2026-12-02");
    expect(localDate("2026-12-01T03:00:00Z", "America/Chicago")).toBe("2026-11-30");
    expect(localDate("2026-12-01", "America/Chicago")).toBe("2026-12-01");
    expect(() => localDate("yesterday", "UTC")).toThrow(/neither a date nor a timestamp/);
  });
});
