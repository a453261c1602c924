import type { AnchorEvent, IsoDate, ScheduledVisit, VisitSchedule } from "@/lib/protocol/visit-schedule";
import type { SubjectStatus } from "@/lib/subjects/subject-states";
import { daysOutsideWindow, fromDayNumber, toDayNumber } from "./calendar-date";

// A subject's visit calendar: a pure function of the subject's anchor dates, the protocol versions
// in force at the site over time, the visits recorded and the day it is computed for (`asOf`).
//
// Rules (DESIGN.md capability 4 and "Computation rules"):
// - A recorded visit (done or missed) keeps the schedule of the version it was recorded under.
// - A visit not yet recorded follows the version in force at the site on `asOf` (latest
//   `inForceFrom` ≤ asOf). Visits that version drops disappear unless recorded; new ones appear.
// - A visit whose anchor event has not happened by `asOf` is listed as not yet scheduled.
// - Screen-failed subjects have no visits. Withdrawn and completed subjects keep their recorded
//   visits; pending visits are kept only when their target date falls before `endedOn` (the date
//   of withdrawal or completion), so a visit that was owed before the end stays visible.

export interface ProtocolVersionAtSite {
  versionId: string;
  versionLabel: string;
  /** The site's ethics-committee approval date of this version. */
  inForceFrom: IsoDate;
  schedule: VisitSchedule;
}

export interface RecordedVisit {
  visitCode: string;
  versionId: string;
  actualDate?: IsoDate | null;
  status: "done" | "missed";
  dataEnteredOn?: IsoDate | null;
  verifiedOn?: IsoDate | null;
}

export interface SubjectAnchorDates {
  consentDate?: IsoDate | null;
  enrolmentDate?: IsoDate | null;
  implantDate?: IsoDate | null;
}

export interface SubjectCalendarInput {
  subjectCode: string;
  status: SubjectStatus;
  /** Date of withdrawal or completion; without it nothing is projected for such subjects. */
  endedOn?: IsoDate | null;
  anchors: SubjectAnchorDates;
  versions: readonly ProtocolVersionAtSite[];
  recordedVisits: readonly RecordedVisit[];
  asOf: IsoDate;
  /** An upcoming visit whose window opens within this many days is flagged due soon. */
  dueSoonDays: number;
}

export const visitStates = [
  "not_scheduled",
  "upcoming",
  "due",
  "overdue",
  "completed_in_window",
  "completed_out_of_window",
  // Done, but the anchor date is not recorded, so the window cannot be judged (a data gap to fix).
  "completed_unanchored",
  "missed",
] as const;
export type VisitState = (typeof visitStates)[number];

export interface CalendarEntry {
  subjectCode: string;
  visitCode: string;
  label: string;
  versionId: string;
  versionLabel: string;
  anchor: AnchorEvent;
  anchorDate: IsoDate | null;
  dayOffset: number;
  windowBefore: number;
  windowAfter: number;
  targetDate: IsoDate | null;
  windowStart: IsoDate | null;
  windowEnd: IsoDate | null;
  state: VisitState;
  /** Upcoming and its window opens within the due-soon horizon. */
  dueSoon: boolean;
  recorded: boolean;
  actualDate: IsoDate | null;
  /** For completed visits: 0 inside the window, negative days early, positive days late. */
  daysOutsideWindow: number | null;
  dataEnteredOn: IsoDate | null;
  verifiedOn: IsoDate | null;
}

export interface SubjectCalendar {
  subjectCode: string;
  asOf: IsoDate;
  /** The version pending visits follow; null when no version is in force at the site yet. */
  versionInForce: { versionId: string; versionLabel: string } | null;
  entries: CalendarEntry[];
}

export class CalendarInputError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "CalendarInputError";
  }
}

interface IndexedSchedule {
  byCode: Map<string, { visit: ScheduledVisit; order: number }>;
}

// Schedules are shared by thousands of subjects: index each one once. Inputs are treated as
// immutable (a schedule or versions array changed after use would keep its old index).
const scheduleIndex = new WeakMap<VisitSchedule, IndexedSchedule>();
function indexSchedule(schedule: VisitSchedule): IndexedSchedule {
  let idx = scheduleIndex.get(schedule);
  if (!idx) {
    idx = { byCode: new Map(schedule.map((visit, order) => [visit.code, { visit, order }])) };
    scheduleIndex.set(schedule, idx);
  }
  return idx;
}

