// Acknowledgements of the demo study: everyone signed 1.0 (one of them late); 2.0 signed at most
// sites, overdue at GB01 and JP01; DE01's sub-investigator joined later and has 2.0 pending.
// Signatures are written as the signing route would (same meaning, site time and content hash).
import { and, eq, inArray } from "drizzle-orm";
import { acknowledgementRequests, auditEvents, electronicSignatures, memberships, protocolVersions, sites, studies, users } from "../../src/server/db/schema";
import { acknowledgementDueOn, acknowledgementMeaning, formatSiteLocalTime } from "../../src/lib/acknowledgements";
import { demoStudy } from "./demo-data";
import type { SeedContext } from "./context";

const DAY = 86_400_000;
const v1Plan: Record<string, number> = { DE01: 3, NL01: 6, GB01: 9, JP01: 4, US01: 2, CH01: 20 };
const v2Plan: Record<string, number | null> = { DE01: 5, NL01: 11, GB01: null, JP01: null, US01: 8, CH01: 6 };

export async function seedAcknowledgements({ db, log }: SeedContext) {
  const [study] = await db.select().from(studies).where(eq(studies.code, demoStudy.code));
  if (!study) return log("acknowledgements: no demo study, skipped");
  const existing = await db.select({ id: acknowledgementRequests.id }).from(acknowledgementRequests).where(eq(acknowledgementRequests.studyId, study.id)).limit(1);
  if (existing.length) return log("acknowledgements: already seeded");
  const versions = await db.select().from(protocolVersions).where(and(eq(protocolVersions.studyId, study.id), inArray(protocolVersions.versionLabel, ["1.0", "2.0"])));
  const v1 = versions.find((v) => v.versionLabel === "1.0");
  const v2 = versions.find((v) => v.versionLabel === "2.0");
  if (!v1?.releasedAt || !v2?.releasedAt || !v1.contentHash || !v2.contentHash) return log("acknowledgements: released versions 1.0 and 2.0 not found, skipped");

  const investigators = await db
    .select({ user: users, site: sites })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .innerJoin(sites, eq(sites.id, memberships.siteId))
    .where(and(eq(memberships.studyId, study.id), eq(memberships.role, "investigator")));

  let signed = 0;
  let requested = 0;
  // Audit events are written at the end in time order, so the trail reads chronologically.
  const audit: (typeof auditEvents.$inferInsert)[] = [];
  const ask = async (version: typeof v1, inv: (typeof investigators)[number], requestedAt: Date, reason: "release" | "joined", compareTo: string | null, signAfterDays: number | null) => {
    const dueOn = acknowledgementDueOn(requestedAt, inv.site.timeZone, study.ackDeadlineDays);
    const [req] = await db
      .insert(acknowledgementRequests)
      .values({ studyId: study.id, siteId: inv.site.id, versionId: version.id, userId: inv.user.id, reason, compareToVersionId: compareTo, requestedAt, dueOn })
      .returning();
    requested++;
    audit.push({ at: requestedAt, actorName: "system", action: "acknowledgement.requested", entityType: "acknowledgement_request", entityId: req!.id, studyId: study.id, siteId: inv.site.id, after: { versionId: version.id, versionLabel: version.versionLabel, userId: inv.user.id, reason, dueOn } });
    if (signAfterDays === null) return;
    // Signed mid-morning site time-ish: a fixed offset into the day after the request.
    const signedAt = new Date(requestedAt.getTime() + signAfterDays * DAY + 2 * 3_600_000);
    const [sig] = await db
      .insert(electronicSignatures)
      .values({
        requestId: req!.id,
        studyId: study.id,
        siteId: inv.site.id,
        versionId: version.id,
        signerId: inv.user.id,
        printedName: inv.user.name,
        signerEmail: inv.user.email,
        role: "investigator",
        siteCode: inv.site.code,
        versionLabel: version.versionLabel,
        meaning: acknowledgementMeaning({ versionLabel: version.versionLabel, studyCode: study.code }),
        contentHash: version.contentHash!,
        signedAt,
        siteTimeZone: inv.site.timeZone,
        signedAtSiteLocal: formatSiteLocalTime(signedAt, inv.site.timeZone),
      })
      .returning();
    audit.push({ at: signedAt, actorId: inv.user.id, actorName: inv.user.name, action: "acknowledgement.signed", entityType: "electronic_signature", entityId: sig!.id, studyId: study.id, siteId: inv.site.id, after: sig });
    signed++;
  };

  for (const inv of investigators) {
    const code = inv.site.code;
    const joinedLater = inv.user.email.startsWith("subinv.");
    if (joinedLater) {
      // Joined after 2.0 was in force at the site: asked for 2.0 a few days ago, not yet signed.
      await ask(v2, inv, new Date(Date.now() - 4 * DAY), "joined", null, null);
      continue;
    }
    if (code in v1Plan) await ask(v1, inv, v1.releasedAt, "release", null, v1Plan[code]!);
    if (code in v2Plan) await ask(v2, inv, v2.releasedAt, "release", code in v1Plan ? v1.id : null, v2Plan[code]!);
  }
  audit.sort((a, b) => a.at!.getTime() - b.at!.getTime());
  if (audit.length) await db.insert(auditEvents).values(audit);
  log(`acknowledgements: ${requested} requests, ${signed} signatures`);
}
