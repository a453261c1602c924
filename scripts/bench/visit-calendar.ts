// Benchmark: every subject's visit calendar for a 200-site study.
// Run: npx tsx scripts/bench/visit-calendar.ts [runs]
// Deterministic data: 200 sites, 10,000 subjects, 150,000 recorded visits, two protocol versions
// in force at each site from different (per-site ethics approval) dates. Target: under 0.3 s.
import { performance } from "node:perf_hooks";
import type { ScheduledVisit, VisitSchedule } from "../../src/lib/protocol/visit-schedule";
import { fromDayNumber, toDayNumber } from "../../src/lib/visits/calendar-date";
import { computeSubjectCalendar, type ProtocolVersionAtSite, type RecordedVisit, type SubjectCalendarInput } from "../../src/lib/visits/subject-calendar";
import { detectDeviations } from "../../src/lib/visits/deviations";
import { buildSiteVisitFeed } from "../../src/lib/visits/ical";
import type { SubjectStatus } from "../../src/lib/subjects/subject-states";
import { seededRandom } from "../lib/seeded-random";

const SITES = 200;
const SUBJECTS_PER_SITE = 50;
const TARGET_VISITS = 150_000;
const AS_OF = "2026-12-01";
const runs = Number(process.argv[2] ?? 7);

const rng = seededRandom;
const rand = rng(20261201);
const int = (lo: number, hi: number) => lo + Math.floor(rand() * (hi - lo + 1));

const sv = (code: string, anchor: ScheduledVisit["anchor"], dayOffset: number, w: number): ScheduledVisit => ({
  code,
  label: `Visit ${code}`,
  anchor,
  dayOffset,
  windowBefore: w,
  windowAfter: w,
  procedures: [],
});
const scheduleV1: VisitSchedule = [
  sv("SCR", "consent", 0, 0),
  sv("BASE", "enrolment", 0, 3),
  sv("D1", "implant", 1, 0),
  sv("W1", "implant", 7, 3),
  sv("W2", "implant", 14, 3),
  sv("M1", "implant", 30, 7),
  sv("M2", "implant", 60, 7),
  sv("M3", "implant", 90, 14),
  sv("M6", "implant", 180, 14),
  sv("M9", "implant", 270, 21),
  sv("M12", "implant", 365, 30),
  sv("M15", "implant", 456, 30),
  sv("M18", "implant", 548, 30),
  sv("M24", "implant", 730, 30),
  sv("M30", "implant", 913, 30),
  sv("M36", "implant", 1095, 30),
  sv("M48", "implant", 1461, 45),
  sv("M60", "implant", 1826, 45),
];
// Version 2 drops M15, adds M21 and M42, widens M6.
const scheduleV2: VisitSchedule = [
  ...scheduleV1.filter((v) => v.code !== "M15").map((v) => (v.code === "M6" ? { ...v, windowBefore: 21, windowAfter: 21 } : v)),
  sv("M21", "implant", 639, 30),
  sv("M42", "implant", 1278, 45),
].sort((a, b) => a.dayOffset - b.dayOffset);
const allCodes = [...new Map([...scheduleV1, ...scheduleV2].map((v) => [v.code, v])).values()].sort((a, b) => a.dayOffset - b.dayOffset);
const inV1 = new Set(scheduleV1.map((v) => v.code));
const inV2 = new Set(scheduleV2.map((v) => v.code));