/**
 * The version in force on `date`: the latest `inForceFrom` on or before it (null if none yet);
 * of two approved on the same day, the later in the list.
 */
export function versionInForceOn<V extends { inForceFrom: IsoDate }>(versions: readonly V[], date: IsoDate): V | null {
  const day = toDayNumber(date);
  let best: V | null = null;
  let bestDay = -Infinity;
  for (const v of versions) {
    const from = toDayNumber(v.inForceFrom);
    if (from <= day && from >= bestDay) {
      best = v;
      bestDay = from;
    }
  }
  return best;
}

function anchorDateOf(anchors: SubjectAnchorDates, anchor: AnchorEvent): IsoDate | null {
  switch (anchor) {
    case "consent":
      return anchors.consentDate ?? null;
    case "enrolment":
      return anchors.enrolmentDate ?? null;
    case "implant":
      return anchors.implantDate ?? null;
  }
}

// A done record beats a missed one; among equals the later date wins (a repeat of the visit).
function preferRecord(a: RecordedVisit, b: RecordedVisit): RecordedVisit {
  if (a.status !== b.status) return a.status === "done" ? a : b;
  return (b.actualDate ?? "") > (a.actualDate ?? "") ? b : a;
}

// One object shape for every entry (keeps property access fast over hundreds of thousands).
function makeEntry(
  subjectCode: string,
  visit: ScheduledVisit,
  version: ProtocolVersionAtSite,
  anchorDay: number | null,
  state: VisitState,
  dueSoon: boolean,
  record: RecordedVisit | null,
  actualDate: IsoDate | null,
  outside: number | null,
): CalendarEntry {
  const target = anchorDay === null ? null : anchorDay + visit.dayOffset;
  return {
    subjectCode,
    visitCode: visit.code,
    label: visit.label,
    versionId: version.versionId,
    versionLabel: version.versionLabel,
    anchor: visit.anchor,
    anchorDate: anchorDay === null ? null : fromDayNumber(anchorDay),
    dayOffset: visit.dayOffset,
    windowBefore: visit.windowBefore,
    windowAfter: visit.windowAfter,
    targetDate: target === null ? null : fromDayNumber(target),
    windowStart: target === null ? null : fromDayNumber(target - visit.windowBefore),
    windowEnd: target === null ? null : fromDayNumber(target + visit.windowAfter),
    state,
    dueSoon,
    recorded: record !== null,
    actualDate,
    daysOutsideWindow: outside,
    dataEnteredOn: record?.dataEnteredOn ?? null,
    verifiedOn: record?.verifiedOn ?? null,
  };
}

const versionIndex = new WeakMap<readonly ProtocolVersionAtSite[], Map<string, ProtocolVersionAtSite>>();
function indexVersions(versions: readonly ProtocolVersionAtSite[]): Map<string, ProtocolVersionAtSite> {
  let idx = versionIndex.get(versions);
  if (!idx) {
    idx = new Map(versions.map((v) => [v.versionId, v]));
    versionIndex.set(versions, idx);
  }
  return idx;
}

