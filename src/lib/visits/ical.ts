import ical, { ICalCalendarMethod } from "ical-generator";
import { addCalendarDays } from "./calendar-date";
import type { CalendarEntry, SubjectCalendar, VisitState } from "./subject-calendar";

// A site's due and upcoming visits as an RFC 5545 feed: one all-day event per visit on its target
// date (DTSTART;VALUE=DATE, RFC 5545 §3.6.1; clause numbers here from memory), the window in the
// description. Subject codes only:
// Cairn holds no patient identities.

export const protocolGovernsNotice =
  "The approved protocol in force at the site governs visit dates and windows; this calendar is an aid only.";

export interface SiteVisitFeedInput {
  siteCode: string;
  calendars: readonly SubjectCalendar[];
  /** Host part of every UID (RFC 5545 §3.8.4.7 recommends a domain to keep UIDs unique). */
  uidDomain: string;
  /** DTSTAMP of every event; passed in so the same inputs give the same feed. */
  generatedAt: Date;
  /** Visit states to include; due and upcoming by default. */
  states?: readonly VisitState[];
  calendarName?: string;
}

/** Stable across recomputation: the same visit of the same subject under the same version. */
export function visitEventUid(entry: Pick<CalendarEntry, "visitCode" | "subjectCode" | "versionId">, domain: string): string {
  return `${entry.visitCode}.${entry.subjectCode}.${encodeURIComponent(entry.versionId)}@${domain}`;
}

function describe(entry: CalendarEntry): string {
  const offset = entry.dayOffset >= 0 ? `day ${entry.dayOffset}` : `day −${-entry.dayOffset}`;
  return [
    `Subject ${entry.subjectCode}, visit ${entry.visitCode} (${entry.label}).`,
    `Target ${entry.targetDate}; window ${entry.windowStart} to ${entry.windowEnd} ` +
      `(${offset} from ${entry.anchor} on ${entry.anchorDate}, −${entry.windowBefore}/+${entry.windowAfter} days).`,
    `Protocol version ${entry.versionLabel}.`,
    protocolGovernsNotice,
  ].join("\n");
}

export function buildSiteVisitFeed(input: SiteVisitFeedInput): string {
  const states = new Set<VisitState>(input.states ?? ["due", "upcoming"]);
  const cal = ical({
    name: input.calendarName ?? `Cairn visits ${input.siteCode}`,
    description: `Due and upcoming visits at site ${input.siteCode}. ${protocolGovernsNotice}`,
    prodId: { company: "Cairn", product: "Visits", language: "EN" },
    method: ICalCalendarMethod.PUBLISH,
  });
  const entries = input.calendars
    .flatMap((c) => c.entries)
    .filter((e) => states.has(e.state) && e.targetDate !== null)
    .sort((a, b) => (a.targetDate! < b.targetDate! ? -1 : a.targetDate! > b.targetDate! ? 1 : a.subjectCode.localeCompare(b.subjectCode)));
  for (const e of entries) {
    const target = e.targetDate!;
    cal.createEvent({
      id: visitEventUid(e, input.uidDomain),
      allDay: true,
      start: target,
      end: addCalendarDays(target, 1), // DTEND is exclusive for all-day events (RFC 5545 §3.6.1)
      stamp: input.generatedAt,
      summary: `${e.subjectCode} ${e.visitCode} ${e.label}`,
      description: describe(e),
    });
  }
  return cal.toString();
}
