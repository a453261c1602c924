// Route table: sites, subjects, visits, deviations and calendar feeds. Site roles are at site A.
import { randomBytes, randomUUID } from "node:crypto";
import { calendarFeedTokens, deviations, protocolVersions, sites, siteVersionApprovals, subjects, visitRecords } from "@/server/db/schema";
import type { Role } from "@/lib/auth/roles";
import { createHash } from "node:crypto";
import { db, type StudyFixture } from "../../../support/db";
import type { RouteCase, SiteRole } from "../route-case";

// Subjects and the rest do not exist in the shared fixture: create them once per fixture. A case's
// params may be a promise (callRoute hands them to the handler as the awaited route params).
type Data = { subjectA: string; subjectB: string; deviationA: string; tokenA: string; proposedSite: string };
const made = new WeakMap<StudyFixture, Promise<Data>>();

async function setup(fx: StudyFixture): Promise<Data> {
  const [version] = await db
    .insert(protocolVersions)
    .values({ studyId: fx.study.id, versionLabel: `subjects-cases-${randomUUID().slice(0, 8)}`, state: "released", title: "Plan", content: { type: "doc", content: [] }, authorId: fx.userByRole.protocol_writer.id, releasedAt: new Date("2025-01-02T00:00:00Z"), contentHash: "0".repeat(64), visitSchedule: [
      { code: "SCR", label: "Screening", anchor: "consent", dayOffset: 0, windowBefore: 0, windowAfter: 28, procedures: [] },
      { code: "W1", label: "Week 1", anchor: "implant", dayOffset: 7, windowBefore: 3, windowAfter: 3, procedures: [] },
      { code: "M1", label: "Month 1", anchor: "implant", dayOffset: 30, windowBefore: 7, windowAfter: 7, procedures: [] },
    ] })
    .returning();
  await db.insert(siteVersionApprovals).values([
    { siteId: fx.siteA.id, versionId: version!.id, approvedOn: "2025-01-10" },
    { siteId: fx.siteB.id, versionId: version!.id, approvedOn: "2025-01-10" },
  ]);
  const subject = async (siteId: string, code: string) => {
    const [s] = await db
      .insert(subjects)
      .values({ studyId: fx.study.id, siteId, code, status: "implanted", consentDate: "2025-02-01", consentVersionId: version!.id, enrolmentDate: "2025-02-20", implantDate: "2025-03-03", deviceSerial: "SN-1" })
      .returning();
    await db.insert(visitRecords).values({ subjectId: s!.id, visitCode: "W1", versionId: version!.id, outcome: "done", actualDate: "2025-03-10", dataEnteredOn: "2025-03-10" });
    return s!.id;
  };
  const subjectA = await subject(fx.siteA.id, `${fx.siteA.code}-001`);
  const subjectB = await subject(fx.siteB.id, `${fx.siteB.code}-001`);
  const [dev] = await db
    .insert(deviations)
    .values({ studyId: fx.study.id, siteId: fx.siteA.id, subjectId: subjectA, source: "manual", category: "other", occurredOn: "2025-03-12", description: "A case for the route table" })
    .returning();
  const [token] = await db
    .insert(calendarFeedTokens)
    .values({ userId: fx.userByRole.coordinator.id, studyId: fx.study.id, siteId: fx.siteA.id, tokenHash: createHash("sha256").update(randomBytes(32)).digest("hex") })
    .returning();
  const [site] = await db.insert(sites).values({ studyId: fx.study.id, code: `PZ${fx.tag.slice(0, 4)}`.toUpperCase(), name: "Proposed site", country: "DE", timeZone: "Europe/Berlin", currency: "EUR" }).returning();
  return { subjectA, subjectB, deviationA: dev!.id, tokenA: token!.id, proposedSite: site!.id };
}

const data = (fx: StudyFixture) => {
  let p = made.get(fx);
  if (!p) made.set(fx, (p = setup(fx)));
  return p;
};
/** Params resolved after the case's data exist. */
const later = (f: (fx: StudyFixture, d: Data) => Record<string, string>) => (fx: StudyFixture) =>
  data(fx).then((d) => f(fx, d)) as unknown as Record<string, string>;

