import { addCalendarDays, calendarDaysBetween, isCalendarDate } from "@/lib/visits/calendar-date";
import type { IsoDate } from "@/lib/protocol/visit-schedule";

// Acknowledgement deadlines are calendar dates at the site: the day a request is made is read in
// the site's time zone, and the deadline is that day plus the study's number of days. The
// acknowledgement is on time through the whole of the due day, site time.

type Parts = { year: number; month: number; day: number; hour: number; minute: number; second: number };

const formatters = new Map<string, Intl.DateTimeFormat>();
function formatterFor(timeZone: string): Intl.DateTimeFormat {
  let f = formatters.get(timeZone);
  if (!f) {
    f = new Intl.DateTimeFormat("en-US", {
      timeZone,
      hourCycle: "h23",
      year: "numeric",
      month: "2-digit",
      day: "2-digit",
      hour: "2-digit",
      minute: "2-digit",
      second: "2-digit",
    });
    formatters.set(timeZone, f);
  }
  return f;
}

/** Wall-clock fields of an instant in an IANA time zone. */
export function wallClockAt(instant: Date, timeZone: string): Parts {
  const out: Record<string, number> = {};
  for (const p of formatterFor(timeZone).formatToParts(instant)) {
    if (p.type !== "literal") out[p.type] = Number(p.value);
  }
  return { year: out.year!, month: out.month!, day: out.day!, hour: out.hour! % 24, minute: out.minute!, second: out.second! };
}

const pad = (n: number, w = 2) => String(Math.abs(n)).padStart(w, "0");

/** The calendar date at the site at this instant. */
export function siteDateAt(instant: Date, timeZone: string): IsoDate {
  const p = wallClockAt(instant, timeZone);
  return `${pad(p.year, 4)}-${pad(p.month)}-${pad(p.day)}`;
}

/** Offset of the zone from UTC at this instant, in minutes (east positive). */
export function utcOffsetMinutes(instant: Date, timeZone: string): number {
  const p = wallClockAt(instant, timeZone);
  const asUtc = Date.UTC(p.year, p.month - 1, p.day, p.hour, p.minute, p.second);
  const whole = Math.floor(instant.getTime() / 1000) * 1000;
  return Math.round((asUtc - whole) / 60_000);
}

/**
 * The instant a calendar date begins at the site (local midnight). Where midnight does not exist
 * (a zone that springs forward at 00:00) it is the first instant of that day.
 */
export function startOfSiteDay(date: IsoDate, timeZone: string): Date {
  if (!isCalendarDate(date)) throw new Error(`Not a calendar date: ${date}`);
  const [y, m, d] = date.split("-").map(Number) as [number, number, number];
  const naive = Date.UTC(y, m - 1, d);
  // Two passes settle the offset on either side of a change.
  let guess = naive - utcOffsetMinutes(new Date(naive), timeZone) * 60_000;
  guess = naive - utcOffsetMinutes(new Date(guess), timeZone) * 60_000;
  if (siteDateAt(new Date(guess), timeZone) !== date) {
    // Midnight skipped: step forward to the first minute that is on the date.
    for (let t = guess; t < guess + 3 * 3_600_000; t += 60_000) {
      if (siteDateAt(new Date(t), timeZone) === date) return new Date(t);
    }
  }
  return new Date(guess);
}

/** Due date: the site's date at the request, plus the deadline in calendar days. */
export function acknowledgementDueOn(requestedAt: Date, timeZone: string, deadlineDays: number): IsoDate {
  if (!Number.isInteger(deadlineDays) || deadlineDays < 0) throw new Error(`Deadline days must be a whole number ≥ 0, got ${deadlineDays}`);
  return addCalendarDays(siteDateAt(requestedAt, timeZone), deadlineDays);
}

/** The first instant after the due day at the site: from then on the acknowledgement is late. */
export function lateFrom(dueOn: IsoDate, timeZone: string): Date {
  return startOfSiteDay(addCalendarDays(dueOn, 1), timeZone);
}

/** "2026-03-29 10:15:00 +02:00": wall time at the site with its offset from UTC. */
export function formatSiteLocalTime(instant: Date, timeZone: string): string {
  const p = wallClockAt(instant, timeZone);
  const off = utcOffsetMinutes(instant, timeZone);
  const sign = off < 0 ? "-" : "+";
  return `${pad(p.year, 4)}-${pad(p.month)}-${pad(p.day)} ${pad(p.hour)}:${pad(p.minute)}:${pad(p.second)} ${sign}${pad(Math.trunc(Math.abs(off) / 60))}:${pad(Math.abs(off) % 60)}`;
}

/** Whole calendar days from `from` to `to` (negative when `to` is earlier). */
export const daysFromTo = (from: IsoDate, to: IsoDate) => calendarDaysBetween(from, to);
