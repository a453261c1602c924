// Study, sites, people and roles of the demo scenario.
import { eq } from "drizzle-orm";
import argon2 from "argon2";
import { memberships, siteStatusEvents, sites, studies, users } from "../../src/server/db/schema";
import { siteStatuses } from "../../src/lib/sites/site-status";
import { DEMO_PASSWORD, demoPeople, demoSites, demoStudy } from "./demo-data";
import type { SeedContext } from "./context";

export async function seedFoundation({ db, log }: SeedContext) {
  const existing = await db.query.studies.findFirst({ where: eq(studies.code, demoStudy.code) });
  if (existing) {
    log("foundation: demo study already present");
    return;
  }
  await db.transaction(async (tx) => {
    const [study] = await tx.insert(studies).values(demoStudy).returning();
    const siteIds = new Map<string, string>();
    for (const s of demoSites) {
      const [site] = await tx
        .insert(sites)
        .values({
          studyId: study!.id,
          code: s.code,
          name: s.name,
          country: s.country,
          timeZone: s.timeZone,
          currency: s.currency,
          targetEnrolment: s.targetEnrolment,
          status: s.status,
          contacts: [{ name: "Study office", role: "Site contact", email: `office.${s.code.toLowerCase()}@kestrel-vp.example` }],
        })
        .returning();
      siteIds.set(s.code, site!.id);
      // Lifecycle history: proposed first, then one step per date.
      await tx.insert(siteStatusEvents).values({ siteId: site!.id, fromStatus: null, toStatus: "proposed", effectiveOn: "2024-11-04" });
      for (let i = 0; i < s.steps.length; i++) {
        await tx.insert(siteStatusEvents).values({ siteId: site!.id, fromStatus: siteStatuses[i]!, toStatus: siteStatuses[i + 1]!, effectiveOn: s.steps[i]! });
      }
    }
    const passwordHash = await argon2.hash(DEMO_PASSWORD, { type: argon2.argon2id });
    for (const p of demoPeople) {
      const [user] = await tx.insert(users).values({ email: p.email, name: p.name, passwordHash }).returning();
      for (const r of p.roles) {
        await tx.insert(memberships).values({ userId: user!.id, studyId: study!.id, siteId: r.site ? siteIds.get(r.site)! : null, role: r.role });
      }
    }
  });
  log(`foundation: study ${demoStudy.code}, ${demoSites.length} sites, ${demoPeople.length} people`);
}
