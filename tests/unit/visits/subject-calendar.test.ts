import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { addDays, differenceInCalendarDays, format } from "date-fns";
import { CalendarInputError, computeSubjectCalendar, versionInForceOn, type SubjectCalendarInput } from "@/lib/visits/subject-calendar";
import { anchors, versions } from "./fixtures";

// Reference for dates not listed in REFERENCES.md: date-fns addDays.
const refAdd = (iso: string, n: number) => format(addDays(new Date(Number(iso.slice(0, 4)), Number(iso.slice(5, 7)) - 1, Number(iso.slice(8, 10))), n), "yyyy-MM-dd");

const base = (over: Partial<SubjectCalendarInput> = {}): SubjectCalendarInput => ({
  subjectCode: "DE01-007",
  status: "follow_up",
  anchors,
  versions,
  recordedVisits: [],
  asOf: "2025-01-18",
  dueSoonDays: 7,
  ...over,
});
const entry = (input: SubjectCalendarInput, code: string) => {
  const e = computeSubjectCalendar(input).entries.find((x) => x.visitCode === code);
  if (!e) throw new Error(`no entry ${code}`);
  return e;
};

describe("states at the window boundaries — W1 window 2025-01-19 … 2025-01-25 (REFERENCES.md, common practice)", () => {
  it.each([
    ["2025-01-18", "upcoming"],
    ["2025-01-19", "due"],
    ["2025-01-25", "due"],
    ["2025-01-26", "overdue"],
  ] as const)("as of %s: %s", (asOf, state) => {
    expect(entry(base({ asOf }), "W1").state).toBe(state);
  });

  it("due soon: the window opens within the horizon (1 day ahead with a 7-day horizon; M1 opens 2025-02-07, 20 days ahead)", () => {
    expect(entry(base(), "W1").dueSoon).toBe(true);
    expect(entry(base(), "M1").dueSoon).toBe(false);
    expect(entry(base({ asOf: "2025-01-31" }), "M1").dueSoon).toBe(true); // 7 days before 2025-02-07
    expect(entry(base({ asOf: "2025-01-30" }), "M1").dueSoon).toBe(false); // 8 days before
  });

  it.each([
    ["2025-01-19", "completed_in_window", 0],
    ["2025-01-25", "completed_in_window", 0],
    ["2025-01-18", "completed_out_of_window", -1],
    ["2025-01-26", "completed_out_of_window", 1],
    ["2025-01-29", "completed_out_of_window", 4],
  ] as const)("done on %s: %s (%i days outside)", (actualDate, state, days) => {
    const e = entry(base({ asOf: "2025-03-01", recordedVisits: [{ visitCode: "W1", versionId: "pv-1", status: "done", actualDate }] }), "W1");
    expect(e.state).toBe(state);
    expect(e.daysOutsideWindow).toBe(days);
    expect(e.recorded).toBe(true);
  });

  it("missed stays missed, whatever the date", () => {
    const e = entry(base({ asOf: "2025-03-01", recordedVisits: [{ visitCode: "W1", versionId: "pv-1", status: "missed" }] }), "W1");
    expect(e.state).toBe("missed");
    expect(e.daysOutsideWindow).toBeNull();
  });

  it("windows come from the anchor of each visit", () => {
    const cal = computeSubjectCalendar(base({ asOf: "2025-01-16" }));
    const byCode = Object.fromEntries(cal.entries.map((e) => [e.visitCode, e]));
    expect(byCode.SCR?.targetDate).toBe("2025-01-02");
    expect(byCode.SCR?.windowEnd).toBe(refAdd("2025-01-02", 14));
    expect(byCode.BASE?.windowEnd).toBe(refAdd("2025-01-08", 7));
    expect(byCode.M1).toMatchObject({ windowStart: "2025-02-07", windowEnd: "2025-02-21" });
    expect(byCode.M12).toMatchObject({ windowStart: "2025-12-16", windowEnd: "2026-02-14" });
    // Ordered by target date.
    expect(cal.entries.map((e) => e.visitCode)).toEqual(["SCR", "BASE", "W1", "M1", "M3", "M6", "M12"]);
  });
});

