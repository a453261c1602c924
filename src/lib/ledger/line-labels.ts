import type { EarnedLine, LineKind, LineState } from "@/lib/payment-schedule";
import { milestoneLabels } from "@/lib/budgets/budget-input";

export const lineKindLabels: Record<LineKind, string> = {
  startup: "Start-up fee",
  milestone: "Milestone",
  visit: "Visit",
  screen_failure: "Screen failure",
  pass_through: "Pass-through",
  holdback_release: "Holdback release",
};

export const lineStateLabels: Record<LineState, string> = {
  paid: "Paid",
  outstanding: "Outstanding",
  overdue: "Overdue",
  not_payable: "Over cap",
};

/** One readable phrase naming the line's source event. */
export function describeLine(l: EarnedLine): string {
  const s = l.source;
  switch (l.kind) {
    case "visit":
      return `Visit ${s.visitCode ?? ""} of subject ${s.subjectCode ?? ""}`.trim();
    case "screen_failure":
      return `Screen failure of subject ${s.subjectCode ?? ""}${l.overCap ? " (over the cap)" : l.capLiftedOn ? ` (cap lifted ${l.capLiftedOn})` : ""}`;
    case "milestone":
      return s.milestone === "nth_enrolled" ? `Milestone: ${s.n} subjects enrolled` : `Milestone: ${s.milestone ? milestoneLabels[s.milestone] : ""}`;
    case "startup":
      return "Start-up fee";
    case "pass_through":
      return `Pass-through: ${s.description ?? "invoice"}`;
    case "holdback_release":
      return "Holdback released at close-out";
  }
}
