// Protocol versions through the API: new draft from the version in force, saves with a base
// revision, and every workflow step by role (author ≠ approver/releaser), each in the audit trail.
import { beforeAll, describe, expect, it } from "vitest";
import { and, eq } from "drizzle-orm";
import { acknowledgementRequests, auditEvents, memberships, protocolVersions, users } from "@/server/db/schema";
import canonicalize from "canonicalize";
import { hashProtocolContent } from "@/lib/protocol/content-hash";
import { callRoute } from "../../support/api";
import { createStudyFixture, db, type StudyFixture } from "../../support/db";
import * as versionsRoute from "@/app/api/v1/studies/[studyId]/protocol/versions/route";
import * as versionRoute from "@/app/api/v1/protocol-versions/[versionId]/route";
import * as submitRoute from "@/app/api/v1/protocol-versions/[versionId]/submit/route";
import * as returnRoute from "@/app/api/v1/protocol-versions/[versionId]/return/route";
import * as reopenRoute from "@/app/api/v1/protocol-versions/[versionId]/reopen/route";
import * as approveRoute from "@/app/api/v1/protocol-versions/[versionId]/approve/route";
import * as releaseRoute from "@/app/api/v1/protocol-versions/[versionId]/release/route";
import { baseSchedule, docOf, insertVersion } from "./protocol-fixture";
import { protocolStatuses } from "@/lib/protocol/workflow";
import { createHash } from "node:crypto";

const actions = { submit: submitRoute.POST, return: returnRoute.POST, reopen: reopenRoute.POST, approve: approveRoute.POST, release: releaseRoute.POST } as const;
type Action = keyof typeof actions;

let fx: StudyFixture;
let authorReviewer: { id: string };
beforeAll(async () => {
  fx = await createStudyFixture();
  // A person who is both writer and reviewer: may review others' versions, never approve their own.
  const [u] = await db.insert(users).values({ email: `both.${fx.tag}@test.example`, name: "Writer-Reviewer" }).returning();
  await db.insert(memberships).values([
    { userId: u!.id, studyId: fx.study.id, siteId: null, role: "protocol_writer" },
    { userId: u!.id, studyId: fx.study.id, siteId: null, role: "medical_reviewer" },
  ]);
  authorReviewer = u!;
});

const step = (action: Action, versionId: string, userId: string, comment?: string) =>
  callRoute(actions[action], { method: "POST", params: { versionId }, body: comment ? { comment } : {}, userId });
const save = (versionId: string, userId: string, body: Record<string, unknown>) => callRoute(versionRoute.PUT, { method: "PUT", params: { versionId }, body, userId });
const read = async (versionId: string) => (await db.select().from(protocolVersions).where(eq(protocolVersions.id, versionId)))[0]!;

describe("every transition by role", () => {
  // The workflow's table, written out: (state, action) pairs that exist, and who may take them.
  const allowed: Record<string, Partial<Record<Action, ("writer" | "reviewer" | "authorReviewer")[]>>> = {
    draft: { submit: ["writer", "authorReviewer"] },
    in_review: { return: ["reviewer", "authorReviewer"], approve: ["reviewer"] },
    returned: { reopen: ["writer", "authorReviewer"] },
    approved: { release: ["reviewer"] },
    released: {},
    superseded: {},
  };
  const people = () => ({
    writer: fx.userByRole.protocol_writer.id,
    reviewer: fx.userByRole.medical_reviewer.id,
    authorReviewer: authorReviewer.id,
    admin: fx.userByRole.sponsor_admin.id,
    investigator: fx.userByRole.investigator.id,
  });
  let n = 0;
  for (const state of protocolStatuses)
    for (const action of Object.keys(actions) as Action[])
      for (const who of ["writer", "reviewer", "authorReviewer", "admin", "investigator"] as const) {
        const ok = (allowed[state]![action] ?? []).includes(who as never);
        it(`${state} → ${action} by ${who}: ${ok ? "allowed" : "refused"}`, async () => {
          // The author is the writer-reviewer, so "author cannot approve/release" is exercised by them.
          const v = await insertVersion(fx, {
            label: `9.${++n}`,
            state,
            authorId: authorReviewer.id,
            parentId: null,
            content: docOf(`Text ${n}`),
          });
          const res = await step(action, v.id, people()[who], "Please clarify section 1.");
          if (ok) {
            expect(res.status, JSON.stringify(res.json)).toBe(200);
          } else {
            expect(res.status, JSON.stringify(res.json)).toBeGreaterThanOrEqual(400);
            expect(res.status).toBeLessThan(500);
            expect((await read(v.id)).state).toBe(state);
          }
          if (who === "authorReviewer" && (action === "approve" || action === "release") && ((state === "in_review" && action === "approve") || (state === "approved" && action === "release"))) {
            expect(res.status).toBe(403);
            expect(res.json.error.message).toMatch(/You wrote this version/);
          }
        });
      }
});