describe("protocol version change mid-follow-up (v2 in force at the site from 2025-03-01)", () => {
  const recorded = [
    { visitCode: "W1", versionId: "pv-1", status: "done" as const, actualDate: "2025-01-22" },
    { visitCode: "M1", versionId: "pv-1", status: "done" as const, actualDate: "2025-02-14" },
  ];
  it("before the change, pending visits follow v1 (M6 listed, no M9)", () => {
    const cal = computeSubjectCalendar(base({ asOf: "2025-02-20", recordedVisits: recorded }));
    expect(cal.versionInForce).toEqual({ versionId: "pv-1", versionLabel: "1.0" });
    const codes = cal.entries.map((e) => e.visitCode);
    expect(codes).toContain("M6");
    expect(codes).not.toContain("M9");
    expect(cal.entries.find((e) => e.visitCode === "M3")).toMatchObject({ versionId: "pv-1", windowStart: "2025-04-01", windowEnd: "2025-04-29" });
  });

  it("after the change: completed visits unchanged, pending ones rescheduled under v2", () => {
    const before = computeSubjectCalendar(base({ asOf: "2025-02-20", recordedVisits: recorded }));
    const after = computeSubjectCalendar(base({ asOf: "2025-03-10", recordedVisits: recorded }));
    expect(after.versionInForce?.versionId).toBe("pv-2");
    for (const code of ["W1", "M1"]) {
      expect(after.entries.find((e) => e.visitCode === code)).toEqual(before.entries.find((e) => e.visitCode === code));
    }
    const m3 = after.entries.find((e) => e.visitCode === "M3");
    expect(m3).toMatchObject({ versionId: "pv-2", versionLabel: "2.0", targetDate: "2025-04-15", windowStart: refAdd("2025-04-15", -21), windowEnd: refAdd("2025-04-15", 21) });
    const codes = after.entries.map((e) => e.visitCode);
    expect(codes).not.toContain("M6"); // dropped by v2 and never done
    expect(after.entries.find((e) => e.visitCode === "M9")).toMatchObject({ versionId: "pv-2", targetDate: refAdd("2025-01-15", 270) });
  });

  it("a visit done under v1 keeps v1's window even where v2's wider window would include it", () => {
    const e = entry(
      base({ asOf: "2025-06-01", recordedVisits: [...recorded, { visitCode: "M3", versionId: "pv-1", status: "done", actualDate: "2025-04-30" }] }),
      "M3",
    );
    expect(e).toMatchObject({ versionId: "pv-1", windowEnd: "2025-04-29", state: "completed_out_of_window", daysOutsideWindow: 1 });
  });

  it("a visit done under v1 and dropped by v2 stays listed", () => {
    const cal = computeSubjectCalendar(
      base({ asOf: "2025-09-01", recordedVisits: [...recorded, { visitCode: "M6", versionId: "pv-1", status: "done", actualDate: "2025-07-14" }] }),
    );
    expect(cal.entries.find((e) => e.visitCode === "M6")).toMatchObject({ versionId: "pv-1", state: "completed_in_window" });
    expect(cal.entries.find((e) => e.visitCode === "M9")?.versionId).toBe("pv-2");
  });

  it("the version in force is the latest approval on or before the day", () => {
    expect(versionInForceOn(versions, "2025-02-28")?.versionId).toBe("pv-1");
    expect(versionInForceOn(versions, "2025-03-01")?.versionId).toBe("pv-2");
    expect(versionInForceOn(versions, "2024-05-31")).toBeNull();
  });
});

