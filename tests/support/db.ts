import { randomUUID } from "node:crypto";
import { db } from "@/server/db/client";
import { documents, memberships, sites, studies, users } from "@/server/db/schema";
import { roles, isSiteRole, type Role } from "@/lib/auth/roles";

export { db };

/**
 * A fresh study with two sites (A, B) and one person per role. Site roles are held at site A;
 * a second set of site people at site B. Every code is unique so tests never collide.
 */
export async function createStudyFixture() {
  const tag = randomUUID().slice(0, 8);
  const [study] = await db.insert(studies).values({ code: `T-${tag}`, title: `Test study ${tag}`, sponsorName: "Test sponsor" }).returning();
  // Site codes in the pattern subject codes build on (two letters, digits); unique within the study.
  const [siteA] = await db
    .insert(sites)
    .values({ studyId: study!.id, code: "SA01", name: "Site A", country: "DE", timeZone: "Europe/Berlin", currency: "EUR", status: "open" })
    .returning();
  const [siteB] = await db
    .insert(sites)
    .values({ studyId: study!.id, code: "SB01", name: "Site B", country: "JP", timeZone: "Asia/Tokyo", currency: "JPY", status: "open" })
    .returning();
  const userByRole = {} as Record<Role, { id: string; email: string; name: string }>;
  for (const role of roles) {
    const [u] = await db.insert(users).values({ email: `${role}.${tag}@test.example`, name: `Test ${role}` }).returning();
    await db.insert(memberships).values({ userId: u!.id, studyId: study!.id, siteId: isSiteRole(role) ? siteA!.id : null, role });
    userByRole[role] = u!;
  }
  const siteBPeople = {} as Record<"investigator" | "coordinator" | "site_finance", { id: string }>;
  for (const role of ["investigator", "coordinator", "site_finance"] as const) {
    const [u] = await db.insert(users).values({ email: `${role}.b.${tag}@test.example`, name: `Test ${role} B` }).returning();
    await db.insert(memberships).values({ userId: u!.id, studyId: study!.id, siteId: siteB!.id, role });
    siteBPeople[role] = u!;
  }
  // Someone with no role yet, and a role to revoke, for the People routes.
  const [spareUser] = await db.insert(users).values({ email: `spare.${tag}@test.example`, name: "Spare Person" }).returning();
  const [spareMembership] = await db.insert(memberships).values({ userId: spareUser!.id, studyId: study!.id, siteId: null, role: "auditor" }).returning();
  const doc = async (siteId: string | null) =>
    (
      await db
        .insert(documents)
        .values({
          studyId: study!.id,
          siteId,
          purpose: "general",
          storageKey: `test/${randomUUID()}`,
          fileName: "letter.pdf",
          contentType: "application/pdf",
          sizeBytes: 10,
          sha256: "0".repeat(64),
          state: "stored",
          uploaderId: userByRole.sponsor_admin.id,
        })
        .returning()
    )[0]!;
  return { tag, spareUser: spareUser!, spareMembership: spareMembership!, study: study!, siteA: siteA!, siteB: siteB!, userByRole, siteBPeople, docA: await doc(siteA!.id), docB: await doc(siteB!.id) };
}
export type StudyFixture = Awaited<ReturnType<typeof createStudyFixture>>;
