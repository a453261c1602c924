import { StatusChip } from "@/components/status-chip";
import { describeStatus, type AcknowledgementStatus } from "@/lib/acknowledgements/state";

// Word + icon for an acknowledgement's state (never colour alone).
export function AckStatusChip({ status }: { status: AcknowledgementStatus }) {
  const tone = status.state === "acknowledged" ? "ok" : status.state === "overdue" ? "danger" : "attention";
  return <StatusChip tone={tone}>{describeStatus(status)}</StatusChip>;
}
