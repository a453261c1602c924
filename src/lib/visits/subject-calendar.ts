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

// Schedules are shared by thousands of subjects: index each one once.
const scheduleIndex = new WeakMap<VisitSchedule, IndexedSchedule>();
function indexSchedule(schedule: VisitSchedule): IndexedSchedule {
  let idx = scheduleIndex.get(schedule);
  if (!idx) {
    idx = { byCode: new Map(schedule.map((visit, order) => [visit.code, { visit, order }])) };
    scheduleIndex.set(schedule, idx);
  }
  return idx;
}

/** The version in force on `date`: the latest `inForceFrom` on or before it (null if none yet). */
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

export function computeSubjectCalendar(input: SubjectCalendarInput): SubjectCalendar {
  const { subjectCode, asOf } = input;
  if (!Number.isInteger(input.dueSoonDays) || input.dueSoonDays < 0) {
    throw new CalendarInputError(`The due-soon horizon must be a whole number of days ≥ 0, got ${input.dueSoonDays}`);
  }
  const asOfDay = toDayNumber(asOf);
  const current = versionInForceOn(input.versions, asOf);
  const versionInForce = current ? { versionId: current.versionId, versionLabel: current.versionLabel } : null;
  if (input.status === "screen_failed") return { subjectCode, asOf, versionInForce, entries: [] };

  const versionsById = new Map<string, ProtocolVersionAtSite>();
  for (const v of input.versions) versionsById.set(v.versionId, v);

  // Anchor dates in the future (e.g. a planned implant) have not happened yet.
  const anchorDayCache = new Map<AnchorEvent, number | null>();
  const anchorDay = (anchor: AnchorEvent): number | null => {
    let d = anchorDayCache.get(anchor);
    if (d === undefined) {
      const date = anchorDateOf(input.anchors, anchor);
      d = date == null ? null : toDayNumber(date);
      if (d !== null && d > asOfDay) d = null;
      anchorDayCache.set(anchor, d);
    }
    return d;
  };

  const records = new Map<string, RecordedVisit>();
  for (const r of input.recordedVisits) {
    const prev = records.get(r.visitCode);
    records.set(r.visitCode, prev ? preferRecord(prev, r) : r);
  }

  const rows: { entry: CalendarEntry; order: number; targetDay: number }[] = [];

  const base = (visit: ScheduledVisit, version: ProtocolVersionAtSite, aDay: number | null) => {
    const target = aDay === null ? null : aDay + visit.dayOffset;
    return {
      target,
      entry: {
        subjectCode,
        visitCode: visit.code,
        label: visit.label,
        versionId: version.versionId,
        versionLabel: version.versionLabel,
        anchor: visit.anchor,
        anchorDate: aDay === null ? null : fromDayNumber(aDay),
        dayOffset: visit.dayOffset,
        windowBefore: visit.windowBefore,
        windowAfter: visit.windowAfter,
        targetDate: target === null ? null : fromDayNumber(target),
        windowStart: target === null ? null : fromDayNumber(target - visit.windowBefore),
        windowEnd: target === null ? null : fromDayNumber(target + visit.windowAfter),
      },
    };
  };

  // Recorded visits, each under its own version.
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
    // A recorded visit is judged against its anchor even if the anchor is dated after asOf (a correction).
    const rawAnchor = anchorDateOf(input.anchors, visit.anchor);
    const aDay = rawAnchor == null ? null : toDayNumber(rawAnchor);
    const { target, entry } = base(visit, version, aDay);
    let state: VisitState;
    let outside: number | null = null;
    let actualDate: IsoDate | null = r.actualDate ?? null;
    if (r.status === "missed") {
      state = "missed";
    } else {
      if (actualDate == null) {
        throw new CalendarInputError(`Subject ${subjectCode}: visit ${r.visitCode} is recorded as done without a date`);
      }
      actualDate = fromDayNumber(toDayNumber(actualDate)); // validates the date
      if (target === null) {
        state = "completed_unanchored";
      } else {
        outside = daysOutsideWindow(toDayNumber(actualDate), target - visit.windowBefore, target + visit.windowAfter);
        state = outside === 0 ? "completed_in_window" : "completed_out_of_window";
      }
    }
    rows.push({
      order,
      targetDay: target ?? Number.POSITIVE_INFINITY,
      entry: {
        ...entry,
        state,
        dueSoon: false,
        recorded: true,
        actualDate,
        daysOutsideWindow: outside,
        dataEnteredOn: r.dataEnteredOn ?? null,
        verifiedOn: r.verifiedOn ?? null,
      },
    });
  }

  // Pending visits from the version in force today.
  const ended = input.status === "withdrawn" || input.status === "completed";
  const endDay = ended && input.endedOn ? toDayNumber(input.endedOn) : null;
  if (current && !(ended && endDay === null)) {
    current.schedule.forEach((visit, order) => {
      if (records.has(visit.code)) return;
      const aDay = anchorDay(visit.anchor);
      if (ended && (aDay === null || endDay === null || aDay + visit.dayOffset >= endDay)) return;
      const { target, entry } = base(visit, current, aDay);
      let state: VisitState = "not_scheduled";
      let dueSoon = false;
      if (target !== null) {
        const start = target - visit.windowBefore;
        const end = target + visit.windowAfter;
        if (asOfDay < start) {
          state = "upcoming";
          dueSoon = start - asOfDay <= input.dueSoonDays;
        } else if (asOfDay <= end) state = "due";
        else state = "overdue";
      }
      rows.push({
        order,
        targetDay: target ?? Number.POSITIVE_INFINITY,
        entry: {
          ...entry,
          state,
          dueSoon,
          recorded: false,
          actualDate: null,
          daysOutsideWindow: null,
          dataEnteredOn: null,
          verifiedOn: null,
        },
      });
    });
  }

  rows.sort((a, b) => a.targetDay - b.targetDay || a.order - b.order || (a.entry.visitCode < b.entry.visitCode ? -1 : 1));
  return { subjectCode, asOf, versionInForce, entries: rows.map((r) => r.entry) };
}
