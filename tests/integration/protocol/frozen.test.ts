// Released content is frozen in the database itself, not only in the API.
import { beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { protocolVersions } from "@/server/db/schema";
import { createStudyFixture, db, type StudyFixture } from "../../support/db";
import { docOf, insertVersion } from "./protocol-fixture";

let fx: StudyFixture;
beforeAll(async () => {
  fx = await createStudyFixture();
});

const pgCode = (e: unknown) => (e as { cause?: { code?: string }; code?: string }).cause?.code ?? (e as { code?: string }).code;

describe("a released version in the database", () => {
  it("refuses a change of content, schedule, summary or hash", async () => {
    const v = await insertVersion(fx, { label: "1.0", state: "released" });
    for (const set of [{ content: docOf("Changed.") }, { visitSchedule: [] }, { summaryOfChanges: [{ section: "x", before: "", after: "", rationale: "" }] }, { contentHash: "f".repeat(64) }]) {
      const err = await db.update(protocolVersions).set(set).where(eq(protocolVersions.id, v.id)).catch((e: unknown) => e);
      expect(pgCode(err), JSON.stringify(Object.keys(set))).toBe("23514");
    }
  });

  it("may become superseded, never a draft again", async () => {
    const v = await insertVersion(fx, { label: "1.1", state: "released" });
    expect(pgCode(await db.update(protocolVersions).set({ state: "draft" }).where(eq(protocolVersions.id, v.id)).catch((e: unknown) => e))).toBe("23514");
    await db.update(protocolVersions).set({ state: "superseded" }).where(eq(protocolVersions.id, v.id));
    expect(pgCode(await db.update(protocolVersions).set({ state: "released" }).where(eq(protocolVersions.id, v.id)).catch((e: unknown) => e))).toBe("23514");
  });

  it("needs a content hash", async () => {
    const err = await db.insert(protocolVersions).values({ studyId: fx.study.id, versionLabel: "3.0", state: "released", title: "t", content: docOf("x"), authorId: fx.userByRole.protocol_writer.id }).catch((e: unknown) => e);
    expect(pgCode(err)).toBe("23514");
  });

  it("a draft stays editable", async () => {
    const v = await insertVersion(fx, { label: "2.0", state: "draft" });
    await db.update(protocolVersions).set({ content: docOf("Edited.") }).where(eq(protocolVersions.id, v.id));
  });
});
