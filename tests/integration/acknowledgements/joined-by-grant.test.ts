// Granting the investigator role at a site asks the person, in the same transaction, to acknowledge
// the version in force there (rather than waiting for the daily job).
import { and, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import * as grant from "@/app/api/v1/studies/[studyId]/memberships/route";
import { acknowledgementRequests, siteVersionApprovals, users } from "@/server/db/schema";
import { callRoute } from "../../support/api";
import { createStudyFixture, db, type StudyFixture } from "../../support/db";
import { insertReleasedVersion } from "./support";

let fx: StudyFixture;
beforeAll(async () => {
  fx = await createStudyFixture();
});

describe("an investigator granted a site role", () => {
  it("gets an acknowledgement request for the version in force at that site", async () => {
    const version = await insertReleasedVersion(fx.study.id, fx.userByRole.protocol_writer.id, { label: "1.0", releasedAt: new Date("2026-01-05T09:00:00Z") });
    await db.insert(siteVersionApprovals).values({ siteId: fx.siteA.id, versionId: version.id, approvedOn: "2026-01-20" });
    const [person] = await db.insert(users).values({ email: `newinv.${fx.tag}@test.example`, name: "New Investigator" }).returning();
    const res = await callRoute(grant.POST, {
      method: "POST",
      params: { studyId: fx.study.id },
      body: { userId: person!.id, role: "investigator", siteId: fx.siteA.id },
      userId: fx.userByRole.sponsor_admin.id,
    });
    expect(res.status).toBe(201);
    const requests = await db
      .select()
      .from(acknowledgementRequests)
      .where(and(eq(acknowledgementRequests.userId, person!.id), eq(acknowledgementRequests.versionId, version.id)));
    expect(requests).toHaveLength(1);
    expect(requests[0]!.siteId).toBe(fx.siteA.id);
  });
});
