import "server-only";
import type { FieldErrors } from "@/server/api/errors";
import type { SubjectStatus } from "@/lib/subjects/subject-states";

type Dates = {
  status: SubjectStatus;
  consentDate: string;
  screeningDate: string | null;
  enrolmentDate: string | null;
  implantDate: string | null;
  deviceSerial: string | null;
  endedOn: string | null;
};

const reached = (status: SubjectStatus, dates: Dates, step: "enrolled" | "implanted") =>
  step === "enrolled"
    ? ["enrolled", "implanted", "follow_up", "completed"].includes(status) || (status === "withdrawn" && dates.enrolmentDate !== null)
    : ["implanted", "follow_up", "completed"].includes(status) || (status === "withdrawn" && dates.implantDate !== null);

/**
 * Field errors for a subject's dates: consent ≤ screening ≤ enrolment ≤ implant (consent comes
 * before any study procedure), each date present exactly when the subject has reached its step,
 * none after today at the site, a device serial with the implant.
 */
export function checkSubjectDates(d: Dates, today: string): FieldErrors {
  const fields: FieldErrors = {};
  const add = (k: string, m: string) => (fields[k] ??= []).push(m);
  const order: [string, string | null][] = [
    ["consentDate", d.consentDate],
    ["screeningDate", d.screeningDate],
    ["enrolmentDate", d.enrolmentDate],
    ["implantDate", d.implantDate],
  ];
  let prev: [string, string] | null = null;
  for (const [k, v] of order) {
    if (!v) continue;
    if (v > today) add(k, `Not after today at the site (${today})`);
    if (prev && v < prev[1]) add(k, `Not before ${prev[0].replace("Date", " date")} ${prev[1]}`);
    prev = [k, v];
  }
  if (reached(d.status, d, "enrolled") && !d.enrolmentDate) add("enrolmentDate", "An enrolled subject needs the enrolment date");
  if (!reached(d.status, d, "enrolled") && d.enrolmentDate) add("enrolmentDate", "Record the enrolment date by moving the subject to Enrolled");
  if (reached(d.status, d, "implanted") && !d.implantDate) add("implantDate", "An implanted subject needs the implant date");
  if (!reached(d.status, d, "implanted") && d.implantDate) add("implantDate", "Record the implant date by moving the subject to Implanted");
  if (d.implantDate && !d.deviceSerial) add("deviceSerial", "An implanted subject needs the device serial number");
  if (!d.implantDate && d.deviceSerial) add("deviceSerial", "A device serial is recorded only with an implant");
  if (d.endedOn && d.endedOn > today) add("effectiveOn", `Not after today at the site (${today})`);
  return fields;
}