describe("anchors and subject states", () => {
  it("visits whose anchor has not happened are not yet scheduled", () => {
    const cal = computeSubjectCalendar(base({ status: "screening", anchors: { consentDate: "2025-01-02" }, asOf: "2025-01-05" }));
    expect(cal.entries.find((e) => e.visitCode === "SCR")?.state).toBe("due");
    for (const e of cal.entries.filter((x) => x.anchor !== "consent")) {
      expect(e).toMatchObject({ state: "not_scheduled", targetDate: null, windowStart: null, windowEnd: null });
    }
  });

  it("an anchor dated after asOf (a planned implant) has not happened yet", () => {
    expect(entry(base({ asOf: "2025-01-14" }), "W1").state).toBe("not_scheduled");
    expect(entry(base({ asOf: "2025-01-15" }), "W1").state).toBe("upcoming");
  });

  it("screen-failed subjects have no visits", () => {
    expect(computeSubjectCalendar(base({ status: "screen_failed" })).entries).toEqual([]);
  });

  it("withdrawn: nothing projected past the withdrawal; visits owed before it stay visible", () => {
    const cal = computeSubjectCalendar(
      base({ status: "withdrawn", endedOn: "2025-03-01", asOf: "2025-06-01", recordedVisits: [{ visitCode: "W1", versionId: "pv-1", status: "done", actualDate: "2025-01-22" }] }),
    );
    expect(cal.entries.map((e) => [e.visitCode, e.state])).toEqual([
      ["SCR", "overdue"],
      ["BASE", "overdue"],
      ["W1", "completed_in_window"],
      ["M1", "overdue"],
    ]);
  });

  it("completed without an end date: only recorded visits", () => {
    const cal = computeSubjectCalendar(
      base({ status: "completed", asOf: "2026-06-01", recordedVisits: [{ visitCode: "M12", versionId: "pv-2", status: "done", actualDate: "2026-01-20" }] }),
    );
    expect(cal.entries.map((e) => e.visitCode)).toEqual(["M12"]);
  });

  it("no version in force at the site yet: nothing projected", () => {
    const cal = computeSubjectCalendar(base({ asOf: "2024-05-01", anchors: { consentDate: "2024-04-20" } }));
    expect(cal.versionInForce).toBeNull();
    expect(cal.entries).toEqual([]);
  });

  it("a done record beats a missed one for the same visit", () => {
    const e = entry(
      base({
        asOf: "2025-03-01",
        recordedVisits: [
          { visitCode: "W1", versionId: "pv-1", status: "done", actualDate: "2025-01-24" },
          { visitCode: "W1", versionId: "pv-1", status: "missed" },
        ],
      }),
      "W1",
    );
    expect(e.state).toBe("completed_in_window");
  });

  it("done with no anchor date is flagged, not guessed", () => {
    const e = entry(base({ anchors: { consentDate: "2025-01-02" }, asOf: "2025-03-01", recordedVisits: [{ visitCode: "W1", versionId: "pv-1", status: "done", actualDate: "2025-01-22" }] }), "W1");
    expect(e.state).toBe("completed_unanchored");
  });

  it("refuses records it cannot place, with a clear message", () => {
    expect(() => computeSubjectCalendar(base({ recordedVisits: [{ visitCode: "W1", versionId: "pv-9", status: "done", actualDate: "2025-01-22" }] }))).toThrow(CalendarInputError);
    expect(() => computeSubjectCalendar(base({ recordedVisits: [{ visitCode: "M9", versionId: "pv-1", status: "done", actualDate: "2025-10-01" }] }))).toThrow(/not in the schedule of protocol version 1.0/);
    expect(() => computeSubjectCalendar(base({ recordedVisits: [{ visitCode: "W1", versionId: "pv-1", status: "done" }] }))).toThrow(/without a date/);
    expect(() => computeSubjectCalendar(base({ dueSoonDays: -1 }))).toThrow(/horizon/);
  });
});

describe("property: states follow the window computed with date-fns", () => {
  it("upcoming before the window, due inside, overdue after; in/out of window for done visits", () => {
    const local = (iso: string) => new Date(Number(iso.slice(0, 4)), Number(iso.slice(5, 7)) - 1, Number(iso.slice(8, 10)));
    const day = fc.date({ min: new Date(2024, 5, 21), max: new Date(2030, 11, 31), noInvalidDate: true }).map((d) => format(d, "yyyy-MM-dd"));
    fc.assert(
      fc.property(day, fc.integer({ min: 0, max: 800 }), fc.integer({ min: -40, max: 40 }), (implant, daysLater, jitter) => {
        const asOf = refAdd(implant, daysLater);
        const input = base({ anchors: { consentDate: refAdd(implant, -20), enrolmentDate: refAdd(implant, -10), implantDate: implant }, asOf });
        const m3 = entry(input, "M3"); // day 90, version-dependent window
        const width = m3.versionId === "pv-1" ? 14 : 21;
        const start = refAdd(implant, 90 - width);
        const end = refAdd(implant, 90 + width);
        const expected = differenceInCalendarDays(local(asOf), local(start)) < 0 ? "upcoming" : differenceInCalendarDays(local(asOf), local(end)) <= 0 ? "due" : "overdue";
        if (m3.state !== expected || m3.windowStart !== start || m3.windowEnd !== end) return false;
        const actualDate = refAdd(implant, 90 + jitter);
        const done = entry({ ...input, recordedVisits: [{ visitCode: "M3", versionId: "pv-1", status: "done", actualDate }] }, "M3");
        const early = differenceInCalendarDays(local(actualDate), local(refAdd(implant, 76)));
        const late = differenceInCalendarDays(local(actualDate), local(refAdd(implant, 104)));
        const days = early < 0 ? early : late > 0 ? late : 0;
        return done.daysOutsideWindow === days && done.state === (days === 0 ? "completed_in_window" : "completed_out_of_window");
      }),
      { numRuns: 1000 },
    );
  });
});
