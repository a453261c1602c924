import { and, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { PATCH } from "@/app/api/v1/studies/[studyId]/acknowledgements/settings/route";
import { notifyVersionReleased } from "@/server/acknowledgements/on-release";
import { acknowledgementRequests, auditEvents } from "@/server/db/schema";
import { callRoute } from "../../support/api";
import { createStudyFixture, db, type StudyFixture } from "../../support/db";
import { insertReleasedVersion } from "./support";

let fx: StudyFixture;
beforeAll(async () => {
  fx = await createStudyFixture();
});

const patch = (userId: string, body: unknown) => callRoute(PATCH, { method: "PATCH", path: "/api/v1/studies/x/acknowledgements/settings", params: { studyId: fx.study.id }, body, userId });

describe("acknowledgement deadline setting", () => {
  it("the sponsor administrator changes it; later releases use it; the change is audited", async () => {
    expect((await patch(fx.userByRole.sponsor_admin.id, { ackDeadlineDays: 7 })).status).toBe(200);
    const [audit] = await db.select().from(auditEvents).where(and(eq(auditEvents.action, "study.ack_deadline_changed"), eq(auditEvents.entityId, fx.study.id)));
    expect(audit?.before).toEqual({ ackDeadlineDays: 14 });
    expect(audit?.after).toEqual({ ackDeadlineDays: 7 });
    // Released 2026-02-25 12:00 UTC (13:00 Berlin, 21:00 Tokyo): + 7 days crosses the February month end.
    const v = await insertReleasedVersion(fx.study.id, fx.userByRole.protocol_writer.id, { label: "1.0", releasedAt: new Date("2026-02-25T12:00:00Z") });
    await db.transaction((tx) => notifyVersionReleased(tx, { versionId: v.id }));
    const rows = await db.select().from(acknowledgementRequests).where(eq(acknowledgementRequests.versionId, v.id));
    expect(rows.map((r) => r.dueOn)).toEqual(["2026-03-04", "2026-03-04"]);
  });

  it("refuses a value out of range, and anyone but the sponsor administrator", async () => {
    expect((await patch(fx.userByRole.sponsor_admin.id, { ackDeadlineDays: 0 })).status).toBe(400);
    expect((await patch(fx.userByRole.sponsor_admin.id, { ackDeadlineDays: 2.5 })).status).toBe(400);
    expect((await patch(fx.userByRole.medical_reviewer.id, { ackDeadlineDays: 10 })).status).toBe(403);
  });
});
