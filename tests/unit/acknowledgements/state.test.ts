import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { addDays, differenceInCalendarDays, format } from "date-fns";
import { acknowledgementStatus, describeStatus, reminderDue, reminderFrom } from "@/lib/acknowledgements/state";
import { csvCell, toCsv } from "@/lib/csv";
import { acknowledgementMeaning } from "@/lib/acknowledgements/meaning";

const local = (iso: string) => new Date(Number(iso.slice(0, 4)), Number(iso.slice(5, 7)) - 1, Number(iso.slice(8, 10)));

describe("acknowledgement status (days left / over against date-fns differenceInCalendarDays)", () => {
  it.each([
    ["2026-03-02", "2026-02-27", { state: "pending", daysLeft: 3 }],
    ["2026-03-02", "2026-03-02", { state: "pending", daysLeft: 0 }],
    ["2026-02-28", "2026-03-01", { state: "overdue", daysOver: 1 }],
    ["2028-02-28", "2028-03-01", { state: "overdue", daysOver: 2 }],
  ] as const)("due %s, today %s", (dueOn, today, expected) => {
    expect(acknowledgementStatus({ dueOn, today })).toEqual(expected);
    const ref = differenceInCalendarDays(local(dueOn), local(today));
    expect("daysLeft" in expected ? expected.daysLeft : -expected.daysOver).toBe(ref);
  });

  it("any due date and today", () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 5000 }), fc.integer({ min: -60, max: 60 }), (n, delta) => {
        const dueOn = format(addDays(new Date(2024, 0, 1), n), "yyyy-MM-dd");
        const today = format(addDays(local(dueOn), delta), "yyyy-MM-dd");
        const s = acknowledgementStatus({ dueOn, today });
        const ref = differenceInCalendarDays(local(dueOn), local(today));
        if (ref >= 0) expect(s).toEqual({ state: "pending", daysLeft: ref });
        else expect(s).toEqual({ state: "overdue", daysOver: -ref });
      }),
    );
  });

  it("signed: acknowledged, late when after the due date", () => {
    expect(acknowledgementStatus({ dueOn: "2026-03-02", today: "2026-04-01", signedOn: "2026-03-02" })).toEqual({ state: "acknowledged", signedOn: "2026-03-02", late: false });
    expect(acknowledgementStatus({ dueOn: "2026-03-02", today: "2026-04-01", signedOn: "2026-03-03" })).toEqual({ state: "acknowledged", signedOn: "2026-03-03", late: true });
  });

  it("describes each state in words", () => {
    expect(describeStatus({ state: "pending", daysLeft: 1 })).toBe("1 day left");
    expect(describeStatus({ state: "pending", daysLeft: 0 })).toBe("Due today");
    expect(describeStatus({ state: "overdue", daysOver: 4 })).toBe("Overdue by 4 days");
  });
});

describe("reminder window", () => {
  it("from N days before the due date through the due date (common practice)", () => {
    expect(reminderFrom("2026-03-02", 3)).toBe(format(addDays(local("2026-03-02"), -3), "yyyy-MM-dd"));
    expect(reminderDue({ dueOn: "2026-03-02", today: "2026-02-26", daysBefore: 3 })).toBe(false);
    expect(reminderDue({ dueOn: "2026-03-02", today: "2026-02-27", daysBefore: 3 })).toBe(true);
    expect(reminderDue({ dueOn: "2026-03-02", today: "2026-03-02", daysBefore: 3 })).toBe(true);
    expect(reminderDue({ dueOn: "2026-03-02", today: "2026-03-03", daysBefore: 3 })).toBe(false);
  });
});

describe("CSV export cells (RFC 4180 §2; OWASP CSV injection)", () => {
  it("quotes commas, quotes and line breaks; neutralises formula starts", () => {
    expect(csvCell('a,"b"')).toBe('"a,""b"""');
    expect(csvCell("line\nbreak")).toBe('"line\nbreak"');
    expect(csvCell("=HYPERLINK(1)")).toBe("'=HYPERLINK(1)");
    expect(csvCell(-3)).toBe("-3");
    expect(toCsv(["a", "b"], [[1, null]])).toBe("a,b\r\n1,\r\n");
  });
});

describe("meaning of the signature", () => {
  it("names the version and what the signer commits to", () => {
    expect(acknowledgementMeaning({ versionLabel: "2.0", studyCode: "X-1" })).toBe("I have read protocol version 2.0 of study X-1 and will conduct the study in accordance with it.");
  });
});
