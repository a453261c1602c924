// Electronic signature of an acknowledgement (21 CFR Part 11 §11.50 printed name / date-time / meaning,
// §11.70 binding to the record, §11.200(a) re-entry of the password) through the real route handler.
import { and, eq, sql } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { POST as signRoute, GET as matrixRoute } from "@/app/api/v1/studies/[studyId]/acknowledgements/route";
import { GET as exportRoute } from "@/app/api/v1/studies/[studyId]/acknowledgements/export/route";
import { GET as pageRoute } from "@/app/api/v1/studies/[studyId]/acknowledgements/signature-page/route";
import { acknowledgementRequests, auditEvents, electronicSignatures, memberships, outboxMessages, signInAttempts, siteVersionApprovals, users } from "@/server/db/schema";
import { notifyVersionReleased } from "@/server/acknowledgements/on-release";
import { requestForJoinedInvestigators } from "@/server/acknowledgements/joined-investigators";
import { callRoute } from "../../support/api";
import { createStudyFixture, db, type StudyFixture } from "../../support/db";
import { PASSWORD, givePassword, insertReleasedVersion, referenceHash } from "./support";

let fx: StudyFixture;
let v1: Awaited<ReturnType<typeof insertReleasedVersion>>;
const path = "/api/v1/studies/x/acknowledgements";

beforeAll(async () => {
  fx = await createStudyFixture();
  v1 = await insertReleasedVersion(fx.study.id, fx.userByRole.protocol_writer.id, { label: "1.0", releasedAt: new Date("2026-11-20T09:00:00Z") });
  await db.transaction((tx) => notifyVersionReleased(tx, { versionId: v1.id }));
  await givePassword(fx.userByRole.investigator.id);
});

const sign = (userId: string, body: Record<string, string>) => callRoute(signRoute, { method: "POST", path, params: { studyId: fx.study.id }, body, userId });
const signatureRows = () => db.select().from(electronicSignatures).where(and(eq(electronicSignatures.versionId, v1.id), eq(electronicSignatures.signerId, fx.userByRole.investigator.id)));

describe("release creates tasks and e-mail", () => {
  it("asks every investigator of every open site, once, with a due date 14 days after the release at the site", async () => {
    const rows = await db.select().from(acknowledgementRequests).where(eq(acknowledgementRequests.versionId, v1.id));
    expect(rows.map((r) => r.userId).sort()).toEqual([fx.userByRole.investigator.id, fx.siteBPeople.investigator.id].sort());
    // Released 2026-11-20 09:00 UTC: 10:00 in Berlin, 18:00 in Tokyo — both on 20 November; + 14 days (study default).
    expect(rows.every((r) => r.dueOn === "2026-12-04")).toBe(true);
    await db.transaction((tx) => notifyVersionReleased(tx, { versionId: v1.id }));
    expect(await db.select().from(acknowledgementRequests).where(eq(acknowledgementRequests.versionId, v1.id))).toHaveLength(2);
    const mail = await db.select().from(outboxMessages).where(eq(outboxMessages.toAddress, fx.userByRole.investigator.email));
    expect(mail).toHaveLength(1);
    expect(mail[0]!.subject).toContain("1.0");
    expect(mail[0]!.textBody).toContain(`/studies/${fx.study.id}/acknowledgements/`);
    expect(mail[0]!.textBody).toContain(`/studies/${fx.study.id}/protocol/${v1.id}`);
  });
});

