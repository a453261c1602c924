// Calendar arithmetic on ISO "YYYY-MM-DD" strings (site-local dates), in whole days.
// Integer day numbers (days since 1970-01-01, proleptic Gregorian) avoid Date and time zones.

export type PaymentCycle = "monthly" | "quarterly";

/** Days since 1970-01-01 of a civil date (H. Hinnant's days_from_civil). */
export function dayNumber(iso: string): number {
  let y = Number(iso.slice(0, 4));
  const m = Number(iso.slice(5, 7));
  const d = Number(iso.slice(8, 10));
  y -= m <= 2 ? 1 : 0;
  const era = Math.floor(y / 400);
  const yoe = y - era * 400;
  const doy = Math.floor((153 * (m + (m > 2 ? -3 : 9)) + 2) / 5) + d - 1;
  const doe = yoe * 365 + Math.floor(yoe / 4) - Math.floor(yoe / 100) + doy;
  return era * 146097 + doe - 719468;
}

function pad(n: number, width: number): string {
  return String(n).padStart(width, "0");
}

/** The ISO date of a day number (civil_from_days). */
export function fromDayNumber(z0: number): string {
  const z = z0 + 719468;
  const era = Math.floor(z / 146097);
  const doe = z - era * 146097;
  const yoe = Math.floor((doe - Math.floor(doe / 1460) + Math.floor(doe / 36524) - Math.floor(doe / 146096)) / 365);
  const doy = doe - (365 * yoe + Math.floor(yoe / 4) - Math.floor(yoe / 100));
  const mp = Math.floor((5 * doy + 2) / 153);
  const d = doy - Math.floor((153 * mp + 2) / 5) + 1;
  const m = mp + (mp < 10 ? 3 : -9);
  const y = yoe + era * 400 + (m <= 2 ? 1 : 0);
  return `${pad(y, 4)}-${pad(m, 2)}-${pad(d, 2)}`;
}

export function addDays(iso: string, days: number): string {
  return fromDayNumber(dayNumber(iso) + days);
}

export function daysInMonth(year: number, month: number): number {
  if (month === 2) return (year % 4 === 0 && year % 100 !== 0) || year % 400 === 0 ? 29 : 28;
  return month === 4 || month === 6 || month === 9 || month === 11 ? 30 : 31;
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

/** Average Gregorian month in days, to express exposure and offsets in months. */
export const DAYS_PER_MONTH = 365.2425 / 12;
