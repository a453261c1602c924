import { Archive, CircleCheck, CircleDot, FilePen, Send, Undo2 } from "lucide-react";
import { StatusChip, type Tone } from "@/components/status-chip";
import { protocolStatusLabels, type ProtocolStatus } from "@/lib/protocol/workflow";

const look: Record<ProtocolStatus, { tone: Tone; icon: typeof CircleDot }> = {
  draft: { tone: "neutral", icon: FilePen },
  in_review: { tone: "progress", icon: Send },
  returned: { tone: "attention", icon: Undo2 },
  approved: { tone: "info", icon: CircleDot },
  released: { tone: "ok", icon: CircleCheck },
  superseded: { tone: "neutral", icon: Archive },
};

export function ProtocolStateChip({ state }: { state: ProtocolStatus }) {
  const { tone, icon } = look[state];
  return (
    <StatusChip tone={tone} icon={icon}>
      <span data-testid="version-state">{protocolStatusLabels[state]}</span>
    </StatusChip>
  );
}
