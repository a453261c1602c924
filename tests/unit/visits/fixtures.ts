import type { ScheduledVisit, VisitSchedule } from "@/lib/protocol/visit-schedule";
import type { ProtocolVersionAtSite } from "@/lib/visits/subject-calendar";

// Test schedules. The implant-anchored windows of W1, M1, M3 and M12 are those of REFERENCES.md
// "Visit windows" (common practice); the rest exist to exercise the version rules.
const v = (code: string, label: string, anchor: ScheduledVisit["anchor"], dayOffset: number, before: number, after: number): ScheduledVisit => ({
  code,
  label,
  anchor,
  dayOffset,
  windowBefore: before,
  windowAfter: after,
  procedures: [],
});

export const scheduleV1: VisitSchedule = [
  v("SCR", "Screening", "consent", 0, 0, 14),
  v("BASE", "Baseline", "enrolment", 0, 0, 7),
  v("W1", "1 week", "implant", 7, 3, 3),
  v("M1", "1 month", "implant", 30, 7, 7),
  v("M3", "3 months", "implant", 90, 14, 14),
  v("M6", "6 months", "implant", 180, 14, 14),
  v("M12", "12 months", "implant", 365, 30, 30),
];

// Version 2: M3 window widened to ±21, M6 dropped, M9 added.
export const scheduleV2: VisitSchedule = [
  v("SCR", "Screening", "consent", 0, 0, 14),
  v("BASE", "Baseline", "enrolment", 0, 0, 7),
  v("W1", "1 week", "implant", 7, 3, 3),
  v("M1", "1 month", "implant", 30, 7, 7),
  v("M3", "3 months", "implant", 90, 21, 21),
  v("M9", "9 months", "implant", 270, 21, 21),
  v("M12", "12 months", "implant", 365, 30, 30),
];

export const versions: ProtocolVersionAtSite[] = [
  { versionId: "pv-1", versionLabel: "1.0", inForceFrom: "2024-06-01", schedule: scheduleV1 },
  { versionId: "pv-2", versionLabel: "2.0", inForceFrom: "2025-03-01", schedule: scheduleV2 },
];

export const anchors = { consentDate: "2025-01-02", enrolmentDate: "2025-01-08", implantDate: "2025-01-15" };
