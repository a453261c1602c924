import { eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { POST as createSiteRoute } from "@/app/api/v1/studies/[studyId]/sites/route";
import { GET as getSiteRoute, PATCH as updateSiteRoute } from "@/app/api/v1/sites/[siteId]/route";
import { POST as statusRoute } from "@/app/api/v1/sites/[siteId]/status/route";
import { GET as enrolmentRoute } from "@/app/api/v1/studies/[studyId]/enrolment/route";
import { auditEvents, binderDocumentTypes } from "@/server/db/schema";
import { todayAtSite } from "@/server/sites/site-today";
import { listDocumentTypes } from "@/server/binder/document-types";
import { callRoute } from "../../support/api";
import { db } from "../../support/db";
import { createSubjectsFixture, insertSubject, type SubjectsFixture } from "../subjects/subject-fixture";

let fx: SubjectsFixture;
beforeAll(async () => {
  fx = await createSubjectsFixture();
});

const newSite = { code: "FR02", name: "Invented Eye Clinic", country: "fr", timeZone: "Europe/Paris", currency: "eur", targetEnrolment: 6, contacts: [{ name: "Study desk", role: "Coordinator", email: "desk@clinic.example" }] };

describe("sites", () => {
  it("creates a site as Proposed, edits it, and walks it through the lifecycle with dates and actors", async () => {
    const admin = fx.userByRole.sponsor_admin.id;
    const created = await callRoute(createSiteRoute, { method: "POST", params: { studyId: fx.study.id }, body: newSite, userId: admin });
    expect(created.status, JSON.stringify(created.json)).toBe(201);
    expect(created.json.site).toMatchObject({ code: "FR02", country: "FR", currency: "EUR", status: "proposed" });
    const siteId = created.json.site.id as string;
    expect((await callRoute(createSiteRoute, { method: "POST", params: { studyId: fx.study.id }, body: newSite, userId: admin })).status).toBe(409);
    expect((await callRoute(createSiteRoute, { method: "POST", params: { studyId: fx.study.id }, body: { ...newSite, code: "CLINIC", timeZone: "Mars/Olympus" }, userId: admin })).status).toBe(400);

    const edited = await callRoute(updateSiteRoute, { method: "PATCH", params: { siteId }, body: { targetEnrolment: 9 }, userId: admin });
    expect(edited.json.site.targetEnrolment).toBe(9);

    const step = (to: string, effectiveOn?: string) => callRoute(statusRoute, { method: "POST", params: { siteId }, body: { to, effectiveOn }, userId: admin });
    const skip = await step("open");
    expect(skip.status).toBe(422);
    expect(skip.json.error.message).toMatch(/only move to Start-up/);
    const today = todayAtSite("Europe/Paris");
    expect((await step("start_up", "2099-01-01")).status).toBe(422);
    expect((await step("start_up", today)).status).toBe(200);
    // The default essential-documents checklist gates Open (tested in full in tests/integration/binder);
    // this study then retires every type so the rest of the lifecycle can be walked.
    const gated = await step("open");
    expect(gated.status).toBe(422);
    expect(gated.json.error.message).toContain("essential documents");
    await listDocumentTypes(db, { studyId: fx.study.id }); // installs the defaults (the refused step rolled back)
    await db.update(binderDocumentTypes).set({ retiredAt: new Date() }).where(eq(binderDocumentTypes.studyId, fx.study.id));
    expect((await step("open")).status).toBe(200);
    expect((await step("enrolment_closed")).status).toBe(200);
    expect((await step("closed_out")).status).toBe(200);
    expect((await step("closed_out")).status).toBe(409);

    const detail = await callRoute(getSiteRoute, { params: { siteId }, userId: fx.userByRole.auditor.id });
    expect(detail.json.history.map((h: { toStatus: string }) => h.toStatus)).toEqual(["proposed", "start_up", "open", "enrolment_closed", "closed_out"]);
    expect(detail.json.history.every((h: { actorName: string; effectiveOn: string }) => h.actorName === fx.userByRole.sponsor_admin.name && h.effectiveOn === today)).toBe(true);
    const trail = await db.select({ action: auditEvents.action }).from(auditEvents).where(eq(auditEvents.entityId, siteId));
    expect(trail.map((t) => t.action)).toEqual(["site.create", "site.update", "site.status_change", "site.status_change", "site.status_change", "site.status_change"]);
  });

  it("only the sponsor administrator manages sites", async () => {
    const res = await callRoute(statusRoute, { method: "POST", params: { siteId: fx.siteA.id }, body: { to: "enrolment_closed" }, userId: fx.userByRole.coordinator.id });
    expect(res.status).toBe(403);
  });

  it("counts enrolment against target per site, limited to the caller's sites", async () => {
    await insertSubject(fx, { siteId: fx.siteA.id, code: "TA01-501", enrolmentDate: "2025-02-20", implantDate: "2025-03-03" });
    await insertSubject(fx, { siteId: fx.siteA.id, code: "TA01-502", status: "screen_failed" });
    await insertSubject(fx, { siteId: fx.siteB.id, code: "TB01-501", enrolmentDate: "2025-02-20" });
    const sponsor = await callRoute(enrolmentRoute, { params: { studyId: fx.study.id }, userId: fx.userByRole.sponsor_admin.id });
    const a = sponsor.json.sites.find((s: { siteId: string }) => s.siteId === fx.siteA.id);
    expect(a).toMatchObject({ screened: 2, screenFailed: 1, enrolled: 1, implanted: 1 });
    const coordB = await callRoute(enrolmentRoute, { params: { studyId: fx.study.id }, userId: fx.siteBPeople.coordinator.id });
    expect(coordB.json.sites.map((s: { siteId: string }) => s.siteId)).toEqual([fx.siteB.id]);
  });
});
