// Invented protocol content for the tests (no real study, person or site).
import type { ProtocolDoc, ProtocolNode } from "@/lib/protocol/types";
import type { ScheduledVisit } from "@/lib/protocol/visit-schedule";

export const t = (text: string, marks?: ProtocolNode["marks"]): ProtocolNode => (marks ? { type: "text", text, marks } : { type: "text", text });
export const p = (...content: (string | ProtocolNode)[]): ProtocolNode => ({
  type: "paragraph",
  content: content.map((c) => (typeof c === "string" ? t(c) : c)),
});
export const h = (level: 1 | 2 | 3, text: string): ProtocolNode => ({ type: "heading", attrs: { level }, content: [t(text)] });
export const doc = (...content: ProtocolNode[]): ProtocolDoc => ({ type: "doc", content });

export const v1Doc = doc(
  p("Study KESTREL-VP: an invented feasibility study of a visual implant."),
  h(1, "Introduction"),
  p("The implant has 96 electrodes placed on the visual cortex."),
  h(2, "Background"),
  p("Earlier bench work showed stable stimulation thresholds over six months."),
  h(1, "Objectives"),
  p("The primary objective is safety at twelve months after implantation."),
  { type: "bulletList", content: [{ type: "listItem", content: [p("Device-related serious adverse events")] }] },
  h(1, "Visits"),
  p("Subjects attend the clinic at each scheduled visit."),
);

export const v2Doc = doc(
  p("Study KESTREL-VP: an invented feasibility study of a visual implant."),
  h(1, "Introduction"),
  p("The implant has 96 electrodes placed on the primary visual cortex."),
  h(2, "Background"),
  p("Earlier bench work showed stable stimulation thresholds over six months."),
  h(1, "Objectives"),
  p("The primary objective is safety at twenty-four months after implantation."),
  { type: "bulletList", content: [{ type: "listItem", content: [p("Device-related serious adverse events")] }] },
  p("A secondary objective is reading speed with the implant switched on."),
  h(1, "Visits"),
);

export const visitsV1: ScheduledVisit[] = [
  { code: "SCR", label: "Screening", anchor: "consent", dayOffset: 0, windowBefore: 0, windowAfter: 28, procedures: ["Eligibility"] },
  { code: "IMP", label: "Implantation", anchor: "implant", dayOffset: 0, windowBefore: 0, windowAfter: 0, procedures: [] },
  { code: "M3", label: "Month 3", anchor: "implant", dayOffset: 90, windowBefore: 7, windowAfter: 7, procedures: ["Phosphene mapping"] },
];

export const visitsV2: ScheduledVisit[] = [
  { code: "SCR", label: "Screening", anchor: "consent", dayOffset: 0, windowBefore: 0, windowAfter: 28, procedures: ["Eligibility"] },
  { code: "IMP", label: "Implantation", anchor: "implant", dayOffset: 0, windowBefore: 0, windowAfter: 0, procedures: [] },
  { code: "M3", label: "Month 3", anchor: "implant", dayOffset: 90, windowBefore: 14, windowAfter: 14, procedures: ["Phosphene mapping", "Reading test"] },
  { code: "M6", label: "Month 6", anchor: "implant", dayOffset: 180, windowBefore: 14, windowAfter: 14, procedures: ["Reading test"] },
];
