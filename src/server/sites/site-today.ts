import "server-only";
import type { IsoDate } from "@/lib/protocol/visit-schedule";

// Calendar dates are days at the site: "today" depends on the site's time zone.
const formatters = new Map<string, Intl.DateTimeFormat>();

export function todayAtSite(timeZone: string, now: Date = new Date()): IsoDate {
  let f = formatters.get(timeZone);
  if (!f) {
    f = new Intl.DateTimeFormat("en-CA", { timeZone, year: "numeric", month: "2-digit", day: "2-digit" });
    formatters.set(timeZone, f);
  }
  return f.format(now);
}

export function isValidTimeZone(timeZone: string): boolean {
  try {
    new Intl.DateTimeFormat("en-CA", { timeZone });
    return true;
  } catch {
    return false;
  }
}
