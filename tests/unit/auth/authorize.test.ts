import { describe, expect, it } from "vitest";
import { accessibleSiteIds, can, canSomewhere, type Actor } from "@/lib/auth/authorize";
import { permissions, rolePermissions, roles, siteRoles } from "@/lib/auth/roles";

const actor = (memberships: Actor["memberships"]): Actor => ({ userId: "u", email: "u@test.example", name: "U", memberships });

describe("roles → permissions table", () => {
  it("names only known permissions", () => {
    for (const r of roles) for (const p of rolePermissions[r]) expect(permissions).toContain(p);
  });
  // DESIGN.md: the auditor reads everything and changes nothing.
  it("gives the auditor no write permission", () => {
    const writes = rolePermissions.auditor.filter((p) => !/\.(read)$/.test(p));
    expect(writes).toEqual([]);
  });
  // DESIGN.md: author and approver differ; the writer cannot review or release.
  it("keeps drafting and approving in different roles", () => {
    expect(rolePermissions.protocol_writer).not.toContain("protocol.review");
    expect(rolePermissions.protocol_writer).not.toContain("protocol.release");
  });
});

describe("site scope", () => {
  const study = "study-1";
  const coordinatorAtA = actor([{ studyId: study, siteId: "A", role: "coordinator" }]);
  const monitorAll = actor([{ studyId: study, siteId: null, role: "monitor" }]);

  it("lets a site role act at its own site only", () => {
    expect(can(coordinatorAtA, "subjects.write", { studyId: study, siteId: "A" })).toBe(true);
    expect(can(coordinatorAtA, "subjects.write", { studyId: study, siteId: "B" })).toBe(false);
  });
  it("does not treat a site grant as a study-wide grant", () => {
    expect(can(coordinatorAtA, "subjects.read", { studyId: study })).toBe(false);
    expect(canSomewhere(coordinatorAtA, "subjects.read", study)).toBe(true);
    expect(accessibleSiteIds(coordinatorAtA, "subjects.read", study)).toEqual(["A"]);
  });
  it("lets a study-wide grant reach every site", () => {
    expect(can(monitorAll, "visits.verify", { studyId: study, siteId: "B" })).toBe(true);
    expect(accessibleSiteIds(monitorAll, "visits.verify", study)).toBe("all");
  });
  it("gives nothing in another study", () => {
    expect(canSomewhere(coordinatorAtA, "subjects.read", "study-2")).toBe(false);
    expect(accessibleSiteIds(coordinatorAtA, "subjects.read", "study-2")).toEqual([]);
  });
  it("lists the site roles that must be held at a site", () => {
    expect([...siteRoles].sort()).toEqual(["coordinator", "investigator", "site_finance"]);
  });
});
