// Per-site adoption: a version is in force at a site from the date its ethics committee approved
// it there (ICH E6(R3) §2.4.2), the previous one until then — also when the approval is recorded late.
import { and, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { GET as listRoute, POST as recordRoute } from "@/app/api/v1/studies/[studyId]/adoption/route";
import { recordSiteApproval } from "@/server/adoption/record-approval";
import { listVersionsInForceAtSite } from "@/server/protocol/in-force";
import { versionInForceOn } from "@/lib/visits/subject-calendar";
import { auditEvents } from "@/server/db/schema";
import { callRoute } from "../../support/api";
import { createStudyFixture, db, type StudyFixture } from "../../support/db";
import { insertReleasedVersion } from "./support";

let fx: StudyFixture;
let v1: { id: string }, v2: { id: string }, v3: { id: string };
const path = "/api/v1/studies/x/adoption";

beforeAll(async () => {
  fx = await createStudyFixture();
  const author = fx.userByRole.protocol_writer.id;
  v1 = await insertReleasedVersion(fx.study.id, author, { label: "1.0", releasedAt: new Date("2026-01-05T10:00:00Z") });
  v2 = await insertReleasedVersion(fx.study.id, author, { label: "2.0", releasedAt: new Date("2026-03-01T10:00:00Z") });
  v3 = await insertReleasedVersion(fx.study.id, author, { label: "3.0", releasedAt: new Date("2026-06-01T10:00:00Z") });
});

const record = (userId: string, body: Record<string, string>) => callRoute(recordRoute, { method: "POST", path, params: { studyId: fx.study.id }, body, userId });

describe("recording approvals", () => {
  it("the coordinator records an approval with its letter; it is audited", async () => {
    const res = await record(fx.userByRole.coordinator.id, { siteId: fx.siteA.id, versionId: v1.id, approvedOn: "2026-01-20", letterDocumentId: fx.docA.id });
    expect(res.status, JSON.stringify(res.json)).toBe(201);
    const [audit] = await db.select().from(auditEvents).where(and(eq(auditEvents.action, "adoption.recorded"), eq(auditEvents.entityId, res.json.approval.id)));
    expect(audit?.actorId).toBe(fx.userByRole.coordinator.id);
    expect(audit?.siteId).toBe(fx.siteA.id);
  });

  it("a late-recorded approval applies from its approval date", async () => {
    // Approved 15 March, entered on 10 April.
    await db.transaction((tx) =>
      recordSiteApproval(tx, { studyId: fx.study.id, siteId: fx.siteA.id, versionId: v2.id, approvedOn: "2026-03-15", letterDocumentId: fx.docA.id, recordedBy: fx.userByRole.coordinator.id, now: new Date("2026-04-10T08:00:00Z") }),
    );
    await db.transaction((tx) =>
      recordSiteApproval(tx, { studyId: fx.study.id, siteId: fx.siteA.id, versionId: v3.id, approvedOn: "2026-06-20", letterDocumentId: fx.docA.id, recordedBy: fx.userByRole.coordinator.id, now: new Date("2026-06-20T08:00:00Z") }),
    );
    const versions = await listVersionsInForceAtSite(db, { siteId: fx.siteA.id });
    const at = (d: string) => versionInForceOn(versions, d)?.versionId ?? null;
    expect(at("2026-01-19")).toBeNull(); // before any approval
    expect(at("2026-01-20")).toBe(v1.id); // from the approval day itself
    expect(at("2026-03-14")).toBe(v1.id); // 2.0 released, not yet approved here
    expect(at("2026-03-15")).toBe(v2.id); // approved 15 March, though recorded 10 April
    expect(at("2026-04-01")).toBe(v2.id);
    expect(at("2026-06-19")).toBe(v2.id);
    expect(at("2026-06-20")).toBe(v3.id);
    // Site B approved nothing: nothing in force there.
    expect(versionInForceOn(await listVersionsInForceAtSite(db, { siteId: fx.siteB.id }), "2026-06-20")).toBeNull();
  });

  it("the study-wide view shows approvals, the late one flagged, and what is pending", async () => {
    const res = await callRoute(listRoute, { path, params: { studyId: fx.study.id }, userId: fx.userByRole.sponsor_admin.id });
    expect(res.status).toBe(200);
    const a = res.json.sites.find((s: { siteId: string }) => s.siteId === fx.siteA.id);
    const b = res.json.sites.find((s: { siteId: string }) => s.siteId === fx.siteB.id);
    const cell = (row: { cells: { versionId: string }[] }, id: string) => row.cells.find((c) => c.versionId === id) as unknown as { approval: { approvedOn: string; recordedLate: boolean } | null; pending: boolean; inForceToday: boolean };
    expect(cell(a, v2.id).approval).toMatchObject({ approvedOn: "2026-03-15", recordedLate: true });
    expect(cell(a, v3.id).approval).toMatchObject({ approvedOn: "2026-06-20", recordedLate: false });
    expect(cell(a, v3.id).inForceToday).toBe(true);
    expect(a.inForceVersionLabel).toBe("3.0");
    expect([v1, v2, v3].map((v) => cell(b, v.id).pending)).toEqual([true, true, true]);
    // Site A's coordinator sees site A only.
    const own = await callRoute(listRoute, { path, params: { studyId: fx.study.id }, userId: fx.userByRole.coordinator.id });
    expect(own.json.sites.map((s: { siteId: string }) => s.siteId)).toEqual([fx.siteA.id]);
  });

  it("refuses approvals out of release order, twice, in the future, with another site's letter, or for another site", async () => {
    const base = { siteId: fx.siteB.id, letterDocumentId: fx.docB.id };
    expect((await record(fx.siteBPeople.coordinator.id, { ...base, versionId: v2.id, approvedOn: "2026-04-01" })).status).toBe(201);
    const early = await record(fx.siteBPeople.coordinator.id, { ...base, versionId: v3.id, approvedOn: "2026-03-20" });
    expect(early.status).toBe(422);
    expect(early.json.error.message).toContain("2.0");
    const after = await record(fx.siteBPeople.coordinator.id, { ...base, versionId: v1.id, approvedOn: "2026-04-02" });
    expect(after.status).toBe(422);
    expect((await record(fx.siteBPeople.coordinator.id, { ...base, versionId: v2.id, approvedOn: "2026-04-01" })).status).toBe(409);
    expect((await record(fx.siteBPeople.coordinator.id, { ...base, versionId: v3.id, approvedOn: "2099-01-01" })).status).toBe(422);
    expect((await record(fx.siteBPeople.coordinator.id, { ...base, versionId: v3.id, approvedOn: "2026-07-01", letterDocumentId: fx.docA.id })).status).toBe(422);
    expect((await record(fx.userByRole.coordinator.id, { ...base, versionId: v3.id, approvedOn: "2026-07-01" })).status).toBe(404);
    expect((await record(fx.userByRole.investigator.id, { siteId: fx.siteA.id, versionId: v1.id, approvedOn: "2026-07-01", letterDocumentId: fx.docA.id })).status).toBe(403);
  });
});
