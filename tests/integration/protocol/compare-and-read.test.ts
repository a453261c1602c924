// Compare, read and PDF routes: the redline against jsdiff's word diff, what site people may see,
// and the ethics-committee PDFs.
import { beforeAll, describe, expect, it } from "vitest";
import { diffWords } from "diff";
import { callRoute } from "../../support/api";
import { createStudyFixture, type StudyFixture } from "../../support/db";
import * as compareRoute from "@/app/api/v1/studies/[studyId]/protocol/compare/route";
import * as versionsRoute from "@/app/api/v1/studies/[studyId]/protocol/versions/route";
import * as versionRoute from "@/app/api/v1/protocol-versions/[versionId]/route";
import * as pdfRoute from "@/app/api/v1/protocol-versions/[versionId]/pdf/route";
import { baseSchedule, docOf, insertVersion } from "./protocol-fixture";

let fx: StudyFixture;
let v1: string;
let v2: string;
let draft: string;
const before = "The investigator reports every serious adverse event to the sponsor within 3 days.";
const after = "The investigator reports every serious adverse device effect to the sponsor within 2 calendar days.";

beforeAll(async () => {
  fx = await createStudyFixture();
  v1 = (await insertVersion(fx, { label: "1.0", state: "superseded", content: docOf(before, "Unchanged paragraph.") })).id;
  v2 = (
    await insertVersion(fx, {
      label: "2.0",
      state: "released",
      parentId: v1,
      content: docOf(after, "Unchanged paragraph.", "A new paragraph."),
      visitSchedule: [...baseSchedule.slice(0, 1), { ...baseSchedule[1]!, windowAfter: 10 }],
    })
  ).id;
  draft = (await insertVersion(fx, { label: "2.1", state: "draft", parentId: v2, substantial: false })).id;
});

describe("compare", () => {
  it("word changes inside the changed block match jsdiff's diffWords on the plain text", async () => {
    const res = await callRoute(compareRoute.GET, { params: { studyId: fx.study.id }, query: { from: v1, to: v2 }, userId: fx.userByRole.monitor.id });
    expect(res.status).toBe(200);
    const { redline, visits } = res.json;
    const changed = redline.rows.filter((r: { kind: string }) => r.kind === "changed");
    expect(changed).toHaveLength(1);
    // Reference: jsdiff (the `diff` package) diffWords of the same two sentences.
    const ref = diffWords(before, after);
    const refIns = ref.filter((p) => p.added).map((p) => p.value.trim()).join(" ");
    const refDel = ref.filter((p) => p.removed).map((p) => p.value.trim()).join(" ");
    const ours = (side: "right" | "left", kind: string) =>
      changed[0][side].parts.filter((p: { kind: string }) => p.kind === kind).map((p: { text: string }) => p.text.trim()).join(" ");
    expect(ours("right", "inserted")).toBe(refIns);
    expect(ours("left", "deleted")).toBe(refDel);
    expect(redline.rows.filter((r: { kind: string }) => r.kind === "inserted").map((r: { right: { text: string } }) => r.right.text)).toEqual(["A new paragraph."]);
    expect(visits.changed).toEqual([expect.objectContaining({ code: "M1", fields: [{ field: "windowAfter", before: 7, after: 10 }] })]);
  });

  it("a version of another study is not found", async () => {
    const other = await createStudyFixture();
    const foreign = (await insertVersion(other, { label: "1.0", state: "released" })).id;
    const res = await callRoute(compareRoute.GET, { params: { studyId: fx.study.id }, query: { from: v1, to: foreign }, userId: fx.userByRole.monitor.id });
    expect(res.status).toBe(404);
  });
});

describe("what site people see", () => {
  it("an investigator lists and reads released versions only; drafts are not found", async () => {
    const inv = fx.userByRole.investigator.id;
    const list = await callRoute(versionsRoute.GET, { params: { studyId: fx.study.id }, userId: inv });
    expect(list.json.versions.map((v: { versionLabel: string }) => v.versionLabel)).toEqual(["2.0", "1.0"]);
    expect((await callRoute(versionRoute.GET, { params: { versionId: v2 }, userId: inv })).status).toBe(200);
    expect((await callRoute(versionRoute.GET, { params: { versionId: draft }, userId: inv })).status).toBe(404);
    const writerList = await callRoute(versionsRoute.GET, { params: { studyId: fx.study.id }, userId: fx.userByRole.protocol_writer.id });
    expect(writerList.json.versions.map((v: { versionLabel: string }) => v.versionLabel)).toEqual(["2.1", "2.0", "1.0"]);
  });
});

describe("PDF", () => {
  for (const kind of ["clean", "tracked", "summary", "package"] as const)
    it(`${kind} PDF of a released version`, async () => {
      const res = await callRoute(pdfRoute.GET, { params: { versionId: v2 }, query: { kind }, userId: fx.userByRole.investigator.id });
      expect(res.status).toBe(200);
      expect(res.headers.get("content-type")).toBe("application/pdf");
      expect(String(res.json).startsWith("%PDF-")).toBe(true);
      expect(res.headers.get("content-disposition")).toContain(`protocol-2.0-${kind}.pdf`);
    });
});
