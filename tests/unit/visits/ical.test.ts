import { describe, expect, it } from "vitest";
import ICAL from "ical.js";
import { computeSubjectCalendar, type SubjectCalendar } from "@/lib/visits/subject-calendar";
import { buildSiteVisitFeed, protocolGovernsNotice } from "@/lib/visits/ical";
import { anchors, versions } from "./fixtures";

// The feed is checked with ical.js, an independent RFC 5545 parser.
function calendars(asOf: string): SubjectCalendar[] {
  return [
    computeSubjectCalendar({ subjectCode: "DE01-007", status: "follow_up", anchors, versions, asOf, dueSoonDays: 7, recordedVisits: [{ visitCode: "W1", versionId: "pv-1", status: "done", actualDate: "2025-01-22" }] }),
    computeSubjectCalendar({ subjectCode: "DE01-008", status: "screening", anchors: { consentDate: "2025-01-16" }, versions, asOf, dueSoonDays: 7, recordedVisits: [] }),
    computeSubjectCalendar({ subjectCode: "DE01-009", status: "screen_failed", anchors: { consentDate: "2025-01-03" }, versions, asOf, dueSoonDays: 7, recordedVisits: [] }),
  ];
}
const feed = (asOf: string) => buildSiteVisitFeed({ siteCode: "DE01", calendars: calendars(asOf), uidDomain: "cairn.test", generatedAt: new Date(Date.UTC(2025, 0, 20, 8)) });

function events(text: string) {
  const comp = new ICAL.Component(ICAL.parse(text));
  return comp.getAllSubcomponents("vevent").map((v) => new ICAL.Event(v));
}

describe("site visit feed", () => {
  const asOf = "2025-01-20";
  const expected = calendars(asOf).flatMap((c) => c.entries).filter((e) => e.state === "due" || e.state === "upcoming");

  it("one all-day event per due or upcoming visit, on its target date", () => {
    const evs = events(feed(asOf));
    expect(expected.length).toBe(5); // DE01-007: M1, M3, M6, M12 upcoming; DE01-008: SCR due
    expect(evs).toHaveLength(expected.length);
    const byUid = new Map(evs.map((e) => [e.uid, e]));
    expect(byUid.size).toBe(expected.length); // UIDs unique
    for (const e of expected) {
      const ev = [...byUid.values()].find((x) => x.summary.startsWith(`${e.subjectCode} ${e.visitCode} `))!;
      expect(ev.startDate.isDate).toBe(true); // VALUE=DATE (RFC 5545 §3.3.4, clause from memory)
      expect(ev.startDate.toString()).toBe(e.targetDate);
      expect(ev.description).toContain(`window ${e.windowStart} to ${e.windowEnd}`);
      expect(ev.description).toContain(protocolGovernsNotice);
    }
    // Done, not-scheduled and screen-failed subjects' visits are absent.
    expect(evs.some((e) => e.summary.startsWith("DE01-007 W1 "))).toBe(false);
    expect(evs.some((e) => e.summary.startsWith("DE01-009"))).toBe(false);
  });

  it("UIDs are stable: the same visit keeps its UID as days pass", () => {
    const uidsNow = new Set(events(feed("2025-01-20")).map((e) => e.uid));
    const later = events(feed("2025-02-01"));
    const m1 = later.find((e) => e.summary.startsWith("DE01-007 M1 "))!;
    expect(uidsNow.has(m1.uid)).toBe(true);
    expect(m1.uid).toBe("M1.DE01-007.pv-1@cairn.test");
  });

  it("the same inputs give the same text in any process time zone (no time-zone drift)", () => {
    const saved = process.env.TZ;
    try {
      process.env.TZ = "Pacific/Kiritimati"; // UTC+14
      const east = feed(asOf);
      process.env.TZ = "Pacific/Pago_Pago"; // UTC−11
      const west = feed(asOf);
      expect(east).toBe(west);
      expect(events(west).map((e) => e.startDate.toString()).sort()).toEqual(expected.map((e) => e.targetDate).sort());
    } finally {
      process.env.TZ = saved;
    }
  });

  it("holds subject codes only and states that the approved protocol governs", () => {
    const text = feed(asOf);
    const comp = new ICAL.Component(ICAL.parse(text));
    expect(comp.getFirstPropertyValue("x-wr-caldesc") ?? comp.getFirstPropertyValue("description")).toContain("approved protocol");
    for (const ev of events(text)) expect(ev.summary).toMatch(/^DE01-\d{3} /);
  });
});
