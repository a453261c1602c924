// Protocol versions of the demo study: 1.0 (original, released 2025-01), 2.0 (amendment 1,
// substantial: adds the M18 visit and a safety MRI, released 2026-03) and 2.1 (amendment 2,
// non-substantial, in review). Invented text. Visit codes are stable: the visit calendars and
// budgets of the demo read them.
import { eq } from "drizzle-orm";
import { auditEvents, protocolVersions, studies, users } from "../../src/server/db/schema";
import { hashProtocolContent } from "../../src/lib/protocol/content-hash";
import { computeRedline, diffVisitSchedules } from "../../src/lib/protocol/redline";
import { prefillSummaryOfChanges } from "../../src/lib/protocol/summary-of-changes";
import { sanitizeProtocolDoc } from "../../src/lib/protocol/sanitize";
import type { ProtocolDoc, ProtocolNode } from "../../src/lib/protocol/types";
import type { VisitSchedule } from "../../src/lib/protocol/visit-schedule";
import { demoStudy } from "./demo-data";
import type { SeedContext } from "./context";

// ---- tiny builders for ProseMirror JSON ----
const t = (text: string, marks?: string[]): ProtocolNode => (marks ? { type: "text", text, marks: marks.map((m) => ({ type: m })) } : { type: "text", text });
const p = (...parts: (string | ProtocolNode)[]): ProtocolNode => ({ type: "paragraph", content: parts.map((x) => (typeof x === "string" ? t(x) : x)) });
const h = (level: 1 | 2 | 3, text: string): ProtocolNode => ({ type: "heading", attrs: { level }, content: [t(text)] });
const ul = (...items: string[]): ProtocolNode => ({ type: "bulletList", content: items.map((i) => ({ type: "listItem", content: [p(i)] })) });
const ol = (...items: string[]): ProtocolNode => ({ type: "orderedList", attrs: { start: 1 }, content: items.map((i) => ({ type: "listItem", content: [p(i)] })) });
const table = (header: string[], rows: string[][]): ProtocolNode => ({
  type: "table",
  content: [
    { type: "tableRow", content: header.map((c) => ({ type: "tableHeader", attrs: { colspan: 1, rowspan: 1, colwidth: null }, content: [p(c)] })) },
    ...rows.map((r) => ({ type: "tableRow", content: r.map((c) => ({ type: "tableCell", attrs: { colspan: 1, rowspan: 1, colwidth: null }, content: [p(c)] })) })),
  ],
});

// ---- schedules ----
export const scheduleV1: VisitSchedule = [
  { code: "SCR", label: "Screening", anchor: "consent", dayOffset: 0, windowBefore: 0, windowAfter: 28, procedures: ["Eligibility review", "Ophthalmic examination", "Brain MRI", "Medical history"] },
  { code: "IMP", label: "Implantation", anchor: "enrolment", dayOffset: 14, windowBefore: 7, windowAfter: 14, procedures: ["Implantation surgery", "Intra-operative impedance check"] },
  { code: "W1", label: "Week 1 wound check", anchor: "implant", dayOffset: 7, windowBefore: 3, windowAfter: 3, procedures: ["Wound inspection", "Adverse event review"] },
  { code: "M1", label: "Month 1 activation", anchor: "implant", dayOffset: 30, windowBefore: 7, windowAfter: 7, procedures: ["Device activation", "Phosphene mapping", "Adverse event review"] },
  { code: "M3", label: "Month 3", anchor: "implant", dayOffset: 90, windowBefore: 14, windowAfter: 14, procedures: ["Visual function battery", "Device interrogation", "Adverse event review"] },
  { code: "M6", label: "Month 6", anchor: "implant", dayOffset: 182, windowBefore: 14, windowAfter: 14, procedures: ["Visual function battery", "Device interrogation", "Quality-of-life questionnaire", "Adverse event review"] },
  { code: "M12", label: "Month 12", anchor: "implant", dayOffset: 365, windowBefore: 30, windowAfter: 30, procedures: ["Visual function battery", "Device interrogation", "Quality-of-life questionnaire", "Adverse event review"] },
  { code: "M24", label: "Month 24 (end of follow-up)", anchor: "implant", dayOffset: 730, windowBefore: 30, windowAfter: 30, procedures: ["Visual function battery", "Device interrogation", "Quality-of-life questionnaire", "Adverse event review", "End-of-study assessment"] },
];

