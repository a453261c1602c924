import { describe, expect, it } from "vitest";
import { amendmentLabel, compareVersionLabels, nextAmendmentNumber, nextVersionLabel, parseVersionLabel, versionLabelSchema } from "@/lib/protocol/version-label";

// Common practice for protocol versions: original 1.0, substantial amendment → next major (2.0),
// non-substantial → next minor (2.1); amendments numbered in order of release.
describe("version labels", () => {
  it("starts at 1.0 and steps major for substantial, minor for non-substantial", () => {
    expect(nextVersionLabel(null, true)).toBe("1.0");
    expect(nextVersionLabel(null, false)).toBe("1.0");
    expect(nextVersionLabel("1.0", true)).toBe("2.0");
    expect(nextVersionLabel("2.0", false)).toBe("2.1");
    expect(nextVersionLabel("2.1", false)).toBe("2.2");
    expect(nextVersionLabel("2.9", false)).toBe("2.10");
    expect(nextVersionLabel("2.10", true)).toBe("3.0");
  });

  it("orders labels numerically", () => {
    expect(["2.10", "1.0", "2.9", "2.0", "10.0"].sort(compareVersionLabels)).toEqual(["1.0", "2.0", "2.9", "2.10", "10.0"]);
  });

  it("refuses malformed labels with a clear message", () => {
    for (const bad of ["1", "v1.0", "1.0.1", "01.0", "1.", "", "a.b"]) {
      expect(() => parseVersionLabel(bad)).toThrow(/not a version label/);
      expect(versionLabelSchema.safeParse(bad).success).toBe(false);
    }
    expect(parseVersionLabel(" 3.4 ")).toEqual({ major: 3, minor: 4 });
  });

  it("numbers amendments in order, the original having none", () => {
    expect(nextAmendmentNumber(null, 0)).toBeNull();
    expect(nextAmendmentNumber("1.0", 0)).toBe(1);
    expect(nextAmendmentNumber("2.0", 1)).toBe(2);
    expect(() => nextAmendmentNumber("2.0", -1)).toThrow();
    expect(amendmentLabel(null, false)).toBe("Original protocol");
    expect(amendmentLabel(2, true)).toBe("Amendment 2 (substantial)");
    expect(amendmentLabel(3, false)).toBe("Amendment 3 (non-substantial)");
  });
});