export function computeSubjectCalendar(input: SubjectCalendarInput): SubjectCalendar {
  const { subjectCode, asOf } = input;
  if (!Number.isInteger(input.dueSoonDays) || input.dueSoonDays < 0) {
    throw new CalendarInputError(`The due-soon horizon must be a whole number of days ≥ 0, got ${input.dueSoonDays}`);
  }
  const asOfDay = toDayNumber(asOf);
  const current = versionInForceOn(input.versions, asOf);
  const versionInForce = current ? { versionId: current.versionId, versionLabel: current.versionLabel } : null;
  if (input.status === "screen_failed") return { subjectCode, asOf, versionInForce, entries: [] };

  const versionsById = indexVersions(input.versions);
  const rawAnchorDay = (anchor: AnchorEvent): number | null => {
    const date = anchorDateOf(input.anchors, anchor);
    return date == null ? null : toDayNumber(date);
  };
  const consentDay = rawAnchorDay("consent");
  const enrolmentDay = rawAnchorDay("enrolment");
  const implantDay = rawAnchorDay("implant");
  const anchorDayOf = (anchor: AnchorEvent) => (anchor === "consent" ? consentDay : anchor === "enrolment" ? enrolmentDay : implantDay);

  const records = new Map<string, RecordedVisit>();
  for (const r of input.recordedVisits) {
    const prev = records.get(r.visitCode);
    records.set(r.visitCode, prev ? preferRecord(prev, r) : r);
  }

  const entries: CalendarEntry[] = [];
  const sortKeys: number[] = [];
  const orders: number[] = [];
  const push = (entry: CalendarEntry, targetDay: number | null, order: number) => {
    entries.push(entry);
    sortKeys.push(targetDay ?? Number.MAX_SAFE_INTEGER);
    orders.push(order);
  };

  // Recorded visits, each under its own version. A recorded visit is judged against its anchor
  // even when the anchor is dated after asOf (a late correction).
  for (const r of records.values()) {
    const version = versionsById.get(r.versionId);
    if (!version) {
      throw new CalendarInputError(`Subject ${subjectCode}: visit ${r.visitCode} was recorded under unknown protocol version ${r.versionId}`);
    }
    const found = indexSchedule(version.schedule).byCode.get(r.visitCode);
    if (!found) {
      throw new CalendarInputError(
        `Subject ${subjectCode}: visit ${r.visitCode} is not in the schedule of protocol version ${version.versionLabel}`,
      );
    }
    const { visit, order } = found;
    const aDay = anchorDayOf(visit.anchor);
    const target = aDay === null ? null : aDay + visit.dayOffset;
    if (r.status === "missed") {
      push(makeEntry(subjectCode, visit, version, aDay, "missed", false, r, r.actualDate ?? null, null), target, order);
      continue;
    }
    if (r.actualDate == null) {
      throw new CalendarInputError(`Subject ${subjectCode}: visit ${r.visitCode} is recorded as done without a date`);
    }
    const actualDay = toDayNumber(r.actualDate);
    if (target === null) {
      push(makeEntry(subjectCode, visit, version, null, "completed_unanchored", false, r, r.actualDate, null), null, order);
      continue;
    }
    const outside = daysOutsideWindow(actualDay, target - visit.windowBefore, target + visit.windowAfter);
    const state: VisitState = outside === 0 ? "completed_in_window" : "completed_out_of_window";
    push(makeEntry(subjectCode, visit, version, aDay, state, false, r, r.actualDate, outside), target, order);
  }

  // Pending visits from the version in force on asOf. Anchors dated after asOf have not happened.
  const ended = input.status === "withdrawn" || input.status === "completed";
  const endDay = ended && input.endedOn ? toDayNumber(input.endedOn) : null;
  if (current && !(ended && endDay === null)) {
    const schedule = current.schedule;
    for (let order = 0; order < schedule.length; order++) {
      const visit = schedule[order]!;
      if (records.has(visit.code)) continue;
      let aDay = anchorDayOf(visit.anchor);
      if (aDay !== null && aDay > asOfDay) aDay = null;
      if (ended && (aDay === null || endDay === null || aDay + visit.dayOffset >= endDay)) continue;
      let state: VisitState = "not_scheduled";
      let dueSoon = false;
      let target: number | null = null;
      if (aDay !== null) {
        target = aDay + visit.dayOffset;
        const start = target - visit.windowBefore;
        if (asOfDay < start) {
          state = "upcoming";
          dueSoon = start - asOfDay <= input.dueSoonDays;
        } else if (asOfDay <= target + visit.windowAfter) state = "due";
        else state = "overdue";
      }
      push(makeEntry(subjectCode, visit, current, aDay, state, dueSoon, null, null, null), target, order);
    }
  }

  // Order by target date, then schedule order, then code (unscheduled last).
  const idx = entries.map((_, i) => i);
  idx.sort((a, b) => sortKeys[a]! - sortKeys[b]! || orders[a]! - orders[b]! || (entries[a]!.visitCode < entries[b]!.visitCode ? -1 : 1));
  return { subjectCode, asOf, versionInForce, entries: idx.map((i) => entries[i]!) };
}
