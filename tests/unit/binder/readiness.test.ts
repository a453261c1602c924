import { addMonths as dfAddMonths, differenceInCalendarDays, format, getISOWeek, getISOWeekYear, parseISO } from "date-fns";
import { describe, expect, it } from "vitest";
import { addMonths, computeSiteBinder, describeItem, isoWeekKey, itemState, type BinderDocument, type BinderType } from "@/lib/binder";

const type = (over: Partial<BinderType> = {}): BinderType => ({
  id: "t-agreement",
  code: "investigator_agreement",
  name: "Signed investigator agreement",
  holder: "site",
  appliesToRoles: [],
  requiredFrom: "start_up",
  expires: false,
  ...over,
});
const doc = (over: Partial<BinderDocument> = {}): BinderDocument => ({
  id: "d1",
  documentTypeId: "t-agreement",
  personId: null,
  fileName: "x.pdf",
  createdAt: "2026-01-10T09:00:00.000Z",
  reviewState: "accepted",
  issuedOn: null,
  expiresOn: null,
  ...over,
});
const days = (a: string, b: string) => differenceInCalendarDays(parseISO(b), parseISO(a));

describe("item state across a month end (expiring = 0–60 days of validity left; valid through the expiry date)", () => {
  // Today is the last day of January 2026 (a common year: February has 28 days).
  const today = "2026-01-31";
  const gcp = type({ id: "t-gcp", expires: true });
  it.each([
    // expiry date, expected state; day counts from date-fns differenceInCalendarDays
    ["2026-01-30", "expired"], // yesterday was the last valid day
    ["2026-01-31", "expiring"], // last valid day is today
    ["2026-02-01", "expiring"], // across the month end: 1 day
    ["2026-03-31", "expiring"], // 59 days: 28 (Feb) + 31 (Mar)
    ["2026-04-01", "expiring"], // exactly 60 days
    ["2026-04-02", "complete"], // 61 days
  ] as const)("expiring on %s → %s", (expiresOn, expected) => {
    const r = itemState(doc({ documentTypeId: gcp.id, expiresOn }), true, today);
    expect(r.state).toBe(expected);
    expect(r.daysToExpiry).toBe(days(today, expiresOn)); // date-fns differenceInCalendarDays
  });

  it("counts days across a leap-year February like date-fns", () => {
    // 2028 is a leap year (Gregorian rule: divisible by 4, not by 100).
    const r = itemState(doc({ expiresOn: "2028-03-01" }), true, "2028-01-31");
    expect(r.daysToExpiry).toBe(days("2028-01-31", "2028-03-01"));
    expect(r.daysToExpiry).toBe(30);
    expect(r.state).toBe("expiring");
  });

  it("ignores the expiry date of a type that does not expire", () => {
    expect(itemState(doc({ expiresOn: "2020-01-01" }), false, today).state).toBe("complete");
  });

  it("puts review before expiry: an unreviewed or rejected upload is not complete", () => {
    expect(itemState(doc({ reviewState: "awaiting_review" }), false, today).state).toBe("awaiting_review");
    expect(itemState(doc({ reviewState: "rejected" }), false, today).state).toBe("rejected");
    expect(itemState(null, true, today).state).toBe("missing");
  });
});

