import type { RouteCase } from "../route-case";

// Budgets and the ledger: site finance sees its own site only; sponsor finance writes budgets and
// rates. The POST case creates version 1 at site A, which the PUT case then corrects (no line
// has been earned under it), so keep them in this order.

const readers = ["sponsor_admin", "auditor", "site_finance", "sponsor_finance"] as const;

export const budgetBody = {
  effectiveFrom: "2025-01-01",
  reason: "Initial budget",
  startupFee: "5,000.00",
  milestones: [{ kind: "site_activated", amount: "1,000.00" }],
  visitFees: [{ visitCode: "M01", amount: "1,234.56" }],
  screenFailureFee: "300.00",
  screenFailureCapPerEnrolled: 4,
  overheadPercent: "25",
  holdbackPercent: "10",
  cycle: "quarterly",
  netDays: 45,
  trigger: "visit_completed",
};

export const cases: RouteCase[] = [
  {
    name: "list budgets (site finance sees its own site)",
    route: "studies/[studyId]/budgets",
    method: "GET",
    params: (fx) => ({ studyId: fx.study.id }),
    allow: [...readers],
    allowSiteB: ["site_finance"],
  },
  { name: "read a site's budget", route: "sites/[siteId]/budget", method: "GET", params: (fx) => ({ siteId: fx.siteA.id }), allow: [...readers] },
  { name: "create a site's budget", route: "sites/[siteId]/budget", method: "POST", params: (fx) => ({ siteId: fx.siteA.id }), body: () => budgetBody, allow: ["sponsor_finance"] },
  {
    name: "correct a budget version nothing was earned under",
    route: "sites/[siteId]/budget/versions/[versionNumber]",
    method: "PUT",
    params: (fx) => ({ siteId: fx.siteA.id, versionNumber: "1" }),
    body: () => ({ ...budgetBody, startupFee: "5,500.00" }),
    allow: ["sponsor_finance"],
  },
  { name: "list pass-through invoices", route: "sites/[siteId]/pass-through-invoices", method: "GET", params: (fx) => ({ siteId: fx.siteA.id }), allow: [...readers] },
  {
    name: "approve a pass-through invoice",
    route: "sites/[siteId]/pass-through-invoices",
    method: "POST",
    params: (fx) => ({ siteId: fx.siteA.id }),
    body: (fx) => ({ documentId: fx.docA.id, description: "Ethics committee fee", amount: "1,200.00", approvedOn: "2025-02-10" }),
    allow: ["sponsor_finance"],
  },
  { name: "a site's ledger", route: "sites/[siteId]/ledger", method: "GET", params: (fx) => ({ siteId: fx.siteA.id }), allow: [...readers] },
  { name: "a site's CSV statement", route: "sites/[siteId]/statement", method: "GET", params: (fx) => ({ siteId: fx.siteA.id }), query: () => ({ format: "csv" }), allow: [...readers] },
  {
    name: "the study summary (site finance sees its own site)",
    route: "studies/[studyId]/ledger/summary",
    method: "GET",
    params: (fx) => ({ studyId: fx.study.id }),
    allow: [...readers],
    allowSiteB: ["site_finance"],
  },
  {
    name: "the projection (site finance sees its own site)",
    route: "studies/[studyId]/ledger/projection",
    method: "GET",
    params: (fx) => ({ studyId: fx.study.id }),
    allow: [...readers],
    allowSiteB: ["site_finance"],
  },
  {
    name: "list exchange rates",
    route: "studies/[studyId]/exchange-rates",
    method: "GET",
    params: (fx) => ({ studyId: fx.study.id }),
    allow: [...readers],
    allowSiteB: ["site_finance"],
  },
  {
    name: "enter an exchange rate",
    route: "studies/[studyId]/exchange-rates",
    method: "POST",
    params: (fx) => ({ studyId: fx.study.id }),
    body: () => ({ currency: "JPY", rate: "0.0061", rateDate: "2026-11-30", source: "test" }),
    allow: ["sponsor_finance"],
  },
];
