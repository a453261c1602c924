import { describe, expect, it } from "vitest";
import { allowedNextStatuses, checkSubjectTransition, subjectStatuses, type SubjectStatus } from "@/lib/subjects/subject-states";

// The subject path is Cairn's own design (DESIGN.md capability 4), not an outside standard.
const allowed: [SubjectStatus, SubjectStatus][] = [
  ["screening", "screen_failed"],
  ["screening", "enrolled"],
  ["enrolled", "implanted"],
  ["implanted", "follow_up"],
  ["follow_up", "completed"],
  ["screening", "withdrawn"],
  ["enrolled", "withdrawn"],
  ["implanted", "withdrawn"],
  ["follow_up", "withdrawn"],
];
const needsReason = (to: SubjectStatus) => to === "screen_failed" || to === "withdrawn";

describe("subject transitions", () => {
  it.each(allowed)("%s → %s is allowed", (from, to) => {
    expect(checkSubjectTransition(from, to, { reason: needsReason(to) ? "Did not meet inclusion criterion 4" : undefined })).toEqual({ ok: true });
  });

  it("every other pair is refused", () => {
    let refused = 0;
    for (const from of subjectStatuses) {
      for (const to of subjectStatuses) {
        if (allowed.some(([f, t]) => f === from && t === to)) continue;
        const r = checkSubjectTransition(from, to, { reason: "x" });
        expect(r.ok, `${from} → ${to}`).toBe(false);
        refused++;
      }
    }
    expect(refused).toBe(7 * 7 - allowed.length);
  });

  it("explains refusals", () => {
    expect(checkSubjectTransition("screening", "implanted")).toMatchObject({ ok: false, code: "not_allowed", message: expect.stringContaining("Screen failed or Enrolled or Withdrawn") });
    expect(checkSubjectTransition("completed", "withdrawn", { reason: "moved" })).toMatchObject({ ok: false, code: "final_status" });
    expect(checkSubjectTransition("screen_failed", "enrolled")).toMatchObject({ ok: false, code: "final_status" });
    expect(checkSubjectTransition("withdrawn", "follow_up")).toMatchObject({ ok: false, code: "final_status" });
    expect(checkSubjectTransition("enrolled", "enrolled")).toMatchObject({ ok: false, code: "same_status" });
    expect(checkSubjectTransition("implanted", "completed")).toMatchObject({ ok: false, code: "not_allowed" });
  });

  it("screen failure and withdrawal need a reason; other steps take none", () => {
    expect(checkSubjectTransition("screening", "screen_failed")).toMatchObject({ ok: false, code: "reason_required" });
    expect(checkSubjectTransition("follow_up", "withdrawn", { reason: "   " })).toMatchObject({ ok: false, code: "reason_required" });
    expect(checkSubjectTransition("enrolled", "implanted", { reason: "because" })).toMatchObject({ ok: false, code: "reason_not_expected" });
  });

  it("lists the next steps", () => {
    expect(allowedNextStatuses("screening")).toEqual(["screen_failed", "enrolled", "withdrawn"]);
    expect(allowedNextStatuses("follow_up")).toEqual(["completed", "withdrawn"]);
    expect(allowedNextStatuses("completed")).toEqual([]);
  });
});