describe("a site's binder", () => {
  const cv = type({ id: "t-cv", code: "investigator_cv", name: "Curriculum vitae", holder: "person", appliesToRoles: ["investigator"] });
  const gcp = type({ id: "t-gcp", code: "gcp_training", name: "GCP training certificate", holder: "person", appliesToRoles: ["investigator", "coordinator"], expires: true });
  const agreement = type();
  const accountability = type({ id: "t-dev", code: "device_accountability", name: "Device log", requiredFrom: "open" });
  const monitoring = type({ id: "t-mon", code: "monitoring_report", name: "Monitoring visit report", requiredFrom: null });
  const people = [
    { userId: "u-inv", name: "Dr. Inv", roles: ["investigator" as const] },
    { userId: "u-coord", name: "Coord", roles: ["coordinator" as const] },
    { userId: "u-fin", name: "Fin", roles: ["site_finance" as const] },
  ];
  const types = [cv, gcp, agreement, accountability, monitoring];

  it("makes one item per person holding the role, one per site otherwise", () => {
    const b = computeSiteBinder({ today: "2026-02-27", status: "start_up", types, people, documents: [] });
    expect(b.items.filter((i) => i.type.id === "t-cv").map((i) => i.person?.userId)).toEqual(["u-inv"]);
    expect(b.items.filter((i) => i.type.id === "t-gcp").map((i) => i.person?.userId)).toEqual(["u-inv", "u-coord"]);
    expect(b.items.filter((i) => i.type.id === "t-agreement")).toHaveLength(1);
    // Required at start-up: CV, two GCP certificates, agreement; the device log only from Open.
    expect(b.requiredCount).toBe(4);
    expect(b.blocking).toHaveLength(4);
    expect(b.counts.missing).toBe(4);
  });

  it("judges the move to Open by what Open requires, listing what is missing", () => {
    const documents = [
      doc({ id: "a", documentTypeId: "t-cv", personId: "u-inv" }),
      doc({ id: "b", documentTypeId: "t-gcp", personId: "u-inv", expiresOn: "2026-03-31" }), // 32 days: expiring, not blocking
      doc({ id: "c", documentTypeId: "t-gcp", personId: "u-coord", expiresOn: "2026-02-26" }), // expired yesterday
      doc({ id: "d", documentTypeId: "t-agreement" }),
    ];
    const atStartUp = computeSiteBinder({ today: "2026-02-27", status: "start_up", types, people, documents });
    expect(atStartUp.blocking.map(describeItem)).toEqual(["GCP training certificate (Coord) — expired"]);
    const atOpen = computeSiteBinder({ today: "2026-02-27", status: "open", types, people, documents });
    expect(atOpen.blocking.map((i) => i.type.code)).toEqual(["gcp_training", "device_accountability"]);
    expect(atOpen.counts.expiring).toBe(1);
  });

  it("takes the newest upload as the current version and keeps the older ones", () => {
    const documents = [
      doc({ id: "old", createdAt: "2026-01-01T10:00:00.000Z", reviewState: "accepted" }),
      doc({ id: "new", createdAt: "2026-02-01T10:00:00.000Z", reviewState: "rejected", reviewReason: "unsigned page 3" }),
    ];
    const b = computeSiteBinder({ today: "2026-02-27", status: "start_up", types: [agreement], people, documents });
    const item = b.items[0]!;
    expect(item.current?.id).toBe("new");
    expect(item.earlier.map((d) => d.id)).toEqual(["old"]);
    expect(item.state).toBe("rejected");
    expect(describeItem(item)).toBe("Signed investigator agreement — rejected: unsigned page 3");
  });

  it("reports a per-person requirement nobody can meet yet", () => {
    const b = computeSiteBinder({ today: "2026-02-27", status: "start_up", types: [cv], people: [], documents: [] });
    expect(b.blocking.map(describeItem)).toEqual(["Curriculum vitae (nobody holds the role investigator yet) — missing"]);
  });

  it("ignores another person's or another type's uploads", () => {
    const documents = [doc({ documentTypeId: "t-cv", personId: "u-someone-else" })];
    const b = computeSiteBinder({ today: "2026-02-27", status: "start_up", types: [cv], people, documents });
    expect(b.items[0]!.state).toBe("missing");
  });

  it("refuses a malformed date", () => {
    expect(() => computeSiteBinder({ today: "2026-02-30", status: "open", types, people, documents: [] })).toThrow(/YYYY-MM-DD/);
  });
});

describe("proposed expiry = issue date + usual validity, clamped to the month end like date-fns addMonths", () => {
  it.each([
    ["2023-03-15", 36],
    ["2025-01-31", 1],
    ["2024-02-29", 36], // leap day → 2027-02-28
    ["2024-02-29", 48], // → 2028-02-29
    ["2026-12-31", 2],
    ["2026-11-30", 3],
  ])("%s + %i months", (issued, months) => {
    expect(addMonths(issued, months)).toBe(format(dfAddMonths(parseISO(issued), months), "yyyy-MM-dd"));
  });
});

describe("ISO 8601 week key of the weekly digest, checked against date-fns getISOWeek/getISOWeekYear", () => {
  const cases = ["2026-12-01", "2026-12-31", "2027-01-01", "2027-01-04", "2020-12-31", "2021-01-03", "2021-01-04", "2024-12-30", "2026-01-01", "2015-12-31"];
  it.each(cases)("%s", (d) => {
    const at = new Date(`${d}T12:00:00Z`);
    const local = parseISO(d);
    expect(isoWeekKey(at)).toBe(`${getISOWeekYear(local)}-W${String(getISOWeek(local)).padStart(2, "0")}`);
  });
  it("changes on Monday, not Sunday", () => {
    expect(isoWeekKey(new Date("2026-12-06T23:59:59Z"))).toBe(isoWeekKey(new Date("2026-11-30T00:00:00Z")));
    expect(isoWeekKey(new Date("2026-12-07T00:00:00Z"))).not.toBe(isoWeekKey(new Date("2026-12-06T23:59:59Z")));
  });
});
