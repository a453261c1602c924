import { describe, expect, it } from "vitest";
import { checkTransition, protocolStatuses, protocolTransitions, type ProtocolStatus } from "@/lib/protocol/workflow";

// The rules come from the product design (Draft → In review → Approved → Released; a reviewer
// returns with comments; the author never approves or releases their own version).
const writer = ["protocol_writer"];
const reviewer = ["medical_reviewer"];
const both = ["protocol_writer", "medical_reviewer"];
const AUTHOR = "user-author";
const OTHER = "user-other";

const allowed: [ProtocolStatus, ProtocolStatus, string[]][] = [
  ["draft", "in_review", writer],
  ["in_review", "returned", reviewer],
  ["returned", "draft", writer],
  ["in_review", "approved", reviewer],
  ["approved", "released", reviewer],
];

describe("checkTransition", () => {
  it.each(allowed)("allows %s → %s to the right role (another user than the author)", (from, to, roles) => {
    const r = checkTransition({ from, to, actorUserId: OTHER, authorUserId: AUTHOR, actorRoles: roles, comment: "Please clarify 2.1." });
    expect(r.ok).toBe(true);
  });

  it("lets the author submit and reopen their own draft", () => {
    expect(checkTransition({ from: "draft", to: "in_review", actorUserId: AUTHOR, authorUserId: AUTHOR, actorRoles: writer }).ok).toBe(true);
    expect(checkTransition({ from: "returned", to: "draft", actorUserId: AUTHOR, authorUserId: AUTHOR, actorRoles: writer }).ok).toBe(true);
  });

  it("says that releasing supersedes the parent", () => {
    const r = checkTransition({ from: "approved", to: "released", actorUserId: OTHER, authorUserId: AUTHOR, actorRoles: reviewer });
    expect(r).toMatchObject({ ok: true, parentBecomes: "superseded" });
    const a = checkTransition({ from: "in_review", to: "approved", actorUserId: OTHER, authorUserId: AUTHOR, actorRoles: reviewer });
    expect(a).toMatchObject({ ok: true, parentBecomes: null });
  });

  it.each(allowed)("refuses %s → %s to a role without the permission", (from, to, roles) => {
    const wrong = roles === writer ? reviewer : writer;
    for (const actorRoles of [wrong, [], ["investigator"], ["sponsor_admin"], ["auditor"]]) {
      const r = checkTransition({ from, to, actorUserId: OTHER, authorUserId: AUTHOR, actorRoles, comment: "c" });
      expect(r).toMatchObject({ ok: false, code: "missing_permission" });
    }
  });

  it("never lets the author approve or release their own version, even holding both roles", () => {
    for (const [from, to] of [["in_review", "approved"], ["approved", "released"]] as const) {
      const r = checkTransition({ from, to, actorUserId: AUTHOR, authorUserId: AUTHOR, actorRoles: both });
      expect(r).toMatchObject({ ok: false, code: "author_cannot_approve" });
      if (!r.ok) expect(r.message).toMatch(/You wrote this version/);
    }
  });

  it("requires comments to return a version", () => {
    for (const comment of [undefined, "", "   "]) {
      const r = checkTransition({ from: "in_review", to: "returned", actorUserId: OTHER, authorUserId: AUTHOR, actorRoles: reviewer, ...(comment !== undefined ? { comment } : {}) });
      expect(r).toMatchObject({ ok: false, code: "comment_required" });
    }
  });

  it("refuses every other pair of statuses with a clear message", () => {
    const permitted = new Set(allowed.map(([f, t]) => `${f}>${t}`));
    let refused = 0;
    for (const from of protocolStatuses)
      for (const to of protocolStatuses) {
        if (permitted.has(`${from}>${to}`)) continue;
        const r = checkTransition({ from, to, actorUserId: OTHER, authorUserId: AUTHOR, actorRoles: both, comment: "c" });
        expect(r.ok, `${from} → ${to}`).toBe(false);
        if (!r.ok) expect(r.code).toBe(to === "superseded" ? "automatic_only" : "not_allowed");
        refused++;
      }
    expect(refused).toBe(6 * 6 - allowed.length);
    const r = checkTransition({ from: "draft", to: "released", actorUserId: OTHER, authorUserId: AUTHOR, actorRoles: both });
    expect(r).toMatchObject({ ok: false, message: "A version cannot go from Draft to Released. From Draft it can go to: In review." });
    const fin = checkTransition({ from: "released", to: "draft", actorUserId: OTHER, authorUserId: AUTHOR, actorRoles: both });
    expect(fin).toMatchObject({ ok: false, message: "A version cannot go from Released to Draft. Released is final." });
  });

  it("refuses unknown statuses", () => {
    expect(checkTransition({ from: "published", to: "draft", actorUserId: OTHER, authorUserId: AUTHOR, actorRoles: both })).toMatchObject({ ok: false, code: "unknown_status" });
  });

  it("lists exactly the documented transitions", () => {
    expect(protocolTransitions.map((t) => `${t.from}>${t.to}`).sort()).toEqual(allowed.map(([f, t]) => `${f}>${t}`).sort());
  });
});