describe("a new version, end to end", () => {
  let fy: StudyFixture;
  let releasedId: string;
  let draftId: string;
  beforeAll(async () => {
    fy = await createStudyFixture(); // a fresh study: nothing open yet
    const v1 = await insertVersion(fy, { label: "1.0", state: "released", content: docOf("Subjects are followed for 24 months."), visitSchedule: baseSchedule });
    releasedId = v1.id;
  });

  it("refuses a draft to anyone but a writer", async () => {
    const res = await callRoute(versionsRoute.POST, { method: "POST", params: { studyId: fy.study.id }, body: { substantial: true }, userId: fy.userByRole.medical_reviewer.id });
    expect(res.status).toBe(403);
  });

  it("starts a draft as a copy of the version in force, labelled and numbered", async () => {
    const res = await callRoute(versionsRoute.POST, { method: "POST", params: { studyId: fy.study.id }, body: { substantial: true }, userId: fy.userByRole.protocol_writer.id });
    expect(res.status, JSON.stringify(res.json)).toBe(201);
    draftId = res.json.version.id;
    const row = await read(draftId);
    const parent = await read(releasedId);
    expect(row).toMatchObject({ versionLabel: "2.0", amendmentNumber: 1, parentId: releasedId, state: "draft", revision: 1 });
    expect(row.content).toEqual(parent.content);
    expect(row.visitSchedule).toEqual(parent.visitSchedule);
    const again = await callRoute(versionsRoute.POST, { method: "POST", params: { studyId: fy.study.id }, body: { substantial: false }, userId: fy.userByRole.protocol_writer.id });
    expect(again.status).toBe(409);
  });

  it("relabels 2.0 → 1.1 when the amendment is marked non-substantial, and back", async () => {
    let res = await save(draftId, fy.userByRole.protocol_writer.id, { baseRevision: 1, substantial: false });
    expect(res.json.version.versionLabel).toBe("1.1");
    res = await save(draftId, fy.userByRole.protocol_writer.id, { baseRevision: 2, substantial: true });
    expect(res.json.version).toMatchObject({ versionLabel: "2.0", revision: 3 });
  });

  it("stores content through the whitelist", async () => {
    const content = { type: "doc", content: [{ type: "paragraph", content: [{ type: "text", text: "x", marks: [{ type: "link", attrs: { href: "javascript:alert(1)" } }] }] }, { type: "script", text: "alert(1)" }] };
    const res = await save(draftId, fy.userByRole.protocol_writer.id, { baseRevision: 3, content });
    expect(res.status).toBe(200);
    expect((await read(draftId)).content).toEqual({ type: "doc", content: [{ type: "paragraph", content: [{ type: "text", text: "x" }] }] });
  });

  it("refuses to submit without a rationale for each change, then submits", async () => {
    const w = fy.userByRole.protocol_writer.id;
    let rev = (await read(draftId)).revision;
    const schedule = [...baseSchedule, { code: "M18", label: "Month 18", anchor: "implant" as const, dayOffset: 547, windowBefore: 30, windowAfter: 30, procedures: ["Visual function battery"] }];
    let res = await save(draftId, w, { baseRevision: rev, content: docOf("Subjects are followed for 36 months."), visitSchedule: schedule });
    rev = res.json.version.revision;
    res = await step("submit", draftId, w);
    expect(res.status).toBe(422);
    expect(Object.keys(res.json.error.fields)).toEqual(expect.arrayContaining(["substantialReason", "summaryOfChanges"]));
    res = await save(draftId, w, {
      baseRevision: rev,
      substantialReason: "Longer follow-up and a new visit",
      summaryOfChanges: [
        { section: "1 Design", before: "24 months", after: "36 months", rationale: "" },
        { section: "Schedule of visits: M18", before: "", after: "M18", rationale: "Late effects" },
      ],
    });
    rev = res.json.version.revision;
    res = await step("submit", draftId, w);
    expect(res.status).toBe(422);
    expect(res.json.error.fields).toHaveProperty("summaryOfChanges.0.rationale");
    await save(draftId, w, { baseRevision: rev, summaryOfChanges: [{ section: "1 Design", before: "24 months", after: "36 months", rationale: "Longer safety follow-up" }, { section: "Schedule of visits: M18", before: "", after: "M18", rationale: "Late effects" }] });
    res = await step("submit", draftId, w);
    expect(res.status, JSON.stringify(res.json)).toBe(200);
    expect((await read(draftId)).state).toBe("in_review");
  });

  it("is read-only in review; the reviewer returns it with a comment; the writer reopens and resubmits", async () => {
    const w = fy.userByRole.protocol_writer.id;
    const r = fy.userByRole.medical_reviewer.id;
    const v = await read(draftId);
    expect((await save(draftId, w, { baseRevision: v.revision, substantialReason: "x" })).status).toBe(422);
    expect((await step("return", draftId, r)).status).toBe(422); // a return needs comments
    expect((await step("return", draftId, r, "Who assesses a new MRI finding?")).status).toBe(200);
    expect((await read(draftId)).reviewComments.map((c) => c.text)).toEqual(["Who assesses a new MRI finding?"]);
    expect((await step("reopen", draftId, w)).status).toBe(200);
    expect((await step("submit", draftId, w)).status).toBe(200);
  });

  it("approves and releases: hash stored, parent superseded, content frozen, every step audited", async () => {
    const r = fy.userByRole.medical_reviewer.id;
    expect((await step("release", draftId, r)).status).toBe(409); // not approved yet
    expect((await step("approve", draftId, fy.userByRole.protocol_writer.id)).status).toBe(403);
    expect((await step("approve", draftId, r)).status).toBe(200);
    expect((await step("release", draftId, r)).status).toBe(200);
    const v = await read(draftId);
    expect(v.state).toBe("released");
    expect(v.contentHash).toBe(hashProtocolContent({ doc: v.content, visitSchedule: v.visitSchedule }));
    // Independent check: SHA-256 of the `canonicalize` package's RFC 8785 output.
    expect(v.contentHash).toBe(createHash("sha256").update(canonicalize({ doc: v.content, visitSchedule: v.visitSchedule })!).digest("hex"));
    expect((await read(releasedId)).state).toBe("superseded");
    expect((await save(draftId, fy.userByRole.protocol_writer.id, { baseRevision: v.revision, substantialReason: "late edit" })).status).toBe(422);
    const trail = await db
      .select({ action: auditEvents.action })
      .from(auditEvents)
      .where(and(eq(auditEvents.entityType, "protocol_version"), eq(auditEvents.entityId, draftId)))
      .orderBy(auditEvents.id);
    const steps = trail.map((t) => t.action).filter((a) => a !== "protocol_version.save");
    expect(steps).toEqual([
      "protocol_version.create",
      "protocol_version.submit",
      "protocol_version.return",
      "protocol_version.reopen",
      "protocol_version.submit",
      "protocol_version.approve",
      "protocol_version.release",
    ]);
    const sup = await db.select().from(auditEvents).where(and(eq(auditEvents.entityId, releasedId), eq(auditEvents.action, "protocol_version.supersede")));
    expect(sup).toHaveLength(1);
    // The release hook asked the investigators of the open sites to acknowledge, in the same transaction.
    const asked = await db.select({ userId: acknowledgementRequests.userId }).from(acknowledgementRequests).where(eq(acknowledgementRequests.versionId, draftId));
    expect(asked.map((a) => a.userId).sort()).toEqual([fy.userByRole.investigator.id, fy.siteBPeople.investigator.id].sort());
  });
});
