import { subjectStatusLabels, type SubjectStatus } from "@/lib/subjects/subject-states";
import type { VisitState } from "@/lib/visits/subject-calendar";
import { StatusChip, type Tone } from "@/components/status-chip";

const subjectTone: Record<SubjectStatus, Tone> = {
  screening: "progress",
  screen_failed: "neutral",
  enrolled: "info",
  implanted: "info",
  follow_up: "ok",
  completed: "neutral",
  withdrawn: "attention",
};

export function SubjectStatusChip({ status }: { status: SubjectStatus }) {
  return <StatusChip tone={subjectTone[status]}>{subjectStatusLabels[status]}</StatusChip>;
}

export const visitStateLabels: Record<VisitState, string> = {
  not_scheduled: "Not yet scheduled",
  upcoming: "Upcoming",
  due: "Due",
  overdue: "Overdue",
  completed_in_window: "Done in window",
  completed_out_of_window: "Done out of window",
  completed_unanchored: "Done, anchor date missing",
  missed: "Missed",
};
const visitTone: Record<VisitState, Tone> = {
  not_scheduled: "neutral",
  upcoming: "progress",
  due: "info",
  overdue: "danger",
  completed_in_window: "ok",
  completed_out_of_window: "attention",
  completed_unanchored: "attention",
  missed: "danger",
};

export function VisitStateChip({ state }: { state: VisitState }) {
  return <StatusChip tone={visitTone[state]}>{visitStateLabels[state]}</StatusChip>;
}
