import { siteStatusLabels, type SiteStatus } from "@/lib/sites/site-status";
import { StatusChip, type Tone } from "./status-chip";

const tone: Record<SiteStatus, Tone> = {
  proposed: "neutral",
  start_up: "progress",
  open: "ok",
  enrolment_closed: "info",
  closed_out: "neutral",
};

export function SiteStatusChip({ status }: { status: SiteStatus }) {
  return <StatusChip tone={tone[status]}>{siteStatusLabels[status]}</StatusChip>;
}
