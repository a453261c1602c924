import { describe, expect, it } from "vitest";
import { defaultBinderTypes } from "@/lib/binder/default-types";
import { binderTypeInputSchema } from "@/lib/binder/schemas";

describe("default checklist", () => {
  it("passes the API's own validation, with unique codes", () => {
    for (const t of defaultBinderTypes) expect(binderTypeInputSchema.safeParse(t).success, t.code).toBe(true);
    expect(new Set(defaultBinderTypes.map((t) => t.code)).size).toBe(defaultBinderTypes.length);
  });

  it("names a source beside every default; ISO 14155 clause numbers are marked as recalled", () => {
    for (const t of defaultBinderTypes) {
      expect(t.reference, t.code).toMatch(/ICH E6\(R3\)|ISO 14155:2020/);
      if (t.reference.includes("ISO 14155")) expect(t.reference, t.code).toMatch(/ISO 14155:2020 Annex E[^;]*from memory/);
    }
  });

  it("keeps the 3-year GCP renewal as common practice", () => {
    const gcp = defaultBinderTypes.find((t) => t.code === "gcp_training")!;
    expect(gcp).toMatchObject({ expires: true, validityMonths: 36, holder: "person" });
    expect(gcp.reference).toMatch(/3 years is common practice/);
  });

  it("requires before start-up what ICH E6(R3) Appendix C marks as needed before the trial starts", () => {
    // Appendix C (*): signed agreements, financial arrangements, insurance, CVs, trial-specific
    // training, delegation log, signature sheet, normal ranges, laboratory certification.
    for (const code of ["investigator_agreement", "financial_disclosure", "insurance_certificate", "investigator_cv", "gcp_training", "delegation_log", "lab_certification"]) {
      expect(defaultBinderTypes.find((t) => t.code === code)?.requiredFrom, code).toBe("start_up");
    }
  });
});
