// The seeded demo (KESTREL-VP) shows what the budgets issue promises: a budget per site in its
// currency, one amendment from a site's approval of protocol 2.0, screen failures over and under
// the cap, a closed-out site with its holdback released, and totals that reconcile.
import { and, eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { db } from "@/server/db/client";
import { sites, studies, siteVersionApprovals, protocolVersions } from "@/server/db/schema";
import { getSiteLedger } from "@/server/ledger/get-site-ledger";
import { getSiteBudget } from "@/server/budgets/queries";

const AS_OF = "2026-12-01";

async function demo() {
  const [study] = await db.select().from(studies).where(eq(studies.code, "KESTREL-VP"));
  const rows = await db.select().from(sites).where(eq(sites.studyId, study!.id));
  return { study: study!, site: (code: string) => rows.find((s) => s.code === code)! };
}

describe("demo budgets", () => {
  it("every site has a budget in its own currency; JP01's amounts are whole yen", async () => {
    const { site } = await demo();
    for (const code of ["DE01", "NL01", "GB01", "JP01", "US01", "CH01", "ES01", "SE01"]) {
      const b = await getSiteBudget(db, { siteId: site(code).id });
      expect(b?.budget?.currency, code).toBe(site(code).currency);
    }
    const jp = await getSiteBudget(db, { siteId: site("JP01").id });
    expect(jp!.budget!.currency).toBe("JPY");
  });

  it("DE01's amendment takes effect on its ethics approval date of protocol 2.0", async () => {
    const { study, site } = await demo();
    const [approval] = await db
      .select({ on: siteVersionApprovals.approvedOn })
      .from(siteVersionApprovals)
      .innerJoin(protocolVersions, eq(protocolVersions.id, siteVersionApprovals.versionId))
      .where(and(eq(siteVersionApprovals.siteId, site("DE01").id), eq(protocolVersions.versionLabel, "2.0"), eq(protocolVersions.studyId, study.id)));
    const b = await getSiteBudget(db, { siteId: site("DE01").id });
    expect(b!.versions.map((v) => v.versionNumber)).toEqual([1, 2]);
    expect(b!.versions[1]!.effectiveFrom).toBe(approval!.on);
  });

  it("has screen failures both paid and over the cap, CH01's holdback released, and reconciling totals", async () => {
    const { study, site } = await demo();
    let paidSf = 0;
    let overCap = 0;
    for (const code of ["DE01", "NL01", "GB01", "JP01", "US01", "CH01"]) {
      const l = (await getSiteLedger(db, { studyId: study.id, siteId: site(code).id, asOf: AS_OF }))!;
      paidSf += l.lines.filter((x) => x.kind === "screen_failure" && !x.overCap).length;
      overCap += l.lines.filter((x) => x.overCap).length;
      const t = l.totals!;
      expect(t.earnedMinor, code).toBe(t.paidMinor + t.outstandingMinor + t.heldBackMinor);
    }
    expect(paidSf).toBeGreaterThan(0);
    expect(overCap).toBeGreaterThan(0);
    const ch = (await getSiteLedger(db, { studyId: study.id, siteId: site("CH01").id, asOf: AS_OF }))!;
    const release = ch.lines.find((x) => x.kind === "holdback_release");
    expect(release).toBeDefined();
    expect(ch.holdback!.balanceMinor).toBe(0n);
    expect(ch.holdback!.releasedMinor).toBe(ch.holdback!.withheldMinor);
  });
});
