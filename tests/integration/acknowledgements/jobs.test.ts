// Reminder and overdue-digest jobs: run twice in a period, each message goes out once (read back
// from the SMTP fake after the outbox is delivered).
import { eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { runScheduledJob } from "@/server/jobs/run-scheduled-job";
import { deliverOutbox } from "@/server/mail/deliver-outbox";
import { notifyVersionReleased } from "@/server/acknowledgements/on-release";
import { acknowledgementReminderJob, overdueAcknowledgementDigestJob, sendAcknowledgementReminders } from "@/server/acknowledgements/reminder-jobs";
import { acknowledgementRequests } from "@/server/db/schema";
import { createStudyFixture, db, type StudyFixture } from "../../support/db";
import { inbox, insertReleasedVersion } from "./support";

let fx: StudyFixture;
// A fixed day far from other tests' periods: 2031-03-10, 08:00 UTC.
const now = new Date("2031-03-10T08:00:00Z");

beforeAll(async () => {
  fx = await createStudyFixture();
  // Released 2031-02-25: due 2031-03-11 at both sites (14 days) → 1 day left on 2031-03-10: reminder due (3 days before).
  const soon = await insertReleasedVersion(fx.study.id, fx.userByRole.protocol_writer.id, { label: "1.0", releasedAt: new Date("2031-02-25T09:00:00Z") });
  // Released 2031-02-10: due 2031-02-24 → overdue by 14 days on 2031-03-10.
  const late = await insertReleasedVersion(fx.study.id, fx.userByRole.protocol_writer.id, { label: "0.9", releasedAt: new Date("2031-02-10T09:00:00Z") });
  await db.transaction(async (tx) => {
    await notifyVersionReleased(tx, { versionId: soon.id });
    await notifyVersionReleased(tx, { versionId: late.id });
  });
  const due = await db.select({ dueOn: acknowledgementRequests.dueOn }).from(acknowledgementRequests).where(eq(acknowledgementRequests.studyId, fx.study.id));
  expect(due.map((d) => d.dueOn).sort()).toEqual(["2031-02-24", "2031-02-24", "2031-03-11", "2031-03-11"]);
});

const countTo = (mails: Awaited<ReturnType<typeof inbox>>, email: string, subjectPart: string) =>
  mails.filter((m) => m.to.some((t) => t.address.toLowerCase() === email.toLowerCase()) && m.subject.includes(subjectPart)).length;

describe("scheduled acknowledgement mail", () => {
  it("runs each job once per period and sends each reminder and digest once", async () => {
    expect(await runScheduledJob(acknowledgementReminderJob, now)).toBe("ran");
    expect(await runScheduledJob(acknowledgementReminderJob, now)).toBe("already-done");
    expect(await runScheduledJob(acknowledgementReminderJob, new Date(now.getTime() + 3_600_000))).toBe("already-done");
    expect(await runScheduledJob(overdueAcknowledgementDigestJob, now)).toBe("ran");
    expect(await runScheduledJob(overdueAcknowledgementDigestJob, now)).toBe("already-done");
    // A restart that re-runs the work itself (not through the job table) queues nothing new.
    expect((await db.transaction((tx) => sendAcknowledgementReminders(tx, { now }))).sent).toBe(0);

    await deliverOutbox();
    await deliverOutbox();
    const mails = await inbox();
    expect(countTo(mails, fx.userByRole.investigator.email, "Reminder")).toBe(1);
    expect(countTo(mails, fx.userByRole.sponsor_admin.email, "overdue protocol acknowledgement")).toBe(1);
    expect(countTo(mails, fx.userByRole.medical_reviewer.email, "overdue protocol acknowledgement")).toBe(1);
    // Site people and other sponsor roles do not get the digest.
    expect(countTo(mails, fx.userByRole.coordinator.email, "overdue")).toBe(0);
    expect(countTo(mails, fx.userByRole.sponsor_finance.email, "overdue")).toBe(0);
    const digest = mails.find((m) => m.to.some((t) => t.address === fx.userByRole.sponsor_admin.email) && m.subject.includes("overdue"));
    expect(digest?.subject).toContain("2 overdue");
    expect(digest?.text).toContain("Overdue by 14 days");
  });

  it("the next day brings a new digest but no second reminder", async () => {
    const tomorrow = new Date(now.getTime() + 24 * 3_600_000);
    expect(await runScheduledJob(acknowledgementReminderJob, tomorrow)).toBe("ran");
    expect(await runScheduledJob(overdueAcknowledgementDigestJob, tomorrow)).toBe("ran");
    await deliverOutbox();
    const mails = await inbox();
    expect(countTo(mails, fx.userByRole.investigator.email, "Reminder")).toBe(1);
    expect(countTo(mails, fx.userByRole.sponsor_admin.email, "overdue protocol acknowledgement")).toBe(2);
  });
});
