import { and, eq, inArray } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { POST as createSubject } from "@/app/api/v1/sites/[siteId]/subjects/route";
import { POST as importSubjects } from "@/app/api/v1/sites/[siteId]/subjects/import/route";
import { GET as getSubject } from "@/app/api/v1/subjects/[subjectId]/route";
import { POST as changeStatus } from "@/app/api/v1/subjects/[subjectId]/status/route";
import { GET as listSubjects } from "@/app/api/v1/studies/[studyId]/subjects/route";
import { auditEvents, subjects, visitRecords } from "@/server/db/schema";
import { callRoute } from "../../support/api";
import { db } from "../../support/db";
import { approveV2, createSubjectsFixture, type SubjectsFixture } from "./subject-fixture";

let fx: SubjectsFixture;
beforeAll(async () => {
  fx = await createSubjectsFixture();
  await approveV2(fx, fx.siteA.id, "2025-04-15");
});

const coordA = () => fx.userByRole.coordinator.id;
const create = (siteId: string, body: unknown, userId = coordA()) => callRoute(createSubject, { method: "POST", params: { siteId }, body, userId });

describe("screening a subject", () => {
  it("numbers the subject at its site and consents it on the version in force that day", async () => {
    const res = await create(fx.siteA.id, { consentDate: "2025-02-03", screeningDate: "2025-02-04" });
    expect(res.status, JSON.stringify(res.json)).toBe(201);
    expect(res.json.subject.code).toBe("TA01-001");
    expect(res.json.subject.status).toBe("screening");
    expect(res.json.subject.consentVersionId).toBe(fx.v1.id);
    const audit = await db.select().from(auditEvents).where(and(eq(auditEvents.entityId, res.json.subject.id), eq(auditEvents.action, "subject.create")));
    expect(audit).toHaveLength(1);
  });

  it("uses the version approved at that site: 2.0 at site A after its approval, still 1.0 at site B", async () => {
    const a = await create(fx.siteA.id, { subjectCode: "TA01-050", consentDate: "2025-05-01" });
    expect(a.json.subject.consentVersionId).toBe(fx.v2.id);
    const dayBefore = await create(fx.siteA.id, { subjectCode: "TA01-051", consentDate: "2025-04-14" });
    expect(dayBefore.json.subject.consentVersionId).toBe(fx.v1.id);
    const b = await create(fx.siteB.id, { subjectCode: "TB01-050", consentDate: "2025-05-01" }, fx.siteBPeople.coordinator.id);
    expect(b.status).toBe(201);
    expect(b.json.subject.consentVersionId).toBe(fx.v1.id);
  });

  it("refuses a consent date before any version was approved at the site", async () => {
    const res = await create(fx.siteA.id, { consentDate: "2025-01-09" });
    expect(res.status).toBe(422);
    expect(res.json.error.fields.consentDate[0]).toMatch(/2025-01-10/);
  });

  it("has no field for a name or a birth date, and refuses codes that look like one", async () => {
    expect((await create(fx.siteA.id, { consentDate: "2025-02-03", name: "Anna Berg" })).status).toBe(400);
    expect((await create(fx.siteA.id, { consentDate: "2025-02-03", dateOfBirth: "1961-04-02" })).status).toBe(400);
    const named = await create(fx.siteA.id, { subjectCode: "Anna Berg", consentDate: "2025-02-03" });
    expect(named.status).toBe(422);
    expect(named.json.error.message).toMatch(/personal name/);
    const other = await create(fx.siteA.id, { subjectCode: "TB01-009", consentDate: "2025-02-03" });
    expect(other.status).toBe(422);
  });
});

describe("the subject path", () => {
  it("enrols, implants with a serial, and withdraws only with a reason", async () => {
    const created = await create(fx.siteA.id, { subjectCode: "TA01-100", consentDate: "2025-02-10" });
    const id = created.json.subject.id as string;
    const step = (body: unknown) => callRoute(changeStatus, { method: "POST", params: { subjectId: id }, body, userId: coordA() });
    expect((await step({ to: "implanted", effectiveOn: "2025-02-20" })).status).toBe(422); // not yet enrolled
    expect((await step({ to: "enrolled", effectiveOn: "2025-02-09" })).status).toBe(422); // before consent
    expect((await step({ to: "enrolled", effectiveOn: "2025-02-17" })).status).toBe(200);
    const noSerial = await step({ to: "implanted", effectiveOn: "2025-03-03" });
    expect(noSerial.status).toBe(422);
    expect(noSerial.json.error.fields.deviceSerial).toBeDefined();
    const implanted = await step({ to: "implanted", effectiveOn: "2025-03-03", deviceSerial: "KV96-000123" });
    expect(implanted.status).toBe(200);
    expect(implanted.json.subject).toMatchObject({ status: "implanted", enrolmentDate: "2025-02-17", implantDate: "2025-03-03", deviceSerial: "KV96-000123" });
    expect((await step({ to: "withdrawn", effectiveOn: "2025-06-01" })).status).toBe(422);
    const withdrawn = await step({ to: "withdrawn", effectiveOn: "2025-06-01", reason: "Moved abroad; consent withdrawn" });
    expect(withdrawn.json.subject).toMatchObject({ status: "withdrawn", endedOn: "2025-06-01", withdrawnReason: "Moved abroad; consent withdrawn" });
    expect((await step({ to: "follow_up" })).status).toBe(409);
    const detail = await callRoute(getSubject, { params: { subjectId: id }, userId: coordA() });
    expect(detail.json.history.map((h: { toStatus: string }) => h.toStatus)).toEqual(["screening", "enrolled", "implanted", "withdrawn"]);
  });
});

