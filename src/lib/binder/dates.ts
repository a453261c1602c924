import { isCalendarDate } from "@/lib/visits/calendar-date";

// Calendar helpers of the binder: the proposed expiry of a dated certificate, and the ISO week
// that keys the weekly digest.

function daysInMonth(y: number, m: number): number {
  if (m === 2) return (y % 4 === 0 && y % 100 !== 0) || y % 400 === 0 ? 29 : 28;
  return m === 4 || m === 6 || m === 9 || m === 11 ? 30 : 31;
}

/**
 * issuedOn + months, the day clamped to the end of a shorter month (2025-01-31 + 1 month =
 * 2025-02-28), as date-fns addMonths does.
 */
export function addMonths(date: string, months: number): string {
  if (!isCalendarDate(date)) throw new RangeError(`Not a calendar date: ${JSON.stringify(date)}`);
  if (!Number.isInteger(months)) throw new RangeError("months must be an integer");
  const [y, m, d] = date.split("-").map(Number) as [number, number, number];
  const index = y * 12 + (m - 1) + months;
  const ny = Math.floor(index / 12);
  const nm = (index % 12) + 1;
  const nd = Math.min(d, daysInMonth(ny, nm));
  return `${String(ny).padStart(4, "0")}-${String(nm).padStart(2, "0")}-${String(nd).padStart(2, "0")}`;
}

/** Proposed last valid day: the issue date plus the usual validity. */
export function proposedExpiry(issuedOn: string, validityMonths: number): string {
  return addMonths(issuedOn, validityMonths);
}

/** ISO 8601 week of a UTC instant, "YYYY-Www" (weeks start Monday; week 1 holds the year's first Thursday). */
export function isoWeekKey(at: Date): string {
  const day = Date.UTC(at.getUTCFullYear(), at.getUTCMonth(), at.getUTCDate());
  const weekday = (new Date(day).getUTCDay() + 6) % 7; // Monday = 0
  const thursday = new Date(day + (3 - weekday) * 86_400_000);
  const year = thursday.getUTCFullYear();
  const week = Math.floor((thursday.getTime() - Date.UTC(year, 0, 1)) / (7 * 86_400_000)) + 1;
  return `${year}-W${String(week).padStart(2, "0")}`;
}
