// Route-table cases of the protocol API. The fixture study has no protocol yet: the first call
// of a case (the signed-out one, refused before any lookup) notes the fixture, and a hook then
// inserts one version per case in the state its route acts on, so allowed roles reach the handler.
import { randomUUID } from "node:crypto";
import { beforeEach } from "vitest";
import type { StudyFixture } from "../../../support/db";
import { docOf, insertVersion } from "../../protocol/protocol-fixture";
import type { RouteCase } from "../route-case";

type Ids = { released: string; draft: string; inReview: string; returned: string; approved: string; toApprove: string };
const byStudy = new Map<string, { ids: Ids; ready: Promise<void> | null; fx: StudyFixture }>();

function idsFor(fx: StudyFixture): Ids {
  let entry = byStudy.get(fx.study.id);
  if (!entry) {
    const ids: Ids = { released: randomUUID(), draft: randomUUID(), inReview: randomUUID(), returned: randomUUID(), approved: randomUUID(), toApprove: randomUUID() };
    entry = { ids, ready: null, fx };
    byStudy.set(fx.study.id, entry);
  }
  return entry.ids;
}

async function prepare(fx: StudyFixture, ids: Ids) {
  await insertVersion(fx, { id: ids.released, label: "1.0", state: "released" });
  const child = { parentId: ids.released, content: docOf("The first paragraph, amended.") };
  await insertVersion(fx, { id: ids.draft, label: "1.1", state: "draft", ...child, summaryOfChanges: [{ section: "1 Design", before: "a", after: "b", rationale: "Clearer" }] });
  await insertVersion(fx, { id: ids.inReview, label: "1.2", state: "in_review", ...child });
  await insertVersion(fx, { id: ids.returned, label: "1.3", state: "returned", ...child });
  await insertVersion(fx, { id: ids.toApprove, label: "1.4", state: "in_review", ...child });
  await insertVersion(fx, { id: ids.approved, label: "1.5", state: "approved", ...child });
}

beforeEach(async () => {
  for (const entry of byStudy.values()) {
    entry.ready ??= prepare(entry.fx, entry.ids);
    await entry.ready;
  }
});

const writers = ["protocol_writer"] as const;
const reviewers = ["medical_reviewer"] as const;
// Everyone who reads the protocol: sponsor-side readers and the site people who follow it.
const readers = ["sponsor_admin", "protocol_writer", "medical_reviewer", "investigator", "coordinator", "monitor", "auditor"] as const;
const siteReaders = ["investigator", "coordinator"] as const;
const v = (pick: keyof Ids) => (fx: StudyFixture) => ({ versionId: idsFor(fx)[pick] });

export const cases: RouteCase[] = [
  {
    name: "list protocol versions",
    route: "studies/[studyId]/protocol/versions",
    method: "GET",
    params: (fx) => (idsFor(fx), { studyId: fx.study.id }),
    allow: [...readers],
    allowSiteB: [...siteReaders],
  },
  {
    name: "start a new draft",
    route: "studies/[studyId]/protocol/versions",
    method: "POST",
    params: (fx) => (idsFor(fx), { studyId: fx.study.id }),
    body: () => ({ substantial: false }),
    allow: [...writers],
  },
  {
    name: "compare two versions",
    route: "studies/[studyId]/protocol/compare",
    method: "GET",
    params: (fx) => ({ studyId: fx.study.id }),
    // Two released versions would be needed for site people: the released one against itself.
    query: (fx) => ({ from: idsFor(fx).released, to: idsFor(fx).released }),
    allow: [...readers],
    allowSiteB: [...siteReaders],
  },
  { name: "read a released version", route: "protocol-versions/[versionId]", method: "GET", params: v("released"), allow: [...readers], allowSiteB: [...siteReaders] },
  {
    name: "save a draft",
    route: "protocol-versions/[versionId]",
    method: "PUT",
    params: v("draft"),
    body: () => ({ baseRevision: 1, substantialReason: "Clarification only" }),
    allow: [...writers],
  },
  { name: "submit a draft", route: "protocol-versions/[versionId]/submit", method: "POST", params: v("draft"), body: () => ({}), allow: [...writers] },
  { name: "return a version", route: "protocol-versions/[versionId]/return", method: "POST", params: v("inReview"), body: () => ({ comment: "Say who assesses the MRI." }), allow: [...reviewers] },
  { name: "reopen a returned version", route: "protocol-versions/[versionId]/reopen", method: "POST", params: v("returned"), body: () => ({}), allow: [...writers] },
  { name: "approve a version", route: "protocol-versions/[versionId]/approve", method: "POST", params: v("toApprove"), body: () => ({}), allow: [...reviewers] },
  { name: "release a version", route: "protocol-versions/[versionId]/release", method: "POST", params: v("approved"), body: () => ({}), allow: [...reviewers] },
  {
    name: "PDF of a released version",
    route: "protocol-versions/[versionId]/pdf",
    method: "GET",
    params: v("released"),
    query: () => ({ kind: "clean" }),
    allow: [...readers],
    allowSiteB: [...siteReaders],
  },
];
