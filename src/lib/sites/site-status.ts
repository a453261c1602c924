// Site lifecycle (DESIGN.md capability 4).
export const siteStatuses = ["proposed", "start_up", "open", "enrolment_closed", "closed_out"] as const;
export type SiteStatus = (typeof siteStatuses)[number];

export const siteStatusLabels: Record<SiteStatus, string> = {
  proposed: "Proposed",
  start_up: "Start-up",
  open: "Open",
  enrolment_closed: "Enrolment closed",
  closed_out: "Closed out",
};

/** Forward moves only, one step at a time. */
export const nextSiteStatus: Record<SiteStatus, SiteStatus | null> = {
  proposed: "start_up",
  start_up: "open",
  open: "enrolment_closed",
  enrolment_closed: "closed_out",
  closed_out: null,
};