describe("signing", () => {
  it("refuses a wrong password, records nothing and counts the failure toward the sign-in throttle", async () => {
    const res = await sign(fx.userByRole.investigator.id, { versionId: v1.id, siteId: fx.siteA.id, password: "not my password" });
    expect(res.status).toBe(422);
    expect(res.json.error.fields.password).toBeTruthy();
    expect(await signatureRows()).toHaveLength(0);
    const audits = await db.select().from(auditEvents).where(and(eq(auditEvents.action, "acknowledgement.signed"), eq(auditEvents.actorId, fx.userByRole.investigator.id)));
    expect(audits).toHaveLength(0);
    // The refusal itself is on the audit trail (21 CFR Part 11 §11.300(d) as the model, from memory: attempted misuse is reported).
    const refused = await db.select().from(auditEvents).where(and(eq(auditEvents.action, "acknowledgement.sign_refused"), eq(auditEvents.actorId, fx.userByRole.investigator.id)));
    expect(refused).toHaveLength(1);
    const failures = await db.select().from(signInAttempts).where(and(eq(signInAttempts.email, fx.userByRole.investigator.email), eq(signInAttempts.succeeded, false)));
    expect(failures).toHaveLength(1);
  });

  it("with the right password records name, user, role, site, UTC and site time, meaning, version and the released hash", async () => {
    const before = Date.now();
    const res = await sign(fx.userByRole.investigator.id, { versionId: v1.id, siteId: fx.siteA.id, password: PASSWORD });
    expect(res.status, JSON.stringify(res.json)).toBe(201);
    const [s] = await signatureRows();
    expect(s).toBeDefined();
    expect(s!.printedName).toBe(fx.userByRole.investigator.name);
    expect(s!.signerId).toBe(fx.userByRole.investigator.id);
    expect(s!.role).toBe("investigator");
    expect(s!.siteId).toBe(fx.siteA.id);
    expect(s!.siteCode).toBe(fx.siteA.code);
    expect(s!.versionId).toBe(v1.id);
    expect(s!.meaning).toBe(`I have read protocol version 1.0 of study ${fx.study.code} and will conduct the study in accordance with it.`);
    expect(s!.signedAt.getTime()).toBeGreaterThanOrEqual(before - 1000);
    expect(s!.siteTimeZone).toBe("Europe/Berlin");
    // Site time: the same instant in Berlin (CET, +01:00 in December), written with its offset.
    const berlin = new Intl.DateTimeFormat("sv-SE", { timeZone: "Europe/Berlin", dateStyle: "short", timeStyle: "medium" }).format(s!.signedAt);
    expect(s!.signedAtSiteLocal).toBe(`${berlin} +01:00`);
    // Hash signed = hash stored at release = SHA-256 of canonical JSON computed with the canonicalize package.
    expect(s!.contentHash).toBe(v1.contentHash);
    expect(s!.contentHash).toBe(referenceHash(v1.content, v1.visitSchedule));
    const [audit] = await db.select().from(auditEvents).where(and(eq(auditEvents.action, "acknowledgement.signed"), eq(auditEvents.entityId, s!.id)));
    expect(audit?.actorId).toBe(fx.userByRole.investigator.id);
    expect((audit?.after as { contentHash: string }).contentHash).toBe(v1.contentHash);
  });

  it("refuses a second acknowledgement of the same version by the same person", async () => {
    const res = await sign(fx.userByRole.investigator.id, { versionId: v1.id, siteId: fx.siteA.id, password: PASSWORD });
    expect(res.status).toBe(409);
    expect(await signatureRows()).toHaveLength(1);
  });

  it("cannot be edited or deleted", async () => {
    const [s] = await signatureRows();
    await expect(db.execute(sql`update electronic_signatures set printed_name = 'Someone else' where id = ${s!.id}`)).rejects.toThrow();
    await expect(db.execute(sql`delete from electronic_signatures where id = ${s!.id}`)).rejects.toThrow();
    expect((await signatureRows())[0]!.printedName).toBe(fx.userByRole.investigator.name);
  });

  it("an investigator of site A cannot acknowledge for site B", async () => {
    const res = await sign(fx.userByRole.investigator.id, { versionId: v1.id, siteId: fx.siteB.id, password: PASSWORD });
    expect(res.status).toBe(404);
  });

  it("blocks signing after five wrong passwords within the throttle window, even with the right one", async () => {
    const [u] = await db.insert(users).values({ email: `throttle.${fx.tag}@test.example`, name: "Throttle Tester" }).returning();
    await db.insert(memberships).values({ userId: u!.id, studyId: fx.study.id, siteId: fx.siteA.id, role: "investigator" });
    await givePassword(u!.id);
    await db.transaction((tx) => requestForJoinedInvestigators(tx, { now: new Date(), studyId: fx.study.id }));
    // No version is in force at site A yet (no approval), so no task was made: add one through a release of 1.1.
    const v11 = await insertReleasedVersion(fx.study.id, fx.userByRole.protocol_writer.id, { label: "1.1", releasedAt: new Date() });
    await db.transaction((tx) => notifyVersionReleased(tx, { versionId: v11.id }));
    for (let i = 0; i < 5; i++) expect((await sign(u!.id, { versionId: v11.id, siteId: fx.siteA.id, password: `wrong ${i}` })).status).toBe(422);
    const res = await sign(u!.id, { versionId: v11.id, siteId: fx.siteA.id, password: PASSWORD });
    expect(res.status).toBe(429);
  });
});