// Amendment 1: a safety MRI at M12 and a new M18 visit.
export const scheduleV2: VisitSchedule = [
  ...scheduleV1.slice(0, 6),
  { ...scheduleV1[6]!, procedures: [...scheduleV1[6]!.procedures, "Brain MRI (safety)"] },
  { code: "M18", label: "Month 18", anchor: "implant", dayOffset: 547, windowBefore: 30, windowAfter: 30, procedures: ["Visual function battery", "Device interrogation", "Adverse event review"] },
  scheduleV1[7]!,
];

// Amendment 2: the week-1 window widened to ±4 days (weekend surgery lists).
export const scheduleV21: VisitSchedule = scheduleV2.map((v) => (v.code === "W1" ? { ...v, windowBefore: 4, windowAfter: 4 } : v));

// ---- documents ----
function protocolDoc(version: "1.0" | "2.0" | "2.1"): ProtocolDoc {
  const v2 = version !== "1.0";
  const v21 = version === "2.1";
  const schedule = v21 ? scheduleV21 : v2 ? scheduleV2 : scheduleV1;
  const dayText = (d: number) => (d >= 0 ? `+${d}` : String(d));
  return {
    type: "doc",
    content: [
      p(t("KESTREL-VP clinical investigation plan", ["bold"])),
      p(`Version ${version}. Investigational device: KV-96 cortical visual implant (fictional). Sponsor: Corvid Neuro-Optics (fictional).`),
      h(1, "Synopsis"),
      table(
        ["Item", "Description"],
        [
          ["Design", "Prospective, multi-centre, single-arm clinical investigation"],
          ["Population", "Adults aged 22 to 75 with acquired bilateral blindness (bare light perception or worse) for at least 2 years"],
          ["Sample size", "About 60 implanted subjects at up to 12 sites"],
          ["Follow-up", v2 ? "24 months after implantation, with visits at 1 week and 1, 3, 6, 12, 18 and 24 months" : "24 months after implantation, with visits at 1 week and 1, 3, 6, 12 and 24 months"],
        ],
      ),
      h(1, "Background and rationale"),
      h(2, "Acquired blindness"),
      p("Loss of sight after a lifetime of vision leaves the visual cortex largely intact. Stimulating it directly may restore a coarse, useful perception of light and shape where no retinal or optic-nerve approach is possible."),
      h(2, "The investigational device"),
      p("The KV-96 implant carries 96 penetrating electrodes on four tiles placed on the primary visual cortex, a wireless receiver under the scalp, and a head-worn camera and processor. Each electrode can evoke a phosphene, a small spot of perceived light."),
      p("Pre-clinical testing showed stable impedances over 12 months and no tissue reaction beyond the expected glial sheath."),
      h(1, "Objectives and endpoints"),
      h(2, "Primary objective"),
      p(
        "To assess the safety of the KV-96 implant through ",
        t("24 months", ["bold"]),
        " after implantation: the rate of serious adverse device effects (SADE) per 100 patient-years.",
      ),
      h(2, "Secondary objectives"),
      ul(
        "Visual function: square localisation, direction of motion and grating acuity on the visual function battery.",
        "Device performance: number of electrodes evoking a phosphene at each follow-up visit.",
        "Quality of life, on the study's quality-of-life questionnaire.",
      ),
      h(1, "Subject selection"),
      h(2, "Inclusion criteria"),
      ol(
        "Age 22 to 75 years at consent.",
        "Bilateral blindness (bare light perception or worse) for at least 2 years after a period of useful vision.",
        v21 ? "Able to attend all follow-up visits at the site for 24 months, with or without a companion." : "Able to attend all follow-up visits for 24 months.",
        "Written informed consent.",
      ),
      h(2, "Exclusion criteria"),
      ol(
        "Any condition contraindicating a craniotomy or general anaesthesia.",
        "Epilepsy, or a seizure in the last 5 years.",
        "Active infection, or an implanted electronic device that cannot be switched off.",
        "Participation in another interventional investigation in the last 3 months.",
      ),
      h(1, "Procedures"),
      h(2, "Implantation"),
      p("The implant is placed under general anaesthesia through a small occipital craniotomy. Electrode impedances are checked during surgery before the wound is closed."),
      h(2, "Activation and phosphene mapping"),
      p("The device is switched on at the month 1 visit. Each electrode is stimulated in turn to map the position of its phosphene in the visual field; the map is repeated at each follow-up visit."),
      h(2, "Follow-up assessments"),
      p(
        v2
          ? "At months 3, 6, 12, 18 and 24 the subject completes the visual function battery and the device is interrogated. A brain MRI at month 12 checks for changes around the electrode tiles."
          : "At months 3, 6, 12 and 24 the subject completes the visual function battery and the device is interrogated.",
      ),
      h(1, "Schedule of visits"),
      p("Visits are anchored to consent, enrolment or implantation (day 0). A visit outside its window is recorded as a protocol deviation."),
      table(
        ["Visit", "Anchor", "Day", "Window (days)", "Procedures"],
        schedule.map((v) => [`${v.code} ${v.label}`, v.anchor, dayText(v.dayOffset), `−${v.windowBefore} / +${v.windowAfter}`, v.procedures.join("; ")]),
      ),
      h(1, "Safety reporting"),
      h(2, "Definitions"),
      p("Adverse event, adverse device effect, serious adverse event and serious adverse device effect are used as defined for clinical investigations of medical devices."),
      h(2, "Reporting timelines"),
      p(
        "The investigator reports every serious adverse event to the sponsor ",
        t("without delay and no later than 3 calendar days", ["italic"]),
        " after learning of it.",
      ),
      ...(v2 ? [p("A new or enlarging finding on the month 12 MRI is reported as a serious adverse event until the sponsor's medical reviewer has assessed it.")] : []),
      h(1, "Statistics"),
      p("The SADE rate is given per 100 patient-years with an exact Poisson 95% confidence interval. Visual function endpoints are summarised by visit; no formal hypothesis test is planned."),
      h(1, "Ethics and data protection"),
      p("The investigation starts at a site only after its ethics committee has approved this plan. Subjects are known to the sponsor only by a pseudonymous code."),
      ...(v21 ? [p("Questions on this plan go to the study office: ", { type: "text", text: "study-office@kestrel-vp.example", marks: [{ type: "link", attrs: { href: "mailto:study-office@kestrel-vp.example" } }] }, ".")] : []),
    ],
  };
}

