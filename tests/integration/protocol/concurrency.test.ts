// No lost work: saves carry the revision they were based on; of two saves from the same base one
// wins and the other gets a 409 carrying the winner's text, so the loser can merge and save again.
import { beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { protocolVersions } from "@/server/db/schema";
import { nodePlainText } from "@/lib/protocol/plain-text";
import { callRoute } from "../../support/api";
import { createStudyFixture, db, type StudyFixture } from "../../support/db";
import * as versionRoute from "@/app/api/v1/protocol-versions/[versionId]/route";
import { docOf, insertVersion } from "./protocol-fixture";

let fx: StudyFixture;
let draftId: string;
beforeAll(async () => {
  fx = await createStudyFixture();
  const v1 = await insertVersion(fx, { label: "1.0", state: "released" });
  draftId = (await insertVersion(fx, { label: "1.1", state: "draft", parentId: v1.id, substantial: false })).id;
});

const put = (body: Record<string, unknown>) => callRoute(versionRoute.PUT, { method: "PUT", params: { versionId: draftId }, body, userId: fx.userByRole.protocol_writer.id });
const text = async () => nodePlainText((await db.select().from(protocolVersions).where(eq(protocolVersions.id, draftId)))[0]!.content as never);

describe("two saves from the same base revision", () => {
  it("sequential: the second gets 409 with the first one's text", async () => {
    expect((await put({ baseRevision: 1, content: docOf("Alice's paragraph.") })).status).toBe(200);
    const stale = await put({ baseRevision: 1, content: docOf("Bob's paragraph.") });
    expect(stale.status).toBe(409);
    expect(stale.json.error.code).toBe("conflict");
    expect(stale.json.current.revision).toBe(2);
    expect(nodePlainText(stale.json.current.content)).toContain("Alice's paragraph.");
    expect(await text()).toContain("Alice's paragraph.");
    // Bob merges onto the current revision: both edits survive.
    const merged = await put({ baseRevision: 2, content: docOf("Alice's paragraph.", "Bob's paragraph.") });
    expect(merged.status).toBe(200);
    expect(await text()).toMatch(/Alice's paragraph\.[\s\S]*Bob's paragraph\./);
  });

  it("concurrent: exactly one wins, the other is told, nothing is overwritten silently", async () => {
    const base = (await db.select().from(protocolVersions).where(eq(protocolVersions.id, draftId)))[0]!.revision;
    const results = await Promise.all([put({ baseRevision: base, content: docOf("Version A.") }), put({ baseRevision: base, content: docOf("Version B.") })]);
    const statuses = results.map((r) => r.status).sort();
    expect(statuses).toEqual([200, 409]);
    const winner = results.find((r) => r.status === 200)!;
    const loser = results.find((r) => r.status === 409)!;
    expect(winner.json.version.revision).toBe(base + 1);
    const stored = await text();
    expect(nodePlainText(loser.json.current.content)).toBe(stored);
    expect(stored === "DesignVersion A." || stored.includes("Version A.") !== stored.includes("Version B.")).toBe(true);
  });
});
