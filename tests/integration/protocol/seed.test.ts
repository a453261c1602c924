// The demo seed's protocol versions: released content bound to its hash, stable visit codes.
import { describe, expect, it } from "vitest";
import { asc, eq } from "drizzle-orm";
import { db } from "../../support/db";
import { protocolVersions, studies } from "@/server/db/schema";
import { hashProtocolContent } from "@/lib/protocol/content-hash";
import { sanitizeProtocolDoc } from "@/lib/protocol/sanitize";
import { visitScheduleSchema } from "@/lib/protocol/visit-schedule";

describe("demo protocol seed", () => {
  it("has 1.0 superseded, 2.0 released, 2.1 in review, each schema-valid", async () => {
    const study = await db.query.studies.findFirst({ where: eq(studies.code, "KESTREL-VP") });
    expect(study).toBeTruthy();
    const versions = await db.select().from(protocolVersions).where(eq(protocolVersions.studyId, study!.id)).orderBy(asc(protocolVersions.versionLabel));
    expect(versions.map((v) => [v.versionLabel, v.state, v.amendmentNumber])).toEqual([
      ["1.0", "superseded", null],
      ["2.0", "released", 1],
      ["2.1", "in_review", 2],
    ]);
    for (const v of versions) {
      // Stored content is exactly what the whitelist keeps (nothing dropped on render).
      expect(sanitizeProtocolDoc(v.content)).toEqual(v.content);
      expect(visitScheduleSchema.safeParse(v.visitSchedule).success).toBe(true);
      if (v.state !== "in_review") expect(v.contentHash).toBe(hashProtocolContent({ doc: v.content, visitSchedule: v.visitSchedule }));
    }
    expect(versions[1]!.visitSchedule.map((v) => v.code)).toEqual(["SCR", "IMP", "W1", "M1", "M3", "M6", "M12", "M18", "M24"]);
    expect(versions[0]!.visitSchedule.map((v) => v.code)).not.toContain("M18");
    expect(versions[1]!.parentId).toBe(versions[0]!.id);
    expect(versions[2]!.summaryOfChanges.every((r) => r.rationale.trim().length > 0)).toBe(true);
  });
});
