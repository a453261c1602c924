import { addDays, format, parseISO } from "date-fns";
import { and, eq } from "drizzle-orm";
import ICAL from "ical.js";
import { beforeAll, describe, expect, it } from "vitest";
import { POST as recordVisitRoute } from "@/app/api/v1/subjects/[subjectId]/visits/route";
import { POST as verifyRoute } from "@/app/api/v1/subjects/[subjectId]/visits/[visitCode]/verification/route";
import { GET as listSiteVisitsRoute } from "@/app/api/v1/sites/[siteId]/visits/route";
import { GET as listFeedsRoute, POST as createFeedRoute } from "@/app/api/v1/sites/[siteId]/calendar-feeds/route";
import { DELETE as revokeFeedRoute } from "@/app/api/v1/calendar-feed-tokens/[tokenId]/route";
import { GET as feedRoute } from "@/app/api/v1/calendar-feeds/[token]/route";
import { GET as deviationLogRoute } from "@/app/api/v1/studies/[studyId]/deviations/route";
import { PATCH as updateSubjectRoute } from "@/app/api/v1/subjects/[subjectId]/route";
import { POST as reportDeviationRoute } from "@/app/api/v1/subjects/[subjectId]/deviations/route";
import { PATCH as resolveDeviationRoute } from "@/app/api/v1/deviations/[deviationId]/route";
import { auditEvents, deviations, memberships } from "@/server/db/schema";
import { loadCalendars } from "@/server/visits/load-calendars";
import { todayAtSite } from "@/server/sites/site-today";
import { callRoute } from "../../support/api";
import { db } from "../../support/db";
import { approveV2, createSubjectsFixture, insertSubject, type SubjectsFixture } from "../subjects/subject-fixture";

let fx: SubjectsFixture;
beforeAll(async () => {
  fx = await createSubjectsFixture();
});

// date-fns is the reference for calendar arithmetic (an independent implementation).
const plus = (iso: string, days: number) => format(addDays(parseISO(iso), days), "yyyy-MM-dd");

const record = (subjectId: string, body: unknown, userId = fx.userByRole.coordinator.id) =>
  callRoute(recordVisitRoute, { method: "POST", params: { subjectId }, body, userId });

describe("a new protocol version mid-follow-up (through the database)", () => {
  it("keeps completed visits on their version and moves pending ones to the new schedule", async () => {
    const s = await insertSubject(fx, { siteId: fx.siteA.id, code: "TA01-401", enrolmentDate: "2025-02-20", implantDate: "2025-03-03" });
    expect((await record(s.id, { visitCode: "W1", outcome: "done", actualDate: "2025-03-10", dataEnteredOn: "2025-03-11" })).status).toBe(200);
    expect((await record(s.id, { visitCode: "M1", outcome: "done", actualDate: "2025-04-02" })).status).toBe(200);

    const before = (await loadCalendars(db, { subjectIds: [s.id], asOf: "2025-04-20" }))[0]!.calendar;
    const m3Before = before.entries.find((e) => e.visitCode === "M3")!;
    expect(m3Before).toMatchObject({ versionId: fx.v1.id, targetDate: plus("2025-03-03", 90), windowEnd: plus("2025-03-03", 104) });

    await approveV2(fx, fx.siteA.id, "2025-04-25");
    const after = (await loadCalendars(db, { subjectIds: [s.id], asOf: "2025-05-01" }))[0]!.calendar;
    const by = new Map(after.entries.map((e) => [e.visitCode, e]));
    // Done under 1.0: unchanged.
    expect(by.get("W1")).toMatchObject({ versionId: fx.v1.id, state: "completed_in_window", actualDate: "2025-03-10", targetDate: plus("2025-03-03", 7) });
    expect(by.get("M1")).toMatchObject({ versionId: fx.v1.id, state: "completed_in_window", targetDate: plus("2025-03-03", 30) });
    // Pending: the 2.0 schedule (Month 3 on day 91 ±21, Month 9 new).
    expect(by.get("M3")).toMatchObject({ versionId: fx.v2.id, targetDate: plus("2025-03-03", 91), windowStart: plus("2025-03-03", 70), windowEnd: plus("2025-03-03", 112) });
    expect(by.get("M9")).toMatchObject({ versionId: fx.v2.id, targetDate: plus("2025-03-03", 273) });
    expect(after.versionInForce?.versionId).toBe(fx.v2.id);

    // A visit recorded now is recorded under 2.0 and judged by its window.
    const m3 = await record(s.id, { visitCode: "M3", outcome: "done", actualDate: plus("2025-03-03", 110) });
    expect(m3.json.visit.versionId).toBe(fx.v2.id);
    const open = await db.select().from(deviations).where(eq(deviations.subjectId, s.id));
    expect(open).toHaveLength(0); // day 110 is inside 2.0's window (it was outside 1.0's day 76–104)
  });
});