const everyRole: Role[] = ["sponsor_admin", "protocol_writer", "medical_reviewer", "investigator", "coordinator", "site_finance", "sponsor_finance", "monitor", "auditor"];
const subjectReaders: Role[] = ["sponsor_admin", "investigator", "coordinator", "sponsor_finance", "monitor", "auditor"];
const studyWideSubjectReaders: Role[] = ["sponsor_admin", "sponsor_finance", "monitor", "auditor"];
const calendarReaders: Role[] = ["sponsor_admin", "investigator", "coordinator", "monitor", "auditor"];
const deviationReaders: Role[] = ["sponsor_admin", "medical_reviewer", "investigator", "coordinator", "monitor", "auditor"];
const siteBReaders: SiteRole[] = ["investigator", "coordinator"];

export const cases: RouteCase[] = [
  {
    name: "add a site",
    route: "studies/[studyId]/sites",
    method: "POST",
    params: (fx) => ({ studyId: fx.study.id }),
    body: () => ({ code: "ZZ01", name: "Invented Clinic", country: "DE", timeZone: "Europe/Berlin", currency: "EUR", targetEnrolment: 4 }),
    allow: ["sponsor_admin"],
  },
  { name: "read site A", route: "sites/[siteId]", method: "GET", params: (fx) => ({ siteId: fx.siteA.id }), allow: everyRole },
  {
    name: "read site B",
    route: "sites/[siteId]",
    method: "GET",
    params: (fx) => ({ siteId: fx.siteB.id }),
    allow: ["sponsor_admin", "protocol_writer", "medical_reviewer", "sponsor_finance", "monitor", "auditor"],
    allowSiteB: ["investigator", "coordinator", "site_finance"],
  },
  { name: "edit site A", route: "sites/[siteId]", method: "PATCH", params: (fx) => ({ siteId: fx.siteA.id }), body: () => ({ targetEnrolment: 7 }), allow: ["sponsor_admin"] },
  { name: "move a site one step", route: "sites/[siteId]/status", method: "POST", params: later((_fx, d) => ({ siteId: d.proposedSite })), body: () => ({ to: "start_up" }), allow: ["sponsor_admin"] },
  { name: "enrolment by site (site people see their own)", route: "studies/[studyId]/enrolment", method: "GET", params: (fx) => ({ studyId: fx.study.id }), allow: subjectReaders, allowSiteB: siteBReaders },
  { name: "list subjects (site people see their own)", route: "studies/[studyId]/subjects", method: "GET", params: later((fx) => ({ studyId: fx.study.id })), allow: subjectReaders, allowSiteB: siteBReaders },
  {
    name: "list site B's subjects",
    route: "studies/[studyId]/subjects",
    method: "GET",
    params: later((fx) => ({ studyId: fx.study.id })),
    query: (fx) => ({ siteId: fx.siteB.id }),
    allow: studyWideSubjectReaders,
    allowSiteB: siteBReaders,
  },
  { name: "screen a subject at site A", route: "sites/[siteId]/subjects", method: "POST", params: later((fx) => ({ siteId: fx.siteA.id })), body: () => ({ consentDate: "2025-03-01" }), allow: ["coordinator"] },
  { name: "screen a subject at site B", route: "sites/[siteId]/subjects", method: "POST", params: later((fx) => ({ siteId: fx.siteB.id })), body: () => ({ consentDate: "2025-03-01" }), allow: [], allowSiteB: ["coordinator"] },
  { name: "import subjects at site A", route: "sites/[siteId]/subjects/import", method: "POST", params: (fx) => ({ siteId: fx.siteA.id }), body: () => ({ csv: "subject_code\n" }), allow: ["coordinator"] },
  { name: "read a subject of site A", route: "subjects/[subjectId]", method: "GET", params: later((_fx, d) => ({ subjectId: d.subjectA })), allow: subjectReaders },
  { name: "read a subject of site B", route: "subjects/[subjectId]", method: "GET", params: later((_fx, d) => ({ subjectId: d.subjectB })), allow: studyWideSubjectReaders, allowSiteB: siteBReaders },
  { name: "correct a subject of site A", route: "subjects/[subjectId]", method: "PATCH", params: later((_fx, d) => ({ subjectId: d.subjectA })), body: () => ({ deviceSerial: "SN-2" }), allow: ["coordinator"] },
  { name: "correct a subject of site B", route: "subjects/[subjectId]", method: "PATCH", params: later((_fx, d) => ({ subjectId: d.subjectB })), body: () => ({ deviceSerial: "SN-2" }), allow: [], allowSiteB: ["coordinator"] },
  { name: "move a subject of site A", route: "subjects/[subjectId]/status", method: "POST", params: later((_fx, d) => ({ subjectId: d.subjectA })), body: () => ({ to: "follow_up", effectiveOn: "2025-03-20" }), allow: ["coordinator"] },
  { name: "move a subject of site B", route: "subjects/[subjectId]/status", method: "POST", params: later((_fx, d) => ({ subjectId: d.subjectB })), body: () => ({ to: "follow_up", effectiveOn: "2025-03-20" }), allow: [], allowSiteB: ["coordinator"] },
  { name: "record a visit at site A", route: "subjects/[subjectId]/visits", method: "POST", params: later((_fx, d) => ({ subjectId: d.subjectA })), body: () => ({ visitCode: "M1", outcome: "missed" }), allow: ["coordinator"] },
  { name: "record a visit at site B", route: "subjects/[subjectId]/visits", method: "POST", params: later((_fx, d) => ({ subjectId: d.subjectB })), body: () => ({ visitCode: "M1", outcome: "missed" }), allow: [], allowSiteB: ["coordinator"] },
  {
    name: "verify a visit at site A",
    route: "subjects/[subjectId]/visits/[visitCode]/verification",
    method: "POST",
    params: later((_fx, d) => ({ subjectId: d.subjectA, visitCode: "W1" })),
    body: () => ({ verifiedOn: "2025-04-01" }),
    allow: ["monitor"],
  },
  {
    name: "report a deviation at site A",
    route: "subjects/[subjectId]/deviations",
    method: "POST",
    params: later((_fx, d) => ({ subjectId: d.subjectA })),
    body: () => ({ category: "other", occurredOn: "2025-03-15", description: "Questionnaire given in the wrong language" }),
    allow: ["coordinator", "monitor"],
  },
  {
    name: "report a deviation at site B",
    route: "subjects/[subjectId]/deviations",
    method: "POST",
    params: later((_fx, d) => ({ subjectId: d.subjectB })),
    body: () => ({ category: "other", occurredOn: "2025-03-15", description: "Questionnaire given in the wrong language" }),
    allow: ["monitor"],
    allowSiteB: ["coordinator"],
  },
  { name: "resolve a deviation at site A", route: "deviations/[deviationId]", method: "PATCH", params: later((_fx, d) => ({ deviationId: d.deviationA })), body: () => ({ resolution: "Staff retrained" }), allow: ["coordinator", "monitor"] },
  { name: "deviation log (site people see their own)", route: "studies/[studyId]/deviations", method: "GET", params: (fx) => ({ studyId: fx.study.id }), allow: deviationReaders, allowSiteB: siteBReaders },
  {
    name: "deviation log of site B as CSV",
    route: "studies/[studyId]/deviations",
    method: "GET",
    params: (fx) => ({ studyId: fx.study.id }),
    query: (fx) => ({ siteId: fx.siteB.id, format: "csv" }),
    allow: ["sponsor_admin", "medical_reviewer", "monitor", "auditor"],
    allowSiteB: siteBReaders,
  },
  { name: "site A's visits to plan", route: "sites/[siteId]/visits", method: "GET", params: later((fx) => ({ siteId: fx.siteA.id })), allow: calendarReaders },
  { name: "site B's visits to plan", route: "sites/[siteId]/visits", method: "GET", params: later((fx) => ({ siteId: fx.siteB.id })), allow: ["sponsor_admin", "monitor", "auditor"], allowSiteB: siteBReaders },
  { name: "own calendar addresses at site A", route: "sites/[siteId]/calendar-feeds", method: "GET", params: (fx) => ({ siteId: fx.siteA.id }), allow: calendarReaders },
  { name: "create a calendar address at site A", route: "sites/[siteId]/calendar-feeds", method: "POST", params: (fx) => ({ siteId: fx.siteA.id }), body: () => ({ label: "Case" }), allow: calendarReaders },
  { name: "revoke site A coordinator's calendar address", route: "calendar-feed-tokens/[tokenId]", method: "DELETE", params: later((_fx, d) => ({ tokenId: d.tokenA })), allow: ["coordinator"] },
  { name: "calendar feed by its secret address", route: "calendar-feeds/[token]", method: "GET", params: () => ({ token: randomBytes(32).toString("base64url") }), allow: "public" },
];
