// A study fixture with valid site codes, two released protocol versions and site approvals, for the
// subjects, visits and sites tests. Every study is new, so codes only need to be unique within it.
import { randomUUID } from "node:crypto";
import { eq } from "drizzle-orm";
import { createStudyFixture, db, type StudyFixture } from "../../support/db";
import { protocolVersions, sites, siteVersionApprovals, subjects, subjectStatusEvents } from "@/server/db/schema";
import type { VisitSchedule } from "@/lib/protocol/visit-schedule";
import type { SubjectStatus } from "@/lib/subjects/subject-states";

export const scheduleV1: VisitSchedule = [
  { code: "SCR", label: "Screening", anchor: "consent", dayOffset: 0, windowBefore: 0, windowAfter: 28, procedures: [] },
  { code: "W1", label: "Week 1", anchor: "implant", dayOffset: 7, windowBefore: 3, windowAfter: 3, procedures: [] },
  { code: "M1", label: "Month 1", anchor: "implant", dayOffset: 30, windowBefore: 7, windowAfter: 7, procedures: [] },
  { code: "M3", label: "Month 3", anchor: "implant", dayOffset: 90, windowBefore: 14, windowAfter: 14, procedures: [] },
  { code: "M6", label: "Month 6", anchor: "implant", dayOffset: 182, windowBefore: 14, windowAfter: 14, procedures: [] },
];
// Version 2: Month 3 moves to day 91 with a wider window, Month 6 to ±30, and a Month 9 visit is added.
export const scheduleV2: VisitSchedule = [
  ...scheduleV1.slice(0, 3),
  { code: "M3", label: "Month 3", anchor: "implant", dayOffset: 91, windowBefore: 21, windowAfter: 21, procedures: [] },
  { code: "M6", label: "Month 6", anchor: "implant", dayOffset: 182, windowBefore: 30, windowAfter: 30, procedures: [] },
  { code: "M9", label: "Month 9", anchor: "implant", dayOffset: 273, windowBefore: 30, windowAfter: 30, procedures: [] },
];

async function insertVersion(fx: StudyFixture, label: string, state: "released" | "superseded", schedule: VisitSchedule) {
  const [row] = await db
    .insert(protocolVersions)
    .values({
      id: randomUUID(),
      studyId: fx.study.id,
      versionLabel: label,
      state,
      title: "Clinical investigation plan",
      content: { type: "doc", content: [] },
      visitSchedule: schedule,
      authorId: fx.userByRole.protocol_writer.id,
      releasedAt: new Date(label === "1.0" ? "2025-01-02T10:00:00Z" : "2025-04-01T10:00:00Z"),
      contentHash: "0".repeat(64),
    })
    .returning();
  return row!;
}

export async function createSubjectsFixture() {
  const fx = await createStudyFixture();
  // The shared fixture's site codes are random; subject codes need codes such as "TA01".
  await db.update(sites).set({ code: "TA01" }).where(eq(sites.id, fx.siteA.id));
  await db.update(sites).set({ code: "TB01" }).where(eq(sites.id, fx.siteB.id));
  fx.siteA.code = "TA01";
  fx.siteB.code = "TB01";
  const v1 = await insertVersion(fx, "1.0", "superseded", scheduleV1);
  const v2 = await insertVersion(fx, "2.0", "released", scheduleV2);
  await db.insert(siteVersionApprovals).values([
    { siteId: fx.siteA.id, versionId: v1.id, approvedOn: "2025-01-10" },
    { siteId: fx.siteB.id, versionId: v1.id, approvedOn: "2025-01-20" },
  ]);
  return { ...fx, v1, v2 };
}
export type SubjectsFixture = Awaited<ReturnType<typeof createSubjectsFixture>>;

/** Approves version 2 at a site from a date (its ethics committee's approval). */
export async function approveV2(fx: SubjectsFixture, siteId: string, approvedOn: string) {
  await db.insert(siteVersionApprovals).values({ siteId, versionId: fx.v2.id, approvedOn });
}

/** A subject inserted straight into the database (the API paths have their own tests). */
export async function insertSubject(
  fx: SubjectsFixture,
  o: { siteId: string; code: string; status?: SubjectStatus; consentDate?: string; enrolmentDate?: string | null; implantDate?: string | null },
) {
  const status = o.status ?? (o.implantDate ? "follow_up" : o.enrolmentDate ? "enrolled" : "screening");
  const [row] = await db
    .insert(subjects)
    .values({
      studyId: fx.study.id,
      siteId: o.siteId,
      code: o.code,
      status,
      consentDate: o.consentDate ?? "2025-02-01",
      consentVersionId: fx.v1.id,
      enrolmentDate: o.enrolmentDate ?? null,
      implantDate: o.implantDate ?? null,
      deviceSerial: o.implantDate ? `SN-${o.code}` : null,
    })
    .returning();
  await db.insert(subjectStatusEvents).values({ subjectId: row!.id, toStatus: status, effectiveOn: o.consentDate ?? "2025-02-01" });
  return row!;
}
