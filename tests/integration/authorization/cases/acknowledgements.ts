import type { RouteCase } from "../route-case";

// The shared fixture has no released protocol version: writes name a version id that does not
// exist, so an allowed caller gets past authorisation and is refused on the input (422), while a
// refused caller gets 403, or 404 for another site.
const missingVersion = "00000000-0000-4000-8000-00000000a0c1";
const readers = ["sponsor_admin", "protocol_writer", "medical_reviewer", "investigator", "coordinator", "monitor", "auditor"] as const;

export const cases: RouteCase[] = [
  {
    name: "adoption matrix (site people see their own site)",
    route: "studies/[studyId]/adoption",
    method: "GET",
    params: (fx) => ({ studyId: fx.study.id }),
    allow: [...readers],
    allowSiteB: ["investigator", "coordinator"],
  },
  {
    name: "record a site's ethics approval (site A's coordinator)",
    route: "studies/[studyId]/adoption",
    method: "POST",
    params: (fx) => ({ studyId: fx.study.id }),
    body: (fx) => ({ siteId: fx.siteA.id, versionId: missingVersion, approvedOn: "2026-01-15", letterDocumentId: fx.docA.id }),
    allow: ["coordinator"],
  },
  {
    name: "compliance matrix (site people see their own rows)",
    route: "studies/[studyId]/acknowledgements",
    method: "GET",
    params: (fx) => ({ studyId: fx.study.id }),
    allow: [...readers],
    allowSiteB: ["investigator", "coordinator"],
  },
  {
    name: "compliance matrix of site A only",
    route: "studies/[studyId]/acknowledgements",
    method: "GET",
    params: (fx) => ({ studyId: fx.study.id }),
    query: (fx) => ({ siteId: fx.siteA.id }),
    allow: [...readers],
  },
  {
    name: "sign an acknowledgement for site A (site A's investigator only)",
    route: "studies/[studyId]/acknowledgements",
    method: "POST",
    params: (fx) => ({ studyId: fx.study.id }),
    body: (fx) => ({ versionId: missingVersion, siteId: fx.siteA.id, password: "whatever" }),
    allow: ["investigator"],
  },
  {
    name: "compliance matrix as CSV",
    route: "studies/[studyId]/acknowledgements/export",
    method: "GET",
    params: (fx) => ({ studyId: fx.study.id }),
    allow: [...readers],
    allowSiteB: ["investigator", "coordinator"],
  },
  {
    name: "signature page of site A",
    route: "studies/[studyId]/acknowledgements/signature-page",
    method: "GET",
    params: (fx) => ({ studyId: fx.study.id }),
    query: (fx) => ({ versionId: missingVersion, siteId: fx.siteA.id }),
    allow: [...readers],
  },
  {
    name: "set the acknowledgement deadline (sponsor administrator)",
    route: "studies/[studyId]/acknowledgements/settings",
    method: "PATCH",
    params: (fx) => ({ studyId: fx.study.id }),
    body: () => ({ ackDeadlineDays: 14 }),
    allow: ["sponsor_admin"],
  },
];
