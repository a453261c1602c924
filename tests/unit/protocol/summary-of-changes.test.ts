import { describe, expect, it } from "vitest";
import { computeRedline, diffVisitSchedules } from "@/lib/protocol/redline";
import { prefillSummaryOfChanges, rowsMissingRationale, submittedSummaryOfChangesSchema, summaryOfChangesSchema } from "@/lib/protocol/summary-of-changes";
import { v1Doc, v2Doc, visitsV1, visitsV2 } from "./fixtures";

describe("summary of changes", () => {
  const rows = prefillSummaryOfChanges(computeRedline(v1Doc, v2Doc), diffVisitSchedules(visitsV1, visitsV2));

  it("prefills one row per changed section, then one per changed visit, with empty rationales", () => {
    expect(rows.map((r) => r.section)).toEqual(["1 Introduction", "2 Objectives", "3 Visits", "Schedule of visits: M6", "Schedule of visits: M3"]);
    expect(rows[0]).toEqual({
      section: "1 Introduction",
      before: "The implant has 96 electrodes placed on the visual cortex.",
      after: "The implant has 96 electrodes placed on the primary visual cortex.",
      rationale: "",
    });
    expect(rows[1]!.after).toBe("The primary objective is safety at twenty-four months after implantation.\n\nA secondary objective is reading speed with the implant switched on.");
    expect(rows[2]).toMatchObject({ before: "Subjects attend the clinic at each scheduled visit.", after: "" });
    expect(rows[3]).toMatchObject({ before: "", after: "M6 Month 6: day +180 from implant (window −14/+14 days); procedures: Reading test" });
    expect(rows[4]).toMatchObject({
      before: "window before: 7; window after: 7; procedures: Phosphene mapping",
      after: "window before: 14; window after: 14; procedures: Phosphene mapping, Reading test",
    });
    expect(rows.every((r) => r.rationale === "")).toBe(true);
  });

  it("gives no rows when nothing changed", () => {
    expect(prefillSummaryOfChanges(computeRedline(v1Doc, v1Doc), diffVisitSchedules(visitsV1, visitsV1))).toEqual([]);
  });

  it("lists the rows that still lack a rationale", () => {
    const edited = rows.map((r, i) => ({ ...r, rationale: i === 1 ? "Longer follow-up asked by the committee." : i === 2 ? "   " : "" }));
    const missing = rowsMissingRationale(edited);
    expect(missing.map((m) => m.index)).toEqual([0, 2, 3, 4]);
    expect(missing[0]!.message).toBe("Row 1 (1 Introduction): give the rationale of this change.");
    expect(rowsMissingRationale(rows.map((r) => ({ ...r, rationale: "Why." })))).toEqual([]);
  });

  it("accepts drafts without rationale but refuses them at submission", () => {
    expect(summaryOfChangesSchema.safeParse(rows).success).toBe(true);
    const refused = submittedSummaryOfChangesSchema.safeParse(rows);
    expect(refused.success).toBe(false);
    expect(refused.error!.issues[0]!.path).toEqual([0, "rationale"]);
    expect(submittedSummaryOfChangesSchema.safeParse(rows.map((r) => ({ ...r, rationale: "Why." }))).success).toBe(true);
    expect(summaryOfChangesSchema.safeParse([{ section: " ", before: "", after: "", rationale: "" }]).success).toBe(false);
  });
});
