import { CircleCheck, CircleX, Clock, FileQuestion, Hourglass, TriangleAlert } from "lucide-react";
import { StatusChip, type Tone } from "@/components/status-chip";
import { itemStateLabels, type ItemState } from "@/lib/binder/readiness";

const look: Record<ItemState, { tone: Tone; icon: typeof CircleCheck }> = {
  complete: { tone: "ok", icon: CircleCheck },
  expiring: { tone: "attention", icon: Clock },
  expired: { tone: "danger", icon: TriangleAlert },
  rejected: { tone: "danger", icon: CircleX },
  awaiting_review: { tone: "progress", icon: Hourglass },
  missing: { tone: "neutral", icon: FileQuestion },
};

/** Word and icon for a binder item's state (never colour alone). */
export function BinderStateChip({ state }: { state: ItemState }) {
  return (
    <StatusChip tone={look[state].tone} icon={look[state].icon}>
      {itemStateLabels[state]}
    </StatusChip>
  );
}
