// Subject path (DESIGN.md capability 4): Screening → Screen failed, or Enrolled → Implanted →
// Follow-up → Completed; Withdrawn from any active state. Screen failed, Completed and Withdrawn end it.

export const subjectStatuses = [
  "screening",
  "screen_failed",
  "enrolled",
  "implanted",
  "follow_up",
  "completed",
  "withdrawn",
] as const;
export type SubjectStatus = (typeof subjectStatuses)[number];

export const subjectStatusLabels: Record<SubjectStatus, string> = {
  screening: "Screening",
  screen_failed: "Screen failed",
  enrolled: "Enrolled",
  implanted: "Implanted",
  follow_up: "Follow-up",
  completed: "Completed",
  withdrawn: "Withdrawn",
};

export const activeSubjectStatuses: readonly SubjectStatus[] = ["screening", "enrolled", "implanted", "follow_up"];
export const finalSubjectStatuses: readonly SubjectStatus[] = ["screen_failed", "completed", "withdrawn"];

export function isSubjectStatus(value: unknown): value is SubjectStatus {
  return typeof value === "string" && (subjectStatuses as readonly string[]).includes(value);
}

export function isActiveSubjectStatus(status: SubjectStatus): boolean {
  return activeSubjectStatuses.includes(status);
}

// The forward step along the main path; Withdrawn is handled separately (allowed from any active state).
const nextOnPath: Partial<Record<SubjectStatus, readonly SubjectStatus[]>> = {
  screening: ["screen_failed", "enrolled"],
  enrolled: ["implanted"],
  implanted: ["follow_up"],
  follow_up: ["completed"],
};

/** Statuses that require a written reason. */
export const statusesNeedingReason: readonly SubjectStatus[] = ["screen_failed", "withdrawn"];

export type SubjectTransitionCheck = { ok: true } | { ok: false; code: SubjectTransitionRefusal; message: string };
export type SubjectTransitionRefusal = "same_status" | "final_status" | "not_allowed" | "reason_required" | "reason_not_expected";

/** Every status the subject may move to from `from`, in path order. */
export function allowedNextStatuses(from: SubjectStatus): SubjectStatus[] {
  if (!isActiveSubjectStatus(from)) return [];
  return [...(nextOnPath[from] ?? []), "withdrawn"];
}

/** Pure check of one status change; refusals say why in words a coordinator understands. */
export function checkSubjectTransition(
  from: SubjectStatus,
  to: SubjectStatus,
  options: { reason?: string | null } = {},
): SubjectTransitionCheck {
  const reason = options.reason?.trim() ?? "";
  if (from === to) {
    return { ok: false, code: "same_status", message: `The subject is already ${subjectStatusLabels[from]}.` };
  }
  if (!isActiveSubjectStatus(from)) {
    return {
      ok: false,
      code: "final_status",
      message: `A subject who is ${subjectStatusLabels[from]} cannot change status any more.`,
    };
  }
  if (!allowedNextStatuses(from).includes(to)) {
    const options_ = allowedNextStatuses(from).map((s) => subjectStatusLabels[s]).join(" or ");
    return {
      ok: false,
      code: "not_allowed",
      message: `A subject in ${subjectStatusLabels[from]} cannot move to ${subjectStatusLabels[to]}; next can only be ${options_}.`,
    };
  }
  if (statusesNeedingReason.includes(to) && reason === "") {
    return { ok: false, code: "reason_required", message: `Give the reason for ${subjectStatusLabels[to]}.` };
  }
  if (!statusesNeedingReason.includes(to) && reason !== "") {
    return {
      ok: false,
      code: "reason_not_expected",
      message: `A reason is recorded only for Screen failed or Withdrawn, not for ${subjectStatusLabels[to]}.`,
    };
  }
  return { ok: true };
}