describe("site separation", () => {
  it("site A's coordinator cannot list, read or change site B's subjects", async () => {
    const b = await create(fx.siteB.id, { subjectCode: "TB01-200", consentDate: "2025-03-01" }, fx.siteBPeople.coordinator.id);
    const idB = b.json.subject.id as string;
    expect((await callRoute(getSubject, { params: { subjectId: idB }, userId: coordA() })).status).toBe(404);
    expect((await callRoute(changeStatus, { method: "POST", params: { subjectId: idB }, body: { to: "enrolled" }, userId: coordA() })).status).toBe(404);
    expect((await create(fx.siteB.id, { consentDate: "2025-03-01" })).status).toBe(404);
    expect((await callRoute(listSubjects, { params: { studyId: fx.study.id }, query: { siteId: fx.siteB.id }, userId: coordA() })).status).toBe(404);
    const own = await callRoute(listSubjects, { params: { studyId: fx.study.id }, userId: coordA() });
    expect(own.status).toBe(200);
    expect(own.json.subjects.length).toBeGreaterThan(0);
    expect(own.json.subjects.every((s: { siteId: string }) => s.siteId === fx.siteA.id)).toBe(true);
    const sponsor = await callRoute(listSubjects, { params: { studyId: fx.study.id }, userId: fx.userByRole.sponsor_admin.id });
    expect(sponsor.json.subjects.some((s: { id: string }) => s.id === idB)).toBe(true);
  });
});

describe("CSV import", () => {
  const header = "row_type,subject_code,site_code,status,consent_date,screening_date,enrolled_date,implant_date,device_serial,screen_fail_reason,withdrawn_reason,visit_code,visit_date,outcome";
  const run = (csv: string) => callRoute(importSubjects, { method: "POST", params: { siteId: fx.siteA.id }, body: { csv }, userId: coordA() });

  it("imports nothing when one row is bad, and reports that row", async () => {
    const csv = [
      header,
      "subject,TA01-301,TA01,follow_up,2025-02-01,2025-02-02,2025-02-10,2025-02-24,SN-301,,,,,",
      "visit,TA01-301,TA01,,,,,,,,,W1,2025-03-03,done",
      "subject,TA01-302,TA01,enrolled,2025-02-05,,2025-02-31,,,,,,,", // no 31 February
      "subject,TA01-303,TA01,screen_failed,2025-02-06,,,,,Not eligible,,,,",
    ].join("\n");
    const res = await run(csv);
    expect(res.status).toBe(422);
    expect(Object.keys(res.json.error.fields)).toEqual(["row 4 · enrolled_date"]);
    const rows = await db.select().from(subjects).where(and(eq(subjects.studyId, fx.study.id), inArray(subjects.code, ["TA01-301", "TA01-302", "TA01-303"])));
    expect(rows).toHaveLength(0);
  });

  it("refuses a visit code outside the version in force on the visit date (a database check), again importing nothing", async () => {
    const csv = [header, "subject,TA01-311,TA01,follow_up,2025-02-01,,2025-02-10,2025-02-24,SN-311,,,,,", "visit,TA01-311,TA01,,,,,,,,,M9,2025-03-20,done"].join("\n");
    const res = await run(csv);
    expect(res.status).toBe(422);
    expect(res.json.error.fields["row 3 · visit_code"][0]).toMatch(/not in protocol version 1\.0/);
    expect(await db.select().from(subjects).where(and(eq(subjects.studyId, fx.study.id), eq(subjects.code, "TA01-311")))).toHaveLength(0);
  });

  it("imports a good file whole, with its visits and their deviations", async () => {
    const csv = [
      header,
      "subject,TA01-321,TA01,follow_up,2025-02-01,2025-02-02,2025-02-10,2025-02-24,SN-321,,,,,",
      "visit,TA01-321,TA01,,,,,,,,,W1,2025-03-03,done",
      "visit,TA01-321,TA01,,,,,,,,,M1,2025-04-10,done", // window 2025-03-19 … 2025-04-02: 8 days late
      "subject,TA01-322,TA01,screen_failed,2025-02-06,,,,,Not eligible,,,,",
    ].join("\n");
    const res = await run(csv);
    expect(res.status, JSON.stringify(res.json)).toBe(201);
    expect(res.json).toMatchObject({ imported: 2, visits: 2 });
    const [s] = await db.select().from(subjects).where(and(eq(subjects.studyId, fx.study.id), eq(subjects.code, "TA01-321")));
    expect(await db.select().from(visitRecords).where(eq(visitRecords.subjectId, s!.id))).toHaveLength(2);
    const detail = await callRoute(getSubject, { params: { subjectId: s!.id }, userId: coordA() });
    expect(detail.json.deviations).toHaveLength(1);
    expect(detail.json.deviations[0]).toMatchObject({ visitCode: "M1", daysOutside: 8, status: "open" });
  });
});
