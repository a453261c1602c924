import { StatusChip } from "@/components/status-chip";
import type { LabelTable } from "@/lib/payments/labels";

/** A payment state as word + icon (never colour alone). */
export function PaymentChip({ table, state }: { table: LabelTable; state: string }) {
  const [word, tone] = table[state] ?? [state, "neutral"];
  return (
    <StatusChip tone={tone}>
      <span data-state={state}>{word}</span>
    </StatusChip>
  );
}
