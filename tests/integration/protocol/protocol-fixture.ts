// Protocol versions inserted straight into a study fixture, in any state, for the API tests.
import { randomUUID } from "node:crypto";
import { db, type StudyFixture } from "../../support/db";
import { protocolVersions } from "@/server/db/schema";
import type { VisitSchedule } from "@/lib/protocol/visit-schedule";

export const docOf = (...paragraphs: string[]) => ({
  type: "doc" as const,
  content: [
    { type: "heading", attrs: { level: 1 }, content: [{ type: "text", text: "Design" }] },
    ...paragraphs.map((text) => ({ type: "paragraph", content: [{ type: "text", text }] })),
  ],
});

export const baseSchedule: VisitSchedule = [
  { code: "SCR", label: "Screening", anchor: "consent", dayOffset: 0, windowBefore: 0, windowAfter: 28, procedures: ["Eligibility review"] },
  { code: "M1", label: "Month 1", anchor: "implant", dayOffset: 30, windowBefore: 7, windowAfter: 7, procedures: ["Adverse event review"] },
];

type State = (typeof protocolVersions.$inferInsert)["state"];

export async function insertVersion(
  fx: StudyFixture,
  o: { id?: string; label: string; state: State; parentId?: string | null; authorId?: string; content?: unknown; visitSchedule?: VisitSchedule; amendmentNumber?: number | null; substantial?: boolean | null; substantialReason?: string | null; summaryOfChanges?: { section: string; before: string; after: string; rationale: string }[] },
) {
  const [row] = await db
    .insert(protocolVersions)
    .values({
      id: o.id ?? randomUUID(),
      studyId: fx.study.id,
      parentId: o.parentId ?? null,
      versionLabel: o.label,
      amendmentNumber: o.amendmentNumber ?? (o.parentId ? 1 : null),
      state: o.state,
      title: "Clinical investigation plan",
      substantial: o.substantial ?? (o.parentId ? true : null),
      substantialReason: o.substantialReason ?? (o.parentId ? "Adds a visit" : null),
      content: o.content ?? docOf("The first paragraph."),
      visitSchedule: o.visitSchedule ?? baseSchedule,
      summaryOfChanges: o.summaryOfChanges ?? [],
      authorId: o.authorId ?? fx.userByRole.protocol_writer.id,
      releasedAt: o.state === "released" || o.state === "superseded" ? new Date() : null,
      contentHash: o.state === "released" || o.state === "superseded" ? "0".repeat(64) : null,
    })
    .returning();
  return row!;
}