describe("out-of-window visits and their deviation", () => {
  it("opens exactly one deviation, updates it on a second late date, and resolves it when edited back", async () => {
    const s = await insertSubject(fx, { siteId: fx.siteA.id, code: "TA01-402", enrolmentDate: "2025-02-20", implantDate: "2025-03-03" });
    // M1: day 30 ±7 from 2025-03-03 → window 2025-03-26 … 2025-04-09 (date-fns below).
    const windowEnd = plus("2025-03-03", 37);
    expect(windowEnd).toBe("2025-04-09");
    const late = await record(s.id, { visitCode: "M1", outcome: "done", actualDate: plus(windowEnd, 5) });
    expect(late.status).toBe(200);
    let rows = await db.select().from(deviations).where(eq(deviations.subjectId, s.id));
    expect(rows).toHaveLength(1);
    expect(rows[0]).toMatchObject({ source: "automatic", status: "open", visitCode: "M1", daysOutside: 5, occurredOn: "2025-04-14", category: "visit out of window" });

    await record(s.id, { visitCode: "M1", outcome: "done", actualDate: plus(windowEnd, 6) });
    rows = await db.select().from(deviations).where(eq(deviations.subjectId, s.id));
    expect(rows).toHaveLength(1);
    expect(rows[0]).toMatchObject({ status: "open", daysOutside: 6 });

    await record(s.id, { visitCode: "M1", outcome: "done", actualDate: windowEnd });
    rows = await db.select().from(deviations).where(eq(deviations.subjectId, s.id));
    expect(rows).toHaveLength(1);
    expect(rows[0]).toMatchObject({ status: "resolved" });
    expect(rows[0]!.resolution).toMatch(/inside its window/);
    const trail = await db.select({ action: auditEvents.action }).from(auditEvents).where(eq(auditEvents.entityId, rows[0]!.id));
    expect(trail.map((t) => t.action)).toEqual(["deviation.open", "deviation.update", "deviation.resolve"]);
  });

  it("resolves the deviation when a corrected implant date brings the visit back into its window", async () => {
    const s = await insertSubject(fx, { siteId: fx.siteA.id, code: "TA01-406", enrolmentDate: "2025-02-20", implantDate: "2025-03-03" });
    await record(s.id, { visitCode: "W1", outcome: "done", actualDate: "2025-03-17" }); // window 03-07 … 03-13: 4 days late
    expect((await db.select().from(deviations).where(eq(deviations.subjectId, s.id)))[0]).toMatchObject({ status: "open", daysOutside: 4 });
    // The implant was in fact on 2025-03-07: W1's window becomes 03-11 … 03-17 (date-fns: 03-07 + 7 ± 3).
    expect(plus("2025-03-07", 10)).toBe("2025-03-17");
    const res = await callRoute(updateSubjectRoute, { method: "PATCH", params: { subjectId: s.id }, body: { implantDate: "2025-03-07" }, userId: fx.userByRole.coordinator.id });
    expect(res.status, JSON.stringify(res.json)).toBe(200);
    const rows = await db.select().from(deviations).where(eq(deviations.subjectId, s.id));
    expect(rows).toHaveLength(1);
    expect(rows[0]!.status).toBe("resolved");
  });

  it("takes other deviations from the site or the monitor, and resolves them with a note", async () => {
    const s = await insertSubject(fx, { siteId: fx.siteA.id, code: "TA01-407", enrolmentDate: "2025-02-20", implantDate: "2025-03-03" });
    const report = (body: unknown, userId = fx.userByRole.monitor.id) => callRoute(reportDeviationRoute, { method: "POST", params: { subjectId: s.id }, body, userId });
    expect((await report({ category: "visit out of window", occurredOn: "2025-03-20", description: "Recorded by hand instead" })).status).toBe(400);
    expect((await report({ category: "consent", occurredOn: "2025-01-20", description: "Dated before the subject's consent" })).status).toBe(422);
    const ok = await report({ category: "procedure not done", occurredOn: "2025-04-02", visitCode: "M1", description: "Questionnaire skipped at the Month 1 visit" });
    expect(ok.status).toBe(201);
    expect(ok.json.deviation).toMatchObject({ source: "manual", status: "open", category: "procedure not done" });
    const resolve = (userId: string) => callRoute(resolveDeviationRoute, { method: "PATCH", params: { deviationId: ok.json.deviation.id }, body: { resolution: "Questionnaire completed by telephone" }, userId });
    expect((await resolve(fx.siteBPeople.coordinator.id)).status).toBe(404);
    const done = await resolve(fx.userByRole.coordinator.id);
    expect(done.json.deviation).toMatchObject({ status: "resolved", resolution: "Questionnaire completed by telephone" });
    expect((await resolve(fx.userByRole.coordinator.id)).status).toBe(409);
  });

  it("shows in the sponsor's deviation log, filtered and as CSV", async () => {
    const s = await insertSubject(fx, { siteId: fx.siteA.id, code: "TA01-403", enrolmentDate: "2025-02-20", implantDate: "2025-03-03" });
    await record(s.id, { visitCode: "W1", outcome: "done", actualDate: "2025-03-05" }); // window 03-07 … 03-13: 2 days early
    const log = await callRoute(deviationLogRoute, { params: { studyId: fx.study.id }, query: { status: "open", subject: "TA01-403" }, userId: fx.userByRole.sponsor_admin.id });
    expect(log.json.deviations).toHaveLength(1);
    expect(log.json.deviations[0]).toMatchObject({ subjectCode: "TA01-403", visitCode: "W1", daysOutside: -2, siteCode: "TA01" });
    const csv = await callRoute(deviationLogRoute, { params: { studyId: fx.study.id }, query: { subject: "TA01-403", format: "csv" }, userId: fx.userByRole.sponsor_admin.id });
    expect(csv.headers.get("content-type")).toMatch(/text\/csv/);
    const lines = String(csv.json).trim().split("\r\n");
    expect(lines[0]).toMatch(/^site,subject,source,category,visit/);
    expect(lines[1]).toMatch(/^TA01,TA01-403,automatic,visit out of window,W1,1\.0,2025-03-05,2025-03-07,2025-03-13,-2,open,/);
    // Site B's coordinator sees none of site A's deviations.
    const other = await callRoute(deviationLogRoute, { params: { studyId: fx.study.id }, query: { subject: "TA01-403" }, userId: fx.siteBPeople.coordinator.id });
    expect(other.json.deviations).toHaveLength(0);
  });

  it("lets the monitor verify a visit done, not before its data entry", async () => {
    const s = await insertSubject(fx, { siteId: fx.siteA.id, code: "TA01-404", enrolmentDate: "2025-02-20", implantDate: "2025-03-03" });
    await record(s.id, { visitCode: "W1", outcome: "done", actualDate: "2025-03-10", dataEnteredOn: "2025-03-12" });
    const verify = (verifiedOn: string, userId = fx.userByRole.monitor.id) => callRoute(verifyRoute, { method: "POST", params: { subjectId: s.id, visitCode: "W1" }, body: { verifiedOn }, userId });
    expect((await verify("2025-03-11")).status).toBe(422);
    expect((await verify("2025-03-20", fx.userByRole.coordinator.id)).status).toBe(403);
    const ok = await verify("2025-03-20");
    expect(ok.status).toBe(200);
    expect(ok.json.visit.verifiedOn).toBe("2025-03-20");
    // A changed visit date clears the verification (it was checked against the old one).
    await record(s.id, { visitCode: "W1", outcome: "done", actualDate: "2025-03-09" });
    const again = (await loadCalendars(db, { subjectIds: [s.id], asOf: "2025-04-01" }))[0]!.calendar.entries.find((e) => e.visitCode === "W1");
    expect(again?.verifiedOn).toBeNull();
  });
});

