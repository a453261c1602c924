import type { RouteCase } from "../route-case";

// The essential-documents binder. Site roles are held at site A; site B's people may never see
// site A's binder or review anything.
const readers = ["sponsor_admin", "auditor", "investigator", "coordinator", "site_finance", "sponsor_finance", "monitor"] as const;

export const cases: RouteCase[] = [
  {
    name: "list document types",
    route: "studies/[studyId]/binder/types",
    method: "GET",
    params: (fx) => ({ studyId: fx.study.id }),
    allow: [...readers],
    allowSiteB: ["investigator", "coordinator", "site_finance"],
  },
  {
    name: "add a document type",
    route: "studies/[studyId]/binder/types",
    method: "POST",
    params: (fx) => ({ studyId: fx.study.id }),
    body: (fx) => ({ code: `extra_${fx.tag.replace(/[^a-z0-9]/g, "")}_${Math.random().toString(36).slice(2, 8)}`, name: "Extra record", holder: "site", requiredFrom: null, expires: false, validityMonths: null }),
    allow: ["sponsor_admin"],
  },
  {
    name: "change a document type",
    route: "studies/[studyId]/binder/types/[typeCode]",
    method: "PATCH",
    params: (fx) => ({ studyId: fx.study.id, typeCode: "monitoring_report" }),
    body: () => ({ reference: "ICH E6(R3) Appendix C: monitoring records (from memory)" }),
    allow: ["sponsor_admin"],
  },
  {
    name: "site A's binder",
    route: "studies/[studyId]/binder/sites/[siteId]",
    method: "GET",
    params: (fx) => ({ studyId: fx.study.id, siteId: fx.siteA.id }),
    allow: [...readers],
  },
  {
    name: "sites × document types matrix (site people see their own row)",
    route: "studies/[studyId]/binder/matrix",
    method: "GET",
    params: (fx) => ({ studyId: fx.study.id }),
    allow: [...readers],
    allowSiteB: ["investigator", "coordinator", "site_finance"],
  },
  {
    name: "uploads awaiting review",
    route: "studies/[studyId]/binder/review",
    method: "GET",
    params: (fx) => ({ studyId: fx.study.id }),
    allow: ["sponsor_admin"],
  },
  {
    name: "review site A's upload",
    route: "documents/[documentId]/review",
    method: "POST",
    params: (fx) => ({ documentId: fx.docA.id }),
    body: () => ({ decision: "accepted" }),
    allow: ["sponsor_admin"],
  },
];
