import type { IsoDate } from "@/lib/protocol/visit-schedule";
import type { CalendarEntry, SubjectCalendar } from "./subject-calendar";

// A visit done outside its window is recorded as a protocol deviation (DESIGN.md capability 4).
// Automatic deviations are keyed by subject + visit + protocol version, so one visit yields at most
// one open deviation however often it is recomputed, and editing the date back into the window
// resolves it.

export const visitOutOfWindowCategory = "visit out of window" as const;

export interface VisitDeviation {
  /** Stable identity of the automatic deviation: subject, visit and version. */
  key: string;
  category: typeof visitOutOfWindowCategory;
  subjectCode: string;
  visitCode: string;
  visitLabel: string;
  versionId: string;
  versionLabel: string;
  actualDate: IsoDate;
  windowStart: IsoDate;
  windowEnd: IsoDate;
  /** Negative: days early; positive: days late. */
  daysOutside: number;
  description: string;
}

export function deviationKey(subjectCode: string, visitCode: string, versionId: string): string {
  return `visit-window:${subjectCode}:${visitCode}:${versionId}`;
}

function plural(n: number, word: string): string {
  return `${n} ${word}${n === 1 ? "" : "s"}`;
}

/** The deviation a calendar entry represents, or null when the visit was not done out of window. */
export function detectDeviation(entry: CalendarEntry): VisitDeviation | null {
  if (entry.state !== "completed_out_of_window") return null;
  const { actualDate, windowStart, windowEnd, daysOutsideWindow: days } = entry;
  if (actualDate === null || windowStart === null || windowEnd === null || days === null || days === 0) return null;
  const how = days < 0 ? `${plural(-days, "day")} early` : `${plural(days, "day")} late`;
  return {
    key: deviationKey(entry.subjectCode, entry.visitCode, entry.versionId),
    category: visitOutOfWindowCategory,
    subjectCode: entry.subjectCode,
    visitCode: entry.visitCode,
    visitLabel: entry.label,
    versionId: entry.versionId,
    versionLabel: entry.versionLabel,
    actualDate,
    windowStart,
    windowEnd,
    daysOutside: days,
    description:
      `Subject ${entry.subjectCode}: visit ${entry.visitCode} (${entry.label}) done on ${actualDate}, ${how}; ` +
      `window ${windowStart} to ${windowEnd} under protocol ${entry.versionLabel}.`,
  };
}

export function detectDeviations(calendar: SubjectCalendar): VisitDeviation[] {
  const out: VisitDeviation[] = [];
  for (const e of calendar.entries) {
    const d = detectDeviation(e);
    if (d) out.push(d);
  }
  return out;
}

/** An automatic deviation already stored. */
export interface ExistingAutomaticDeviation {
  id: string;
  key: string;
  subjectCode: string;
  status: "open" | "resolved";
  daysOutside: number;
  actualDate: IsoDate;
}

export interface DeviationChanges {
  /** New deviations to open (none stored open under the same key). */
  toOpen: VisitDeviation[];
  /** Open deviations whose visit is now inside its window, or no longer done. */
  toResolve: { existing: ExistingAutomaticDeviation; reason: string }[];
  /** Open deviations still out of window but with another date or day count (an edit). */
  toUpdate: { existing: ExistingAutomaticDeviation; deviation: VisitDeviation }[];
}

/**
 * Compares stored automatic deviations with the deviations the new calendars show. Only subjects
 * present in `calendars` are considered, so a partial recomputation never resolves other subjects'
 * deviations.
 */
export function reconcileDeviations(
  existing: readonly ExistingAutomaticDeviation[],
  calendars: readonly SubjectCalendar[],
): DeviationChanges {
  const subjects = new Set(calendars.map((c) => c.subjectCode));
  const current = new Map<string, VisitDeviation>();
  for (const c of calendars) for (const d of detectDeviations(c)) current.set(d.key, d);

  const openByKey = new Map<string, ExistingAutomaticDeviation[]>();
  for (const e of existing) {
    if (e.status !== "open" || !subjects.has(e.subjectCode)) continue;
    const list = openByKey.get(e.key) ?? [];
    list.push(e);
    openByKey.set(e.key, list);
  }

  const changes: DeviationChanges = { toOpen: [], toResolve: [], toUpdate: [] };
  for (const [key, deviation] of current) {
    const open = openByKey.get(key);
    if (!open) {
      changes.toOpen.push(deviation);
      continue;
    }
    const [keep, ...extra] = open;
    if (keep && (keep.daysOutside !== deviation.daysOutside || keep.actualDate !== deviation.actualDate)) {
      changes.toUpdate.push({ existing: keep, deviation });
    }
    // Duplicates from an earlier fault: keep one open.
    for (const e of extra) changes.toResolve.push({ existing: e, reason: "Duplicate of another open deviation for the same visit." });
  }
  for (const [key, open] of openByKey) {
    if (current.has(key)) continue;
    for (const e of open) {
      changes.toResolve.push({ existing: e, reason: "The visit date is now inside its window (or the visit is no longer recorded as done)." });
    }
  }
  return changes;
}
