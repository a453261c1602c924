// Demo subjects of KESTREL-VP: site approvals of the released protocol versions, about 60 invented
// subjects (pseudonymous codes only) at every stage, their recorded visits (some out of window,
// some missed, some overdue) and the resulting deviations. Deterministic: a seeded generator.
import { and, eq, inArray } from "drizzle-orm";
import { deviations, memberships, protocolVersions, sites, siteVersionApprovals, studies, subjects, subjectStatusEvents, users, visitRecords } from "../../src/server/db/schema";
import { addCalendarDays, toDayNumber } from "../../src/lib/visits/calendar-date";
import { computeSubjectCalendar, versionInForceOn, type ProtocolVersionAtSite, type RecordedVisit } from "../../src/lib/visits/subject-calendar";
import { detectDeviations, visitOutOfWindowCategory } from "../../src/lib/visits/deviations";
import type { SubjectStatus } from "../../src/lib/subjects/subject-states";
import { demoStudy } from "./demo-data";
import type { SeedContext } from "./context";
import { seededRandom } from "../lib/seeded-random";

/** The demo's "today": data are laid out as of this date. */
const DEMO_TODAY = "2026-12-01";

// Ethics-committee approval dates of 1.0 and 2.0 per site (JP01 has not approved 2.0 yet).
const approvals: Record<string, { v1: string; v2?: string }> = {
  DE01: { v1: "2025-02-24", v2: "2026-03-30" },
  NL01: { v1: "2025-03-10", v2: "2026-04-14" },
  GB01: { v1: "2025-03-31", v2: "2026-04-02" },
  JP01: { v1: "2025-05-01" },
  US01: { v1: "2025-02-17", v2: "2026-05-06" },
  CH01: { v1: "2025-03-03", v2: "2026-04-20" },
  ES01: { v1: "2026-07-15", v2: "2026-07-15" },
};
// Subjects per site and the last day the site screened anyone.
const plan: Record<string, { n: number; screenUntil: string }> = {
  DE01: { n: 14, screenUntil: "2026-11-26" },
  NL01: { n: 11, screenUntil: "2026-11-20" },
  GB01: { n: 11, screenUntil: "2026-11-24" },
  JP01: { n: 8, screenUntil: "2026-11-16" },
  US01: { n: 12, screenUntil: "2026-09-15" },
  CH01: { n: 4, screenUntil: "2026-01-15" },
};

const rng = seededRandom;

