// A released protocol version in the browser: the medical reviewer releases it, the investigator
// is asked, reads the redline and signs with her password, the matrix shows it; the coordinator
// records the site's ethics approval with its letter. Runs on a study of its own (not the demo).
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import type { BrowserContext } from "playwright-core";
import { acknowledgementRequests, protocolVersions, users } from "@/server/db/schema";
import { hashPassword } from "@/server/auth/password";
import { notifyVersionReleased } from "@/server/acknowledgements/on-release";
import { signAcknowledgement } from "@/server/acknowledgements/sign-acknowledgement";
import { siteDateAt } from "@/lib/acknowledgements/deadline";
import { createStudyFixture, db, type StudyFixture } from "../support/db";
import { insertReleasedVersion } from "../integration/acknowledgements/support";
import { SignInPage } from "./pages/sign-in-page";
import { AcknowledgementPage } from "./pages/acknowledgement-page";
import { launchBrowser, newPage } from "./support";

const password = "acknowledgement-browser-test-2026";
let fx: StudyFixture;
let v1: { id: string };
let v2: { id: string };
const browsers: { close: () => Promise<void> }[] = [];

async function signedIn(role: "medical_reviewer" | "investigator" | "coordinator") {
  const b: { context: BrowserContext; close: () => Promise<void> } = await launchBrowser();
  browsers.push(b);
  const page = await newPage(b.context);
  await new SignInPage(page).signInAndWaitForHome(fx.userByRole[role].email, password);
  const po = new AcknowledgementPage(page);
  await po.openStudyHome(fx.study.code);
  return { page, po };
}

beforeAll(async () => {
  fx = await createStudyFixture();
  const hash = await hashPassword(password);
  for (const role of ["medical_reviewer", "investigator", "coordinator"] as const) await db.update(users).set({ passwordHash: hash }).where(eq(users.id, fx.userByRole[role].id));
  // 1.0 released a year ago and acknowledged by site A's investigator; 2.0 written since and in review.
  v1 = await insertReleasedVersion(fx.study.id, fx.userByRole.protocol_writer.id, { label: "1.0", releasedAt: new Date(Date.now() - 365 * 86_400_000) });
  await db.transaction((tx) => notifyVersionReleased(tx, { versionId: v1.id }));
  const inv = fx.userByRole.investigator;
  await db.transaction((tx) => signAcknowledgement(tx, { userId: inv.id, email: inv.email, name: inv.name, memberships: [] }, { studyId: fx.study.id, siteId: fx.siteA.id, versionId: v1.id, password }));
  const doc = { type: "doc", content: [{ type: "paragraph", content: [{ type: "text", text: "Subjects are followed for 36 months after implantation." }] }] };
  const [draft] = await db
    .insert(protocolVersions)
    .values({ studyId: fx.study.id, parentId: v1.id, versionLabel: "2.0", amendmentNumber: 1, state: "in_review", title: "Test protocol 2.0", substantial: true, content: doc, visitSchedule: [], authorId: fx.userByRole.protocol_writer.id, submittedAt: new Date() })
    .returning();
  v2 = draft!;
});
afterAll(async () => {
  for (const b of browsers) await b.close();
});

describe("acknowledging a released protocol version", () => {
  it("release → task on the investigator's home → redline → sign with password → matrix shows it", async () => {
    // 1. The medical reviewer approves and releases 2.0.
    const reviewer = await signedIn("medical_reviewer");
    expect((await reviewer.po.api("POST", `/api/v1/protocol-versions/${v2.id}/approve`, {})).status).toBe(200);
    const released = await reviewer.po.api("POST", `/api/v1/protocol-versions/${v2.id}/release`, {});
    expect(released.status, JSON.stringify(released.json)).toBe(200);
    // The release transaction asked every investigator of every open site (notifyVersionReleased).
    const asked = await db.select().from(acknowledgementRequests).where(eq(acknowledgementRequests.versionId, v2.id));
    expect(asked.map((r) => r.userId).sort()).toEqual([fx.userByRole.investigator.id, fx.siteBPeople.investigator.id].sort());

    // 2. The investigator sees the task on her home.
    const { page, po } = await signedIn("investigator");
    const task = po.homeTask("2.0");
    await task.waitFor();
    await task.click();
    await page.waitForSelector('[data-testid="sign-form"]');

    // 3. She opens the redline against 1.0, the version she last acknowledged, and comes back.
    const ackUrl = page.url();
    await po.openRedline();
    const redlineUrl = new URL(page.url());
    expect(redlineUrl.searchParams.get("from")).toBe(v1.id);
    expect(redlineUrl.searchParams.get("to")).toBe(v2.id);
    // The redline page shows the comparison (its heading names the versions) and the new words.
    await page.locator("main h1:visible", { hasText: "2.0" }).waitFor();
    await page.locator("main:visible", { hasText: "36 months" }).waitFor();
    expect(await page.locator('main [role="alert"]:visible').count()).toBe(0);
    await page.goto(ackUrl);
    await page.waitForSelector('[data-testid="sign-form"]');

    // 4. A wrong password is refused; the right one signs.
    await po.sign("not-the-password");
    await po.signError().waitFor();
    expect(await po.signError().textContent()).toContain("not correct");
    await po.sign(password);
    await po.signatureRecord().waitFor();
    const record = (await po.signatureRecord().textContent()) ?? "";
    expect(record).toContain(fx.userByRole.investigator.name);
    expect(record).toContain(`I have read protocol version 2.0 of study ${fx.study.code}`);
    expect(record).toContain("Europe/Berlin");

    // 5. The compliance matrix shows her acknowledgement; site B's investigator is still pending.
    await po.openMatrix("2.0");
    await po.matrixRow(fx.userByRole.investigator.name).filter({ hasText: "Acknowledged" }).waitFor();
    expect(await po.matrixRow("Test investigator B").count()).toBe(0); // site A's investigator sees site A only
  });

  it("the site A coordinator records the ethics approval with its letter; 2.0 is in force there from that day", async () => {
    const { page, po } = await signedIn("coordinator");
    await page.locator('[data-testid="home-pending-approvals"]:visible', { hasText: "version 2.0" }).waitFor();
    await po.openAdoption();
    expect(await po.adoptionCell(fx.siteA.code, "2.0").textContent()).toContain("Pending");
    const today = siteDateAt(new Date(), "Europe/Berlin");
    await po.recordApproval("2.0", today, "ec-approval-site-a.pdf");
    await po.adoptionCell(fx.siteA.code, "2.0").filter({ hasText: `Approved ${today}` }).waitFor();
    expect(await po.inForce(fx.siteA.code).textContent()).toBe("2.0");
  });
});
