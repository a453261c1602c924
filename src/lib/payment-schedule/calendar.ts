// Calendar arithmetic on ISO "YYYY-MM-DD" strings (site-local dates), in whole days.
// Integer day numbers (days since 1970-01-01, proleptic Gregorian) avoid Date and time zones.

export type PaymentCycle = "monthly" | "quarterly";

// The day-number arithmetic is the visits library's (one implementation for every calendar date).
export { toDayNumber as dayNumber, fromDayNumber, addCalendarDays as addDays, daysInMonth } from "@/lib/visits/calendar-date";
import { addCalendarDays as addDays, daysInMonth } from "@/lib/visits/calendar-date";

function pad(n: number, width: number): string {
  return String(n).padStart(width, "0");
}

export interface CyclePeriod {
  cycle: PaymentCycle;
  /** "2026-03" for a month, "2026-Q1" for a quarter. */
  label: string;
  start: string;
  end: string;
}

/** The calendar month or quarter a date falls in. */
export function cyclePeriodOf(iso: string, cycle: PaymentCycle): CyclePeriod {
  const y = Number(iso.slice(0, 4));
  const m = Number(iso.slice(5, 7));
  const first = cycle === "monthly" ? m : Math.floor((m - 1) / 3) * 3 + 1;
  const last = cycle === "monthly" ? m : first + 2;
  return {
    cycle,
    label: cycle === "monthly" ? `${pad(y, 4)}-${pad(m, 2)}` : `${pad(y, 4)}-Q${(first + 2) / 3}`,
    start: `${pad(y, 4)}-${pad(first, 2)}-01`,
    end: `${pad(y, 4)}-${pad(last, 2)}-${pad(daysInMonth(y, last), 2)}`,
  };
}

/** Due date of a cycle: its last day plus the net payment days. */
export function dueDateOf(period: CyclePeriod, netDays: number): string {
  return addDays(period.end, netDays);
}

const formatters = new Map<string, Intl.DateTimeFormat>();

/**
 * The calendar date at a site: a plain date is taken as already local; a UTC timestamp is turned
 * into the date on the wall calendar of the site's IANA time zone.
 */
export function localDate(asOf: string, timeZone: string): string {
  if (/^\d{4}-\d{2}-\d{2}$/.test(asOf)) return asOf;
  const instant = new Date(asOf);
  if (Number.isNaN(instant.getTime())) throw new RangeError(`asOf "${asOf}" is neither a date nor a timestamp`);
  let f = formatters.get(timeZone);
  if (!f) {
    f = new Intl.DateTimeFormat("en-CA", { timeZone, year: "numeric", month: "2-digit", day: "2-digit" });
    formatters.set(timeZone, f);
  }
  const parts = Object.fromEntries(f.formatToParts(instant).map((p) => [p.type, p.value]));
  return `${parts.year}-${parts.month}-${parts.day}`;
}

/** An ISO date as the integer yyyymmdd (ordered as the dates are), read from its characters. */
export function dateOrdinal(iso: string): number {
  return (
    (iso.charCodeAt(0) - 48) * 10_000_000 +
    (iso.charCodeAt(1) - 48) * 1_000_000 +
    (iso.charCodeAt(2) - 48) * 100_000 +
    (iso.charCodeAt(3) - 48) * 10_000 +
    (iso.charCodeAt(5) - 48) * 1000 +
    (iso.charCodeAt(6) - 48) * 100 +
    (iso.charCodeAt(8) - 48) * 10 +
    (iso.charCodeAt(9) - 48)
  );
}

/** The ISO date of a yyyymmdd integer. */
export function isoDateOfOrdinal(n: number): string {
  const s = String(n).padStart(8, "0");
  return `${s.slice(0, 4)}-${s.slice(4, 6)}-${s.slice(6, 8)}`;
}

/** Average Gregorian month in days, to express exposure and offsets in months. */
export const DAYS_PER_MONTH = 365.2425 / 12;
