import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import type { BrowserContext } from "playwright-core";
import signIns from "../../scripts/seed/demo-sign-ins.json";
import { SignInPage } from "./pages/sign-in-page";
import { AcknowledgementPage } from "./pages/acknowledgement-page";
import { launchBrowser, newPage } from "./support";
import { siteDateAt } from "@/lib/acknowledgements/deadline";

// Demo study KESTREL-VP: the medical reviewer releases the version in review; Prof. Dr. Carla Wendt,
// investigator at DE01 (she acknowledged 2.0), is asked to acknowledge it, reads the redline and signs.
const investigatorName = "Prof. Dr. Carla Wendt";

let reviewerBrowser: { context: BrowserContext; close: () => Promise<void> };
let investigatorBrowser: { context: BrowserContext; close: () => Promise<void> };
beforeAll(async () => {
  reviewerBrowser = await launchBrowser();
  investigatorBrowser = await launchBrowser();
});
afterAll(async () => {
  await reviewerBrowser?.close();
  await investigatorBrowser?.close();
});

type Version = { id: string; versionLabel: string; state: string };
let releasedLabel: string | undefined;

describe("acknowledging a released protocol version", () => {
  it("release → task on the investigator's home → redline → sign with password → matrix shows it", async () => {
    // 1. The medical reviewer approves and releases the version in review.
    const reviewerPage = await newPage(reviewerBrowser.context);
    await new SignInPage(reviewerPage).signInAndWaitForHome(signIns.byRole.medical_reviewer, signIns.password);
    const reviewer = new AcknowledgementPage(reviewerPage);
    await reviewer.openStudyHome("KESTREL-VP");
    const studyId = reviewer.studyId();
    const { json } = await reviewer.api<{ versions: Version[] }>("GET", `/api/v1/studies/${studyId}/protocol/versions`);
    const candidate = json.versions.find((v) => v.state === "in_review" || v.state === "approved");
    expect(candidate, "a version in review or approved to release").toBeDefined();
    if (candidate!.state === "in_review") expect((await reviewer.api("POST", `/api/v1/protocol-versions/${candidate!.id}/approve`, {})).status).toBe(200);
    const released = await reviewer.api("POST", `/api/v1/protocol-versions/${candidate!.id}/release`, {});
    expect(released.status, JSON.stringify(released.json)).toBe(200);
    await reviewerPage.close();
    releasedLabel = candidate!.versionLabel;

    // The release transaction asked every investigator of every open site (notifyVersionReleased).
    const { db } = await import("@/server/db/client");
    const { acknowledgementRequests } = await import("@/server/db/schema");
    const asked = await db.select().from(acknowledgementRequests).where(eq(acknowledgementRequests.versionId, candidate!.id));
    expect(asked.length, "acknowledgement tasks created by the release").toBeGreaterThan(0);

    // 2. The investigator sees the task first on her home.
    const page = await newPage(investigatorBrowser.context);
    await new SignInPage(page).signInAndWaitForHome(signIns.byRole.investigator, signIns.password);
    const ack = new AcknowledgementPage(page);
    await ack.openStudyHome("KESTREL-VP");
    const task = ack.homeTask(candidate!.versionLabel);
    await task.waitFor();
    await task.click();
    await page.waitForSelector('[data-testid="sign-form"]');

    // 3. She opens the redline against 2.0, the version she last acknowledged, and comes back.
    const ackUrl = page.url();
    await ack.openRedline();
    const redlineUrl = new URL(page.url());
    expect(redlineUrl.searchParams.get("to")).toBe(candidate!.id);
    const lastAcknowledged = json.versions.find((v) => v.versionLabel === "2.0");
    expect(redlineUrl.searchParams.get("from")).toBe(lastAcknowledged!.id);
    // The redline page shows the comparison (its heading names the versions), not an error.
    await page.locator("main h1:visible", { hasText: candidate!.versionLabel }).waitFor();
    expect(await page.locator('main [role="alert"]:visible').count()).toBe(0);
    await page.goto(ackUrl);
    await page.waitForSelector('[data-testid="sign-form"]');

    // 4. A wrong password is refused; the right one signs.
    await ack.sign("not-the-password");
    await ack.signError().waitFor();
    expect(await ack.signError().textContent()).toContain("not correct");
    await ack.sign(signIns.password);
    await ack.signatureRecord().waitFor();
    const record = (await ack.signatureRecord().textContent()) ?? "";
    expect(record).toContain(investigatorName);
    expect(record).toContain(`I have read protocol version ${candidate!.versionLabel}`);
    expect(record).toContain("Europe/Berlin");

    // 5. The compliance matrix shows her acknowledgement.
    await ack.openMatrix(candidate!.versionLabel);
    const row = ack.matrixRow(investigatorName);
    await row.filter({ hasText: "Acknowledged" }).waitFor();
    await page.close();
  });

  it("the DE01 coordinator records the ethics approval with its letter; the version is in force there from that day", async () => {
    expect(releasedLabel, "the first test released a version").toBeDefined();
    const coordinatorBrowser = await launchBrowser();
    try {
      const page = await newPage(coordinatorBrowser.context);
      await new SignInPage(page).signInAndWaitForHome(signIns.byRole.coordinator, signIns.password);
      const adoption = new AcknowledgementPage(page);
      await adoption.openStudyHome("KESTREL-VP");
      await page.locator('[data-testid="home-pending-approvals"]:visible', { hasText: `version ${releasedLabel}` }).waitFor();
      await adoption.openAdoption();
      expect(await adoption.adoptionCell("DE01", releasedLabel!).textContent()).toContain("Pending");
      const today = siteDateAt(new Date(), "Europe/Berlin");
      await adoption.recordApproval(releasedLabel!, today, "ec-approval-de01.pdf");
      await adoption.adoptionCell("DE01", releasedLabel!).filter({ hasText: `Approved ${today}` }).waitFor();
      expect(await adoption.inForce("DE01").textContent()).toBe(releasedLabel);
    } finally {
      await coordinatorBrowser.close();
    }
  });
});