describe("compliance matrix", () => {
  it("shows the signature, and an investigator of site A sees no site B rows", async () => {
    const res = await callRoute(matrixRoute, { path, params: { studyId: fx.study.id }, query: { versionId: v1.id }, userId: fx.userByRole.investigator.id });
    expect(res.status).toBe(200);
    expect(res.json.rows.every((r: { siteId: string }) => r.siteId === fx.siteA.id)).toBe(true);
    const mine = res.json.rows.find((r: { userId: string }) => r.userId === fx.userByRole.investigator.id);
    expect(mine.status.state).toBe("acknowledged");
    const b = await callRoute(matrixRoute, { path, params: { studyId: fx.study.id }, query: { siteId: fx.siteB.id }, userId: fx.userByRole.investigator.id });
    expect(b.status).toBe(404);
  });

  it("the sponsor sees every site, filters by state, and exports CSV", async () => {
    const all = await callRoute(matrixRoute, { path, params: { studyId: fx.study.id }, query: { versionId: v1.id }, userId: fx.userByRole.sponsor_admin.id });
    expect(all.json.rows.map((r: { siteId: string }) => r.siteId).sort()).toEqual([fx.siteA.id, fx.siteB.id].sort());
    const pending = await callRoute(matrixRoute, { path, params: { studyId: fx.study.id }, query: { versionId: v1.id, state: "pending" }, userId: fx.userByRole.sponsor_admin.id });
    expect(pending.json.rows.map((r: { userId: string }) => r.userId)).toEqual([fx.siteBPeople.investigator.id]);
    const csv = await callRoute(exportRoute, { path, params: { studyId: fx.study.id }, query: { versionId: v1.id }, userId: fx.userByRole.sponsor_admin.id });
    expect(csv.status).toBe(200);
    expect(csv.headers.get("content-type")).toContain("text/csv");
    const lines = (csv.json as string).trim().split("\r\n");
    expect(lines).toHaveLength(3);
    expect(lines.some((l) => l.includes(fx.userByRole.investigator.email) && l.includes("acknowledged") && l.includes(v1.contentHash!))).toBe(true);
  });

  it("prints a signature page PDF for the version and site", async () => {
    const res = await callRoute(pageRoute, { path, params: { studyId: fx.study.id }, query: { versionId: v1.id, siteId: fx.siteA.id }, userId: fx.userByRole.auditor.id });
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toBe("application/pdf");
    expect(String(res.json).startsWith("%PDF-")).toBe(true);
  });
});

describe("later versions and later investigators", () => {
  it("the next release links the redline against the version last acknowledged", async () => {
    const v2 = await insertReleasedVersion(fx.study.id, fx.userByRole.protocol_writer.id, { label: "2.0", releasedAt: new Date(), parentId: v1.id });
    await db.transaction((tx) => notifyVersionReleased(tx, { versionId: v2.id }));
    const [req] = await db.select().from(acknowledgementRequests).where(and(eq(acknowledgementRequests.versionId, v2.id), eq(acknowledgementRequests.userId, fx.userByRole.investigator.id)));
    expect(req?.compareToVersionId).toBe(v1.id);
    const [mail] = await db.select().from(outboxMessages).where(eq(outboxMessages.dedupeKey, `ack-request:${req!.id}`));
    expect(mail?.textBody).toContain(`/studies/${fx.study.id}/protocol/compare?from=${v1.id}&to=${v2.id}`);
    // Site B's investigator never acknowledged: the link compares with the version 2.0 amends.
    const [reqB] = await db.select().from(acknowledgementRequests).where(and(eq(acknowledgementRequests.versionId, v2.id), eq(acknowledgementRequests.userId, fx.siteBPeople.investigator.id)));
    expect(reqB?.compareToVersionId).toBeNull();
    const [mailB] = await db.select().from(outboxMessages).where(eq(outboxMessages.dedupeKey, `ack-request:${reqB!.id}`));
    expect(mailB?.textBody).toContain("the version this one amends");
    expect(mailB?.textBody).toContain(`compare?from=${v1.id}&to=${v2.id}`);
  });

  it("an investigator who joins a site later is asked for the version in force there", async () => {
    // Site B approved 1.0 only: 1.0 is in force there, whatever has been released since.
    await db.insert(siteVersionApprovals).values({ siteId: fx.siteB.id, versionId: v1.id, approvedOn: "2026-11-25", letterDocumentId: fx.docB.id });
    const [u] = await db.insert(users).values({ email: `joined.${fx.tag}@test.example`, name: "Joined Later" }).returning();
    await db.insert(memberships).values({ userId: u!.id, studyId: fx.study.id, siteId: fx.siteB.id, role: "investigator" });
    const now = new Date();
    await db.transaction((tx) => requestForJoinedInvestigators(tx, { now, studyId: fx.study.id }));
    await db.transaction((tx) => requestForJoinedInvestigators(tx, { now, studyId: fx.study.id }));
    const rows = await db.select().from(acknowledgementRequests).where(eq(acknowledgementRequests.userId, u!.id));
    expect(rows).toHaveLength(1);
    expect(rows[0]!.versionId).toBe(v1.id);
    expect(rows[0]!.reason).toBe("joined");
  });
});
