import { TZDate } from "@date-fns/tz";
import { addMonths as addCalendarMonths, format, getISOWeek, getISOWeekYear } from "date-fns";
import { isCalendarDate } from "@/lib/visits/calendar-date";

// Calendar helpers of the binder: the proposed expiry of a dated certificate, and the ISO week
// that keys the weekly digest. Arithmetic by date-fns on dates pinned to UTC, so the server's own
// time zone never shifts a day.

/**
 * issuedOn + months, the day clamped to the end of a shorter month (2025-01-31 + 1 month =
 * 2025-02-28), as date-fns addMonths does.
 */
export function addMonths(date: string, months: number): string {
  if (!isCalendarDate(date)) throw new RangeError(`Not a calendar date: ${JSON.stringify(date)}`);
  if (!Number.isInteger(months)) throw new RangeError("months must be an integer");
  const [y, m, d] = date.split("-").map(Number) as [number, number, number];
  return format(addCalendarMonths(new TZDate(y, m - 1, d, "UTC"), months), "yyyy-MM-dd");
}

/** Proposed last valid day: the issue date plus the usual validity. */
export function proposedExpiry(issuedOn: string, validityMonths: number): string {
  return addMonths(issuedOn, validityMonths);
}

/** ISO 8601 week of a UTC instant, "YYYY-Www" (weeks start Monday; week 1 holds the year's first Thursday). */
export function isoWeekKey(at: Date): string {
  const utc = new TZDate(at.getTime(), "UTC");
  return `${getISOWeekYear(utc)}-W${String(getISOWeek(utc)).padStart(2, "0")}`;
}
