import "server-only";
import type { Tx } from "@/server/db/client";
import { getSiteById } from "@/server/studies/queries";
import { todayAtSite } from "@/server/sites/site-today";
import { addCalendarDays } from "@/lib/visits/calendar-date";
import type { CalendarEntry } from "@/lib/visits/subject-calendar";
import { loadCalendars } from "./load-calendars";

export type SiteVisitRow = Pick<CalendarEntry, "subjectCode" | "visitCode" | "label" | "versionLabel" | "targetDate" | "windowStart" | "windowEnd" | "state"> & { subjectId: string };

/**
 * A site's visits to plan: overdue ones, those due now, and upcoming ones whose window opens
 * within the coming `weeks`, ordered by window end (the most urgent first).
 */
export async function listSiteVisits(tx: Tx, { siteId, weeks, now = new Date() }: { siteId: string; weeks: number; now?: Date }) {
  const site = await getSiteById(tx, { siteId });
  const asOf = todayAtSite(site.timeZone, now);
  const horizon = addCalendarDays(asOf, weeks * 7);
  const loaded = await loadCalendars(tx, { siteIds: [siteId], asOf });
  const rows: SiteVisitRow[] = [];
  for (const { subject, calendar } of loaded) {
    for (const e of calendar.entries) {
      if (e.state === "overdue" || e.state === "due" || (e.state === "upcoming" && e.windowStart !== null && e.windowStart <= horizon)) {
        rows.push({
          subjectId: subject.id,
          subjectCode: e.subjectCode,
          visitCode: e.visitCode,
          label: e.label,
          versionLabel: e.versionLabel,
          targetDate: e.targetDate,
          windowStart: e.windowStart,
          windowEnd: e.windowEnd,
          state: e.state,
        });
      }
    }
  }
  rows.sort((a, b) => (a.windowEnd! < b.windowEnd! ? -1 : a.windowEnd! > b.windowEnd! ? 1 : a.subjectCode < b.subjectCode ? -1 : 1));
  return { site: { id: site.id, code: site.code, name: site.name, timeZone: site.timeZone }, asOf, horizon, weeks, visits: rows };
}
