import { calendarDaysBetween, addCalendarDays } from "@/lib/visits/calendar-date";
import type { IsoDate } from "@/lib/protocol/visit-schedule";

// The state of one acknowledgement request as the compliance matrix shows it.

export const acknowledgementStates = ["pending", "overdue", "acknowledged"] as const;
export type AcknowledgementState = (typeof acknowledgementStates)[number];

export type AcknowledgementStatus =
  | { state: "acknowledged"; signedOn: IsoDate; late: boolean }
  | { state: "pending"; daysLeft: number }
  | { state: "overdue"; daysOver: number };

/**
 * `today` is the site's calendar date now. Due on the due date itself = pending with 0 days left;
 * the day after = overdue by 1. A signature counts as late when signed after the due date.
 */
export function acknowledgementStatus({ dueOn, today, signedOn }: { dueOn: IsoDate; today: IsoDate; signedOn?: IsoDate | null }): AcknowledgementStatus {
  if (signedOn) return { state: "acknowledged", signedOn, late: calendarDaysBetween(dueOn, signedOn) > 0 };
  const left = calendarDaysBetween(today, dueOn);
  return left >= 0 ? { state: "pending", daysLeft: left } : { state: "overdue", daysOver: -left };
}

/** Reminder goes out once the due date is at most `daysBefore` days away and not yet passed. */
export function reminderDue({ dueOn, today, daysBefore }: { dueOn: IsoDate; today: IsoDate; daysBefore: number }): boolean {
  const left = calendarDaysBetween(today, dueOn);
  return left >= 0 && left <= daysBefore;
}

/** The first day a reminder may go out. */
export const reminderFrom = (dueOn: IsoDate, daysBefore: number): IsoDate => addCalendarDays(dueOn, -daysBefore);

/** Words for a status, e.g. "3 days left", "Overdue by 2 days". */
export function describeStatus(s: AcknowledgementStatus): string {
  const days = (n: number) => `${n} day${n === 1 ? "" : "s"}`;
  switch (s.state) {
    case "acknowledged":
      return s.late ? `Acknowledged ${s.signedOn} (late)` : `Acknowledged ${s.signedOn}`;
    case "pending":
      return s.daysLeft === 0 ? "Due today" : `${days(s.daysLeft)} left`;
    case "overdue":
      return `Overdue by ${days(s.daysOver)}`;
  }
}