describe("the site's visit list and iCalendar feed", () => {
  it("lists due and upcoming visits and serves them as a feed that ical.js parses, with the right DTSTARTs", async () => {
    const today = todayAtSite(fx.siteA.timeZone);
    const implant = plus(today, -5);
    const s = await insertSubject(fx, { siteId: fx.siteB.id, code: "TB01-405", consentDate: plus(implant, -40), enrolmentDate: plus(implant, -10), implantDate: implant });
    const coordB = fx.siteBPeople.coordinator.id;
    const list = await callRoute(listSiteVisitsRoute, { params: { siteId: fx.siteB.id }, query: { weeks: "5" }, userId: coordB });
    expect(list.status).toBe(200);
    const mine = list.json.visits.filter((v: { subjectId: string }) => v.subjectId === s.id);
    // W1 (day 7 ±3) is due now; M1 (day 30 ±7) opens within five weeks; SCR (consent + 0..28) is overdue.
    expect(mine.map((v: { visitCode: string; state: string }) => `${v.visitCode}:${v.state}`).sort()).toEqual(["M1:upcoming", "SCR:overdue", "W1:due"]);

    const created = await callRoute(createFeedRoute, { method: "POST", params: { siteId: fx.siteB.id }, body: { label: "Clinic calendar" }, userId: coordB });
    expect(created.status).toBe(201);
    const token = new URL(created.json.url).pathname.split("/").pop()!;
    const feed = await callRoute(feedRoute, { params: { token } });
    expect(feed.status).toBe(200);
    expect(feed.headers.get("content-type")).toMatch(/text\/calendar/);
    const events = new ICAL.Component(ICAL.parse(String(feed.json)))
      .getAllSubcomponents("vevent")
      .map((v) => new ICAL.Event(v))
      .filter((e) => e.summary.startsWith("TB01-405"));
    const starts = Object.fromEntries(events.map((e) => [e.summary.split(" ")[1], e.startDate.toString()]));
    expect(starts.W1).toBe(plus(implant, 7));
    expect(starts.M1).toBe(plus(implant, 30));
    expect(starts.M3).toBe(plus(implant, 90));
    expect(events.every((e) => e.startDate.isDate)).toBe(true);

    // Creating and revoking the address is audited; the secret is never written to the trail.
    const audit = await db.select().from(auditEvents).where(and(eq(auditEvents.entityId, created.json.feed.id)));
    expect(audit.map((a) => a.action)).toEqual(["calendar_feed.create"]);
    expect(JSON.stringify(audit)).not.toContain(token);
    const feeds = await callRoute(listFeedsRoute, { params: { siteId: fx.siteB.id }, userId: coordB });
    expect(feeds.json.feeds.map((f: { id: string }) => f.id)).toContain(created.json.feed.id);
    // Someone else cannot revoke it.
    expect((await callRoute(revokeFeedRoute, { method: "DELETE", params: { tokenId: created.json.feed.id }, userId: fx.userByRole.sponsor_admin.id })).status).toBe(404);
    expect((await callRoute(revokeFeedRoute, { method: "DELETE", params: { tokenId: created.json.feed.id }, userId: coordB })).status).toBe(200);
    expect((await callRoute(feedRoute, { params: { token } })).status).toBe(404);
    const trail = await db.select({ action: auditEvents.action }).from(auditEvents).where(eq(auditEvents.entityId, created.json.feed.id));
    expect(trail.map((a) => a.action).sort()).toEqual(["calendar_feed.create", "calendar_feed.revoke"]);
  });

  it("stops serving a feed once its owner loses the role at the site", async () => {
    const coordB = fx.siteBPeople.coordinator.id;
    const created = await callRoute(createFeedRoute, { method: "POST", params: { siteId: fx.siteB.id }, body: {}, userId: coordB });
    const token = new URL(created.json.url).pathname.split("/").pop()!;
    expect((await callRoute(feedRoute, { params: { token } })).status).toBe(200);
    await db.update(memberships).set({ revokedAt: new Date() }).where(and(eq(memberships.userId, coordB), eq(memberships.siteId, fx.siteB.id)));
    expect((await callRoute(feedRoute, { params: { token } })).status).toBe(404);
    expect((await callRoute(feedRoute, { params: { token: "not-a-token" } })).status).toBe(400);
  });
});
