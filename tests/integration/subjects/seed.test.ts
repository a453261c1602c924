import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { sites, studies, subjects } from "@/server/db/schema";
import { listVersionsInForceAtSites } from "@/server/protocol/in-force";
import { versionInForceOn } from "@/lib/visits/subject-calendar";
import { db } from "../../support/db";

// The seeded demo (npm test seeds it before the tests run).
describe("demo subjects", () => {
  it("has about 60 subjects at every stage, each consented on the version in force at its site that day", async () => {
    const [study] = await db.select().from(studies).where(eq(studies.code, "KESTREL-VP"));
    const rows = await db.select({ s: subjects, siteCode: sites.code }).from(subjects).innerJoin(sites, eq(sites.id, subjects.siteId)).where(eq(subjects.studyId, study!.id));
    expect(rows.length).toBeGreaterThanOrEqual(50);
    expect(rows.length).toBeLessThanOrEqual(70);
    const statuses = new Set(rows.map((r) => r.s.status));
    for (const s of ["screening", "screen_failed", "enrolled", "follow_up", "withdrawn"]) expect(statuses, s).toContain(s);
    const versions = await listVersionsInForceAtSites(db, { siteIds: [...new Set(rows.map((r) => r.s.siteId))] });
    for (const { s } of rows) expect(versionInForceOn(versions.get(s.siteId)!, s.consentDate)?.versionId, s.code).toBe(s.consentVersionId);
    expect(rows.every((r) => r.s.code.startsWith(`${r.siteCode}-`))).toBe(true);
  });
});