export async function seedProtocol({ db, log }: SeedContext) {
  const study = await db.query.studies.findFirst({ where: eq(studies.code, demoStudy.code) });
  if (!study) throw new Error("seed-protocol: run the foundation step first (no demo study)");
  const existing = await db.query.protocolVersions.findFirst({ where: eq(protocolVersions.studyId, study.id) });
  if (existing) {
    log("protocol: versions already present");
    return;
  }
  const writer = await db.query.users.findFirst({ where: eq(users.email, "writer@kestrel-vp.example") });
  const reviewer = await db.query.users.findFirst({ where: eq(users.email, "reviewer@kestrel-vp.example") });
  if (!writer || !reviewer) throw new Error("seed-protocol: demo writer or reviewer missing");

  // Stored as the whitelist normalises it (the API saves the same way).
  const d1 = sanitizeProtocolDoc(protocolDoc("1.0"));
  const d2 = sanitizeProtocolDoc(protocolDoc("2.0"));
  const d21 = sanitizeProtocolDoc(protocolDoc("2.1"));
  const ts = (iso: string) => new Date(iso);

  await db.transaction(async (tx) => {
    const [v1] = await tx
      .insert(protocolVersions)
      .values({
        studyId: study.id,
        versionLabel: "1.0",
        state: "superseded",
        title: "Clinical investigation plan",
        content: d1,
        visitSchedule: scheduleV1,
        contentHash: hashProtocolContent({ doc: d1, visitSchedule: scheduleV1 }),
        revision: 14,
        authorId: writer.id,
        createdAt: ts("2024-10-01T09:00:00Z"),
        updatedAt: ts("2025-01-08T10:00:00Z"),
        submittedAt: ts("2024-12-16T15:00:00Z"),
        approvedBy: reviewer.id,
        approvedAt: ts("2025-01-06T11:00:00Z"),
        releasedBy: reviewer.id,
        releasedAt: ts("2025-01-08T10:00:00Z"),
      })
      .returning();

    // The writer's rationale per row of the prefilled summary (rows are keyed by section).
    const why = (rationales: [string, string][], fallback: string) => (row: { section: string }) => rationales.find(([prefix]) => row.section.startsWith(prefix))?.[1] ?? fallback;
    const why2 = why(
      [
        ["Front matter", "Version number of this amendment."],
        ["1 Synopsis", "The follow-up visits now include month 18."],
        ["5.3", "Adds the month 18 visit and the month 12 brain MRI to the follow-up assessments."],
        ["6 Schedule", "The table in the text follows the new schedule of visits."],
        ["7.2", "States how a new finding on the month 12 MRI is reported until it is assessed."],
        ["Schedule of visits: M18", "An extra visit halfway through the second year, asked for by two ethics committees, to catch late device effects earlier."],
        ["Schedule of visits: M12", "A brain MRI at month 12 checks the tissue around the electrode tiles after the first implanted subjects' findings."],
      ],
      "Follows from the added month 18 visit and month 12 MRI.",
    );
    const soc2 = prefillSummaryOfChanges(computeRedline(d1, d2), diffVisitSchedules(scheduleV1, scheduleV2)).map((row) => ({ ...row, rationale: why2(row) }));
    const [v2] = await tx
      .insert(protocolVersions)
      .values({
        studyId: study.id,
        parentId: v1!.id,
        versionLabel: "2.0",
        amendmentNumber: 1,
        state: "released",
        title: "Clinical investigation plan",
        substantial: true,
        substantialReason: "Adds a follow-up visit and an MRI procedure: changes the burden on subjects and the safety assessments.",
        content: d2,
        visitSchedule: scheduleV2,
        summaryOfChanges: soc2,
        reviewComments: [{ at: "2026-02-20T14:10:00Z", byUserId: reviewer.id, byName: reviewer.name, text: "Please state who assesses a new MRI finding." }],
        contentHash: hashProtocolContent({ doc: d2, visitSchedule: scheduleV2 }),
        revision: 9,
        authorId: writer.id,
        createdAt: ts("2026-01-12T09:00:00Z"),
        updatedAt: ts("2026-03-09T10:00:00Z"),
        submittedAt: ts("2026-02-24T16:00:00Z"),
        approvedBy: reviewer.id,
        approvedAt: ts("2026-03-04T09:30:00Z"),
        releasedBy: reviewer.id,
        releasedAt: ts("2026-03-09T10:00:00Z"),
      })
      .returning();

    const why21 = why(
      [
        ["Front matter", "Version number of this amendment."],
        ["4.1", "Clarifies that a companion may accompany the subject; no change to eligibility."],
        ["6 Schedule", "The table in the text follows the wider week-1 window."],
        ["9 Ethics", "Adds the study office's contact address."],
        ["Schedule of visits: W1", "Sites operating on Fridays could not hold the week-1 check within ±3 days over weekends."],
      ],
      "Editorial.",
    );
    const soc21 = prefillSummaryOfChanges(computeRedline(d2, d21), diffVisitSchedules(scheduleV2, scheduleV21)).map((row) => ({ ...row, rationale: why21(row) }));
    const [v21] = await tx
      .insert(protocolVersions)
      .values({
        studyId: study.id,
        parentId: v2!.id,
        versionLabel: "2.1",
        amendmentNumber: 2,
        state: "in_review",
        title: "Clinical investigation plan",
        substantial: false,
        substantialReason: "Clarifications and a wider week-1 window; no change to safety assessments or eligibility.",
        content: d21,
        visitSchedule: scheduleV21,
        summaryOfChanges: soc21,
        revision: 5,
        authorId: writer.id,
        createdAt: ts("2026-10-05T09:00:00Z"),
        updatedAt: ts("2026-11-20T15:00:00Z"),
        submittedAt: ts("2026-11-20T15:00:00Z"),
      })
      .returning();

    const audit = (action: string, entityId: string, actor: { id: string; name: string }, at: string, before: unknown, after: unknown) =>
      tx.insert(auditEvents).values({ studyId: study.id, actorId: actor.id, actorName: actor.name, action, entityType: "protocol_version", entityId, before, after, at: ts(at) });
    await audit("protocol_version.release", v1!.id, reviewer, "2025-01-08T10:00:00Z", { state: "approved" }, { state: "released" });
    await audit("protocol_version.release", v2!.id, reviewer, "2026-03-09T10:00:00Z", { state: "approved" }, { state: "released" });
    await audit("protocol_version.supersede", v1!.id, reviewer, "2026-03-09T10:00:00Z", { state: "released" }, { state: "superseded" });
    await audit("protocol_version.submit", v21!.id, writer, "2026-11-20T15:00:00Z", { state: "draft" }, { state: "in_review" });
  });
  log("protocol: versions 1.0 (superseded), 2.0 (released), 2.1 (in review)");
}