// Build the study.
const inputs: SubjectCalendarInput[] = [];
const sites: { siteCode: string; first: number; count: number }[] = [];
const eligible: { recorded: RecordedVisit[]; v2From: number; anchorDays: Record<string, number> }[] = [];
for (let s = 0; s < SITES; s++) {
  const siteCode = `S${String.fromCharCode(65 + (s % 26))}${String(s).padStart(3, "0")}`;
  const v1From = toDayNumber("2022-03-01") + int(0, 120);
  const v2From = toDayNumber("2024-06-01") + int(0, 240);
  const versions: ProtocolVersionAtSite[] = [
    { versionId: "pv-1", versionLabel: "1.0", inForceFrom: fromDayNumber(v1From), schedule: scheduleV1 },
    { versionId: "pv-2", versionLabel: "2.0", inForceFrom: fromDayNumber(v2From), schedule: scheduleV2 },
  ];
  sites.push({ siteCode, first: inputs.length, count: SUBJECTS_PER_SITE });
  for (let n = 1; n <= SUBJECTS_PER_SITE; n++) {
    const consent = v1From + int(30, 600);
    const enrol = consent + int(7, 20);
    const implant = enrol + int(3, 14);
    const r = rand();
    const status: SubjectStatus = r < 0.05 ? "screen_failed" : r < 0.08 ? "screening" : r < 0.13 ? "withdrawn" : r < 0.2 ? "completed" : "follow_up";
    const recorded: RecordedVisit[] = [];
    const input: SubjectCalendarInput = {
      subjectCode: `${siteCode}-${String(n).padStart(3, "0")}`,
      status,
      endedOn: status === "withdrawn" ? fromDayNumber(implant + int(200, 900)) : status === "completed" ? fromDayNumber(implant + 1826 + 30) : null,
      anchors:
        status === "screen_failed" || status === "screening"
          ? { consentDate: fromDayNumber(consent) }
          : { consentDate: fromDayNumber(consent), enrolmentDate: fromDayNumber(enrol), implantDate: fromDayNumber(implant) },
      versions,
      recordedVisits: recorded,
      asOf: AS_OF,
      dueSoonDays: 14,
    };
    inputs.push(input);
    if (status !== "screen_failed" && status !== "screening") eligible.push({ recorded, v2From, anchorDays: { consent, enrolment: enrol, implant } });
  }
}
// Spread exactly TARGET_VISITS recorded visits over the enrolled subjects, in schedule order.
let remaining = TARGET_VISITS;
eligible.forEach((e, i) => {
  const quota = Math.round(remaining / (eligible.length - i));
  const recorded = e.recorded;
  for (const v of allCodes) {
    if (recorded.length >= quota) break;
    const target = e.anchorDays[v.anchor]! + v.dayOffset;
    const versionId = target >= e.v2From ? "pv-2" : "pv-1";
    if (!(versionId === "pv-2" ? inV2 : inV1).has(v.code)) continue;
    const roll = rand();
    if (roll < 0.03) recorded.push({ visitCode: v.code, versionId, status: "missed" });
    else {
      // About 1 in 10 outside the window, by 1–10 days either side.
      const actual =
        rand() < 0.9
          ? target + int(-v.windowBefore, v.windowAfter)
          : rand() < 0.5
            ? target - v.windowBefore - int(1, 10)
            : target + v.windowAfter + int(1, 10);
      recorded.push({ visitCode: v.code, versionId, status: "done", actualDate: fromDayNumber(actual), dataEnteredOn: fromDayNumber(actual + int(0, 10)) });
    }
  }
  remaining -= recorded.length;
});
const totalVisits = inputs.reduce((n, i) => n + i.recordedVisits.length, 0);

function computeAll() {
  let entries = 0;
  const calendars = new Array(inputs.length);
  for (let i = 0; i < inputs.length; i++) {
    const c = computeSubjectCalendar(inputs[i]!);
    calendars[i] = c;
    entries += c.entries.length;
  }
  return { calendars, entries };
}
const median = (xs: number[]) => {
  const s = [...xs].sort((a, b) => a - b);
  const m = Math.floor(s.length / 2);
  return s.length % 2 ? s[m]! : (s[m - 1]! + s[m]!) / 2;
};

computeAll(); // warm-up (JIT)
const times: number[] = [];
let last = computeAll();
for (let r = 0; r < runs; r++) {
  const t0 = performance.now();
  last = computeAll();
  times.push(performance.now() - t0);
}
const states = new Map<string, number>();
for (const c of last.calendars) for (const e of c.entries) states.set(e.state, (states.get(e.state) ?? 0) + 1);

const tDev = performance.now();
const deviations = last.calendars.reduce((n: number, c) => n + detectDeviations(c).length, 0);
const devMs = performance.now() - tDev;

const site = sites[0]!;
const tFeed = performance.now();
const feed = buildSiteVisitFeed({
  siteCode: site.siteCode,
  calendars: last.calendars.slice(site.first, site.first + site.count),
  uidDomain: "bench.cairn.invalid",
  generatedAt: new Date(`${AS_OF}T00:00:00Z`),
});
const feedMs = performance.now() - tFeed;

const med = median(times);
console.log(`visit-calendar bench (Node ${process.version}, as of ${AS_OF})`);
console.log(`  sites ${SITES}, subjects ${inputs.length}, recorded visits ${totalVisits}, calendar entries ${last.entries}`);
console.log(`  all calendars: median ${med.toFixed(1)} ms over ${runs} runs (min ${Math.min(...times).toFixed(1)}, max ${Math.max(...times).toFixed(1)}) — target < 300 ms: ${med < 300 ? "met" : "NOT met"}`);
console.log(`  per subject: ${((med * 1000) / inputs.length).toFixed(1)} µs`);
console.log(`  states: ${[...states].map(([k, v]) => `${k} ${v}`).join(", ")}`);
console.log(`  out-of-window deviations detected: ${deviations} in ${devMs.toFixed(1)} ms`);
console.log(`  one site's iCal feed (${site.siteCode}): ${(feed.match(/BEGIN:VEVENT/g) ?? []).length} events, ${feed.length} bytes, ${feedMs.toFixed(1)} ms`);
