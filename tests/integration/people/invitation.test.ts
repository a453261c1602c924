import { eq, sql } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import * as people from "@/app/api/v1/studies/[studyId]/people/route";
import * as membership from "@/app/api/v1/studies/[studyId]/memberships/[membershipId]/route";
import * as accept from "@/app/api/v1/invitations/accept/route";
import * as me from "@/app/api/v1/me/route";
import { authOptions } from "@/server/auth/options";
import { auditEvents, outboxMessages } from "@/server/db/schema";
import { callRoute } from "../../support/api";
import { createStudyFixture, db, type StudyFixture } from "../../support/db";

let fx: StudyFixture;
beforeAll(async () => {
  fx = await createStudyFixture();
});

type Authorize = (c: Record<string, string>, r: { headers: Record<string, string> }) => Promise<{ id: string } | null>;
const authorize = (authOptions.providers[0] as unknown as { options: { authorize: Authorize } }).options.authorize;

describe("inviting a person", () => {
  it("creates the account, grants the role, queues a link, and the link sets a password once", async () => {
    const email = `invitee.${fx.tag}@test.example`;
    const res = await callRoute(people.POST, {
      method: "POST",
      params: { studyId: fx.study.id },
      body: { email, name: "Ines Invitee", role: "coordinator", siteId: fx.siteA.id },
      userId: fx.userByRole.sponsor_admin.id,
    });
    expect(res.status).toBe(201);
    expect(res.json.invitationSent).toBe(true);

    const [mail] = await db.select().from(outboxMessages).where(eq(outboxMessages.toAddress, email));
    const token = mail?.textBody.match(/\/invitation\/([A-Za-z0-9_-]+)/)?.[1];
    expect(token).toBeTruthy();

    const weak = await callRoute(accept.POST, { method: "POST", body: { token, password: "short" } });
    expect(weak.status).toBe(400);
    expect(weak.json.error.fields.password[0]).toMatch(/12 characters/);

    const ok = await callRoute(accept.POST, { method: "POST", body: { token, password: "a sufficiently long password" } });
    expect(ok.status).toBe(200);
    const again = await callRoute(accept.POST, { method: "POST", body: { token, password: "another long password" } });
    expect(again.status).toBe(410);

    const user = await authorize({ email, password: "a sufficiently long password" }, { headers: {} });
    expect(user?.id).toBe(res.json.userId);
    const profile = await callRoute(me.GET, { userId: user!.id });
    expect(profile.json.memberships).toEqual([{ studyId: fx.study.id, siteId: fx.siteA.id, role: "coordinator" }]);

    const audit = await db.select().from(auditEvents).where(eq(auditEvents.entityId, res.json.membershipId));
    expect(audit.map((a) => a.action)).toContain("person.invited");
  });

  it("refuses an expired link", async () => {
    const email = `late.${fx.tag}@test.example`;
    await callRoute(people.POST, {
      method: "POST",
      params: { studyId: fx.study.id },
      body: { email, name: "Lena Late", role: "monitor", siteId: null },
      userId: fx.userByRole.sponsor_admin.id,
    });
    const [mail] = await db.select().from(outboxMessages).where(eq(outboxMessages.toAddress, email));
    const token = mail!.textBody.match(/\/invitation\/([A-Za-z0-9_-]+)/)![1]!;
    await db.execute(sql`update invitations set expires_at = now() - interval '1 minute' where user_id = (select id from users where email = ${email})`);
    const res = await callRoute(accept.POST, { method: "POST", body: { token, password: "a sufficiently long password" } });
    expect(res.status).toBe(410);
  });

  it("requires a site for a site role, with a clear message", async () => {
    const res = await callRoute(people.POST, {
      method: "POST",
      params: { studyId: fx.study.id },
      body: { email: `nosite.${fx.tag}@test.example`, name: "No Site", role: "investigator", siteId: null },
      userId: fx.userByRole.sponsor_admin.id,
    });
    expect(res.status).toBe(422);
    expect(res.json.error.message).toMatch(/site role/);
  });

  it("stops a revoked role at once", async () => {
    const list = await callRoute(people.GET, { params: { studyId: fx.study.id }, userId: fx.userByRole.sponsor_admin.id });
    const auditorRow = (list.json.people as { membershipId: string; userId: string; role: string }[]).find((p) => p.userId === fx.userByRole.auditor.id)!;
    expect((await callRoute(people.GET, { params: { studyId: fx.study.id }, userId: fx.userByRole.auditor.id })).status).toBe(200);
    const revoked = await callRoute(membership.DELETE, {
      method: "DELETE",
      params: { studyId: fx.study.id, membershipId: auditorRow.membershipId },
      userId: fx.userByRole.sponsor_admin.id,
    });
    expect(revoked.status).toBe(200);
    expect((await callRoute(people.GET, { params: { studyId: fx.study.id }, userId: fx.userByRole.auditor.id })).status).toBe(403);
  });
});
