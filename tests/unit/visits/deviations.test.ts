import { describe, expect, it } from "vitest";
import { computeSubjectCalendar, type RecordedVisit, type SubjectCalendarInput } from "@/lib/visits/subject-calendar";
import { detectDeviation, reconcileDeviations, type ExistingAutomaticDeviation, type VisitDeviation } from "@/lib/visits/deviations";
import { anchors, versions } from "./fixtures";

// W1 window 2025-01-19 … 2025-01-25 for implant 2025-01-15 (REFERENCES.md visit windows, common practice).
const calendar = (recordedVisits: RecordedVisit[], subjectCode = "DE01-007") =>
  computeSubjectCalendar({
    subjectCode,
    status: "follow_up",
    anchors,
    versions,
    recordedVisits,
    asOf: "2025-02-20",
    dueSoonDays: 7,
  } satisfies SubjectCalendarInput);
const w1 = (actualDate: string): RecordedVisit => ({ visitCode: "W1", versionId: "pv-1", status: "done", actualDate });

// A stand-in for the stored table: applies the changes the way the server would.
function apply(store: ExistingAutomaticDeviation[], changes: ReturnType<typeof reconcileDeviations>): ExistingAutomaticDeviation[] {
  const next = store.map((d) => ({ ...d }));
  for (const r of changes.toResolve) next.find((d) => d.id === r.existing.id)!.status = "resolved";
  for (const u of changes.toUpdate) Object.assign(next.find((d) => d.id === u.existing.id)!, { daysOutside: u.deviation.daysOutside, actualDate: u.deviation.actualDate });
  changes.toOpen.forEach((d: VisitDeviation, i) =>
    next.push({ id: `dev-${next.length + i}`, key: d.key, subjectCode: d.subjectCode, status: "open", daysOutside: d.daysOutside, actualDate: d.actualDate }),
  );
  return next;
}

describe("detectDeviation", () => {
  it("a visit done 2 days after its window closes is a 'visit out of window' deviation, +2", () => {
    const e = calendar([w1("2025-01-27")]).entries.find((x) => x.visitCode === "W1")!;
    const d = detectDeviation(e);
    expect(d).toMatchObject({ category: "visit out of window", subjectCode: "DE01-007", visitCode: "W1", daysOutside: 2, versionId: "pv-1" });
    expect(d?.description).toContain("2 days late");
    expect(d?.description).toContain("2025-01-19 to 2025-01-25");
  });
  it("early is negative", () => {
    const e = calendar([w1("2025-01-18")]).entries.find((x) => x.visitCode === "W1")!;
    expect(detectDeviation(e)).toMatchObject({ daysOutside: -1 });
    expect(detectDeviation(e)?.description).toContain("1 day early");
  });
  it("in window, missed, due or overdue: no deviation", () => {
    const cal = calendar([w1("2025-01-25"), { visitCode: "M1", versionId: "pv-1", status: "missed" }]);
    for (const e of cal.entries) expect(detectDeviation(e)).toBeNull();
    expect(cal.entries.some((e) => e.state === "overdue")).toBe(true);
  });
});

describe("reconcileDeviations", () => {
  it("completion out of window yields exactly one deviation, however often it is recomputed", () => {
    let store: ExistingAutomaticDeviation[] = [];
    const first = reconcileDeviations(store, [calendar([w1("2025-01-27")])]);
    expect(first.toOpen).toHaveLength(1);
    store = apply(store, first);
    for (let i = 0; i < 3; i++) {
      const again = reconcileDeviations(store, [calendar([w1("2025-01-27")])]);
      expect(again).toEqual({ toOpen: [], toResolve: [], toUpdate: [] });
    }
    expect(store.filter((d) => d.status === "open")).toHaveLength(1);
  });

  it("an edit back into the window resolves it", () => {
    const store = apply([], reconcileDeviations([], [calendar([w1("2025-01-27")])]));
    const changes = reconcileDeviations(store, [calendar([w1("2025-01-24")])]);
    expect(changes.toOpen).toEqual([]);
    expect(changes.toResolve.map((r) => r.existing.id)).toEqual([store[0]!.id]);
  });

  it("an edit to another out-of-window date updates the one deviation, it does not add a second", () => {
    const store = apply([], reconcileDeviations([], [calendar([w1("2025-01-27")])]));
    const changes = reconcileDeviations(store, [calendar([w1("2025-01-30")])]);
    expect(changes.toOpen).toEqual([]);
    expect(changes.toUpdate).toHaveLength(1);
    expect(changes.toUpdate[0]?.deviation.daysOutside).toBe(5);
  });

  it("out of window again after a resolution opens a new one", () => {
    let store = apply([], reconcileDeviations([], [calendar([w1("2025-01-27")])]));
    store = apply(store, reconcileDeviations(store, [calendar([w1("2025-01-24")])]));
    const changes = reconcileDeviations(store, [calendar([w1("2025-01-28")])]);
    expect(changes.toOpen).toHaveLength(1);
  });

  it("leaves other subjects' deviations alone", () => {
    const other = apply([], reconcileDeviations([], [calendar([w1("2025-01-27")], "DE01-008")]));
    const changes = reconcileDeviations(other, [calendar([w1("2025-01-24")], "DE01-007")]);
    expect(changes).toEqual({ toOpen: [], toResolve: [], toUpdate: [] });
  });

  it("duplicates from an earlier fault are resolved down to one", () => {
    const one = apply([], reconcileDeviations([], [calendar([w1("2025-01-27")])]));
    const twice = [...one, { ...one[0]!, id: "dev-dup" }];
    const changes = reconcileDeviations(twice, [calendar([w1("2025-01-27")])]);
    expect(changes.toResolve.map((r) => r.existing.id)).toEqual(["dev-dup"]);
    expect(changes.toOpen).toEqual([]);
  });
});