export async function seedSubjects({ db, log }: SeedContext) {
  const [study] = await db.select().from(studies).where(eq(studies.code, demoStudy.code));
  if (!study) return log("subjects: no demo study, skipped");
  const existing = await db.select({ id: subjects.id }).from(subjects).where(eq(subjects.studyId, study.id)).limit(1);
  if (existing.length) return log("subjects: already seeded");
  const versionRows = await db
    .select()
    .from(protocolVersions)
    .where(and(eq(protocolVersions.studyId, study.id), inArray(protocolVersions.versionLabel, ["1.0", "2.0"])));
  const v1 = versionRows.find((v) => v.versionLabel === "1.0");
  const v2 = versionRows.find((v) => v.versionLabel === "2.0");
  if (!v1 || !v2) return log("subjects: protocol versions 1.0 and 2.0 not found, skipped");
  const siteRows = await db.select().from(sites).where(eq(sites.studyId, study.id));
  const siteByCode = new Map(siteRows.map((s) => [s.code, s]));
  const people = await db.select({ id: users.id, role: memberships.role, siteId: memberships.siteId }).from(memberships).innerJoin(users, eq(users.id, memberships.userId)).where(eq(memberships.studyId, study.id));
  const monitor = people.find((p) => p.role === "monitor")?.id ?? null;
  const coordinatorAt = (siteId: string) => people.find((p) => p.role === "coordinator" && p.siteId === siteId)?.id ?? people.find((p) => p.role === "sponsor_admin")?.id ?? null;

  for (const [code, a] of Object.entries(approvals)) {
    const site = siteByCode.get(code);
    if (!site) continue;
    const rows = [{ siteId: site.id, versionId: v1.id, approvedOn: a.v1, recordedBy: coordinatorAt(site.id) }];
    if (a.v2) rows.push({ siteId: site.id, versionId: v2.id, approvedOn: a.v2, recordedBy: coordinatorAt(site.id) });
    await db.insert(siteVersionApprovals).values(rows).onConflictDoNothing();
  }

  const rand = rng(20261201);
  const int = (lo: number, hi: number) => lo + Math.floor(rand() * (hi - lo + 1));
  const pick = <T,>(xs: readonly T[]) => xs[Math.floor(rand() * xs.length)]!;
  const today = toDayNumber(DEMO_TODAY);
  let subjectCount = 0;
  let visitCount = 0;
  let deviationCount = 0;

  for (const [code, p] of Object.entries(plan)) {
    const site = siteByCode.get(code);
    if (!site) continue;
    const a = approvals[code]!;
    const versions: ProtocolVersionAtSite[] = [{ versionId: v1.id, versionLabel: "1.0", inForceFrom: a.v1, schedule: v1.visitSchedule }];
    if (a.v2) versions.push({ versionId: v2.id, versionLabel: "2.0", inForceFrom: a.v2, schedule: v2.visitSchedule });
    const actor = coordinatorAt(site.id);
    const first = toDayNumber(a.v1) + 10;
    const last = toDayNumber(p.screenUntil);
    for (let i = 1; i <= p.n; i++) {
      // Consent dates spread over the site's screening period, oldest first.
      const consentDay = Math.round(first + ((last - first) * (i - 1)) / Math.max(1, p.n - 1)) - int(0, 3);
      const consentDate = addCalendarDays("1970-01-01", consentDay);
      const screeningDate = addCalendarDays(consentDate, int(0, 3));
      const consentVersion = versionInForceOn(versions, consentDate)!;
      const ageDays = today - consentDay;
      const roll = rand();
      let status: SubjectStatus;
      if (ageDays < 12) status = "screening";
      else if (roll < 0.14) status = "screen_failed";
      else if (ageDays < 30) status = "enrolled";
      else status = "follow_up";
      if (code === "CH01" && status === "follow_up") status = "withdrawn";
      let enrolmentDate: string | null = null;
      let implantDate: string | null = null;
      let endedOn: string | null = null;
      let screenFailReason: string | null = null;
      let withdrawnReason: string | null = null;
      if (status === "screen_failed") {
        endedOn = addCalendarDays(screeningDate, int(5, 20));
        screenFailReason = pick(["Residual light perception above the inclusion limit", "MRI exclusion: prior cranial surgery", "Did not meet the cognitive screening criterion"]);
      } else if (status !== "screening") {
        enrolmentDate = addCalendarDays(screeningDate, int(8, 18));
        if (status !== "enrolled") implantDate = addCalendarDays(enrolmentDate, 14 + int(-3, 6));
      }
      if (implantDate && toDayNumber(implantDate) >= today) {
        implantDate = null;
        status = "enrolled";
      }
      if (status === "follow_up" && rand() < 0.07) {
        status = "withdrawn";
      }
      if (status === "withdrawn") {
        endedOn = code === "CH01" ? "2026-09-30" : addCalendarDays(implantDate ?? enrolmentDate!, int(60, 200));
        if (toDayNumber(endedOn) >= today) endedOn = addCalendarDays(DEMO_TODAY, -10);
        withdrawnReason = pick(["Consent withdrawn by the subject", "Lost to follow-up after moving abroad", "Explant after device-related infection"]);
      }
      const subjectCode = `${code}-${String(i).padStart(3, "0")}`;
      const deviceSerial = implantDate ? `KV96-${code.slice(0, 2)}${String(1000 + subjectCount * 7).padStart(5, "0")}` : null;
      const [s] = await db
        .insert(subjects)
        .values({ studyId: study.id, siteId: site.id, code: subjectCode, status, consentDate, consentVersionId: consentVersion.versionId, screeningDate, enrolmentDate, implantDate, deviceSerial, screenFailReason, withdrawnReason, endedOn, createdBy: actor })
        .returning();
      subjectCount++;
      const steps: { from: SubjectStatus | null; to: SubjectStatus; on: string; reason?: string | null }[] = [{ from: null, to: "screening", on: screeningDate }];
      if (status === "screen_failed") steps.push({ from: "screening", to: "screen_failed", on: endedOn!, reason: screenFailReason });
      if (enrolmentDate) steps.push({ from: "screening", to: "enrolled", on: enrolmentDate });
      if (implantDate) steps.push({ from: "enrolled", to: "implanted", on: implantDate }, { from: "implanted", to: "follow_up", on: addCalendarDays(implantDate, 1) });
      if (status === "withdrawn") steps.push({ from: steps.at(-1)!.to, to: "withdrawn", on: endedOn!, reason: withdrawnReason });
      await db.insert(subjectStatusEvents).values(steps.map((st) => ({ subjectId: s!.id, fromStatus: st.from, toStatus: st.to, effectiveOn: st.on, reason: st.reason ?? null, actorId: actor })));

      // Visits: walk the schedule; most past visits done in window, a few late or early, a few
      // missed, and the most recent ones sometimes not yet recorded (overdue).
      if (status === "screen_failed") continue;
      const recorded: RecordedVisit[] = [];
      const anchors = { consent: consentDate, enrolment: enrolmentDate, implant: implantDate };
      const stopDay = endedOn ? toDayNumber(endedOn) : today;
      const schedule = versionInForceOn(versions, DEMO_TODAY)!.schedule;
      for (const visit of schedule) {
        const anchor = anchors[visit.anchor];
        if (!anchor) continue;
        const target = toDayNumber(anchor) + visit.dayOffset;
        let actual = visit.code === "SCR" ? toDayNumber(screeningDate) : visit.code === "IMP" && implantDate ? toDayNumber(implantDate) : target + int(-visit.windowBefore, visit.windowAfter);
        const r = rand();
        if (visit.code !== "SCR" && visit.code !== "IMP") {
          if (r < 0.06) actual = target + visit.windowAfter + int(2, 9); // late
          else if (r < 0.08) actual = target - visit.windowBefore - int(1, 4); // early
        }
        if (actual > stopDay || actual >= today) continue;
        const windowClosedLongAgo = target + visit.windowAfter < today - 60;
        if (!windowClosedLongAgo && r > 0.6) continue; // not yet recorded: due or overdue now
        const actualDate = addCalendarDays("1970-01-01", actual);
        const version = versionInForceOn(versions, actualDate);
        if (!version || !version.schedule.some((v) => v.code === visit.code)) continue;
        const missed = visit.code !== "SCR" && visit.code !== "IMP" && r > 0.95 && windowClosedLongAgo;
        const enteredDay = Math.min(actual + int(0, 9), today - 1);
        const verified = !missed && actual < today - 45 && rand() < 0.7 ? addCalendarDays("1970-01-01", Math.min(enteredDay + int(10, 40), today - 1)) : null;
        recorded.push({ visitCode: visit.code, versionId: version.versionId, status: missed ? "missed" : "done", actualDate: missed ? null : actualDate, dataEnteredOn: addCalendarDays("1970-01-01", enteredDay), verifiedOn: verified });
      }
      if (recorded.length) {
        await db.insert(visitRecords).values(
          recorded.map((r) => ({ subjectId: s!.id, visitCode: r.visitCode, versionId: r.versionId, outcome: r.status, actualDate: r.actualDate ?? null, dataEnteredOn: r.dataEnteredOn ?? null, verifiedOn: r.verifiedOn ?? null, verifiedBy: r.verifiedOn ? monitor : null, recordedBy: actor })),
        );
        visitCount += recorded.length;
      }
      const calendar = computeSubjectCalendar({ subjectCode, status, endedOn, anchors: { consentDate, enrolmentDate, implantDate }, versions, recordedVisits: recorded, asOf: DEMO_TODAY, dueSoonDays: 14 });
      for (const d of detectDeviations(calendar)) {
        await db.insert(deviations).values({ studyId: study.id, siteId: site.id, subjectId: s!.id, source: "automatic", key: d.key, category: visitOutOfWindowCategory, visitCode: d.visitCode, versionId: d.versionId, occurredOn: d.actualDate, windowStart: d.windowStart, windowEnd: d.windowEnd, daysOutside: d.daysOutside, description: d.description });
        deviationCount++;
      }
      if (implantDate && toDayNumber(implantDate) + 92 < stopDay && rand() < 0.12) {
        await db.insert(deviations).values({ studyId: study.id, siteId: site.id, subjectId: s!.id, source: "manual", category: "procedure not done", visitCode: "M3", occurredOn: addCalendarDays(implantDate, 92), description: "Quality-of-life questionnaire not completed at the visit; done by telephone two days later.", reportedBy: actor });
        deviationCount++;
      }
    }
  }
  log(`subjects: ${subjectCount} subjects, ${visitCount} visits recorded, ${deviationCount} deviations; site approvals of 1.0 and 2.0`);
}
