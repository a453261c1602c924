import type { IsoDate, ScheduledVisit } from "@/lib/protocol/visit-schedule";

// Calendar dates as integer day numbers (days since 1970-01-01, proleptic Gregorian).
// No Date objects and no time zones: a date string names a day at the site, nothing more.

export function isLeapYear(y: number): boolean {
  return (y % 4 === 0 && y % 100 !== 0) || y % 400 === 0;
}

export function daysInMonth(y: number, m: number): number {
  if (m === 2) return isLeapYear(y) ? 29 : 28;
  return m === 4 || m === 6 || m === 9 || m === 11 ? 30 : 31;
}

// Days from civil date (H. Hinnant's algorithm, exact for every Gregorian date).
function daysFromCivil(y: number, m: number, d: number): number {
  const yy = m <= 2 ? y - 1 : y;
  const era = Math.floor(yy / 400);
  const yoe = yy - era * 400;
  const doy = Math.floor((153 * (m + (m > 2 ? -3 : 9)) + 2) / 5) + d - 1;
  const doe = yoe * 365 + Math.floor(yoe / 4) - Math.floor(yoe / 100) + doy;
  return era * 146097 + doe - 719468;
}

function pad(n: number, width: number): string {
  return String(n).padStart(width, "0");
}

export class InvalidCalendarDateError extends Error {
  constructor(readonly value: unknown) {
    super(`Not a calendar date as YYYY-MM-DD: ${JSON.stringify(value)}`);
    this.name = "InvalidCalendarDateError";
  }
}

// Parses YYYY-MM-DD with char codes (hot path: millions of calls per study); -1 when invalid.
function parseIso(s: string): number {
  if (s.length !== 10 || s.charCodeAt(4) !== 45 || s.charCodeAt(7) !== 45) return -1;
  let y = 0;
  for (let i = 0; i < 4; i++) {
    const c = s.charCodeAt(i) - 48;
    if (c < 0 || c > 9) return -1;
    y = y * 10 + c;
  }
  const m1 = s.charCodeAt(5) - 48;
  const m2 = s.charCodeAt(6) - 48;
  const d1 = s.charCodeAt(8) - 48;
  const d2 = s.charCodeAt(9) - 48;
  if (m1 < 0 || m1 > 9 || m2 < 0 || m2 > 9 || d1 < 0 || d1 > 9 || d2 < 0 || d2 > 9) return -1;
  const m = m1 * 10 + m2;
  const d = d1 * 10 + d2;
  if (m < 1 || m > 12 || d < 1 || d > daysInMonth(y, m)) return -1;
  return y * 10000 + m * 100 + d;
}

/** True when `s` is a real calendar date written YYYY-MM-DD (2023-02-29 is not). */
export function isCalendarDate(s: unknown): s is IsoDate {
  return typeof s === "string" && parseIso(s) >= 0;
}

/** Day number of an ISO date; throws on anything that is not a real date. */
export function toDayNumber(date: IsoDate): number {
  const ymd = typeof date === "string" ? parseIso(date) : -1;
  if (ymd < 0) throw new InvalidCalendarDateError(date);
  return daysFromCivil(Math.floor(ymd / 10000), Math.floor(ymd / 100) % 100, ymd % 100);
}

// Calendars reuse a few thousand distinct dates: share one string per day instead of building
// millions (measured by scripts/bench/visit-calendar.ts). Bounded to 1900–2199.
const CACHE_FIRST = -25567; // 1900-01-01
const CACHE_LAST = 84005; // 2199-12-31
const dateStringCache = new Map<number, IsoDate>();

/** ISO date of a day number (inverse of toDayNumber). */
export function fromDayNumber(day: number): IsoDate {
  const cached = dateStringCache.get(day);
  if (cached !== undefined) return cached;
  const s = formatDayNumber(day);
  if (day >= CACHE_FIRST && day <= CACHE_LAST) dateStringCache.set(day, s);
  return s;
}

function formatDayNumber(day: number): IsoDate {
  if (!Number.isSafeInteger(day)) throw new RangeError(`Day number must be an integer, got ${day}`);
  const z = day + 719468;
  const era = Math.floor(z / 146097);
  const doe = z - era * 146097;
  const yoe = Math.floor((doe - Math.floor(doe / 1460) + Math.floor(doe / 36524) - Math.floor(doe / 146096)) / 365);
  const doy = doe - (365 * yoe + Math.floor(yoe / 4) - Math.floor(yoe / 100));
  const mp = Math.floor((5 * doy + 2) / 153);
  const d = doy - Math.floor((153 * mp + 2) / 5) + 1;
  const m = mp < 10 ? mp + 3 : mp - 9;
  const y = yoe + era * 400 + (m <= 2 ? 1 : 0);
  if (y < 0 || y > 9999) throw new RangeError(`Date out of range for YYYY-MM-DD: year ${y}`);
  return `${pad(y, 4)}-${pad(m, 2)}-${pad(d, 2)}`;
}

export function addCalendarDays(date: IsoDate, days: number): IsoDate {
  return fromDayNumber(toDayNumber(date) + days);
}

/** later − earlier in calendar days (negative when `later` is before `earlier`). */
export function calendarDaysBetween(earlier: IsoDate, later: IsoDate): number {
  return toDayNumber(later) - toDayNumber(earlier);
}

export interface VisitWindow {
  targetDate: IsoDate;
  windowStart: IsoDate;
  windowEnd: IsoDate;
}

type WindowRule = Pick<ScheduledVisit, "dayOffset" | "windowBefore" | "windowAfter">;

/** Target = anchor + day offset; the window runs from target − before to target + after, both inclusive. */
export function visitWindow(anchorDate: IsoDate, visit: WindowRule): VisitWindow {
  const target = toDayNumber(anchorDate) + visit.dayOffset;
  return {
    targetDate: fromDayNumber(target),
    windowStart: fromDayNumber(target - visit.windowBefore),
    windowEnd: fromDayNumber(target + visit.windowAfter),
  };
}

/**
 * Days a date lies outside [start, end]: 0 inside, negative when early (days before the start),
 * positive when late (days after the end).
 */
export function daysOutsideWindow(actualDay: number, startDay: number, endDay: number): number {
  if (actualDay < startDay) return actualDay - startDay;
  if (actualDay > endDay) return actualDay - endDay;
  return 0;
}
