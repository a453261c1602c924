import { randomUUID } from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { BrowserContext } from "playwright-core";
import signIns from "../../scripts/seed/demo-sign-ins.json";
import { SignInPage } from "./pages/sign-in-page";
import { BinderPage } from "./pages/binder-page";
import { launchBrowser, newPage } from "./support";

// Demo study KESTREL-VP, site JP01: coordinator Aoi Tsukishima, investigator Dr. Haruto Kisaragi.
const coordinator = "coordinator.jp01@kestrel-vp.example";
const investigatorName = "Haruto Kisaragi";
const coordinatorName = "Aoi Tsukishima";

let browser: { context: BrowserContext; close: () => Promise<void> };
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => browser?.close());

describe("essential-documents binder", () => {
  const tag = randomUUID().slice(0, 6);
  const cvFile = `cv-kisaragi-${tag}.pdf`;
  const gcpFile = `gcp-tsukishima-${tag}.pdf`;

  it("a coordinator uploads a CV and a training certificate; the sponsor accepts one and rejects the other; binder and matrix follow", async () => {
    const site = await newPage(browser.context);
    await new SignInPage(site).signInAndWaitForHome(coordinator, signIns.password);
    const binder = new BinderPage(site);
    await binder.openStudy("KESTREL-VP");

    await binder.upload("investigator_cv", investigatorName, { name: cvFile, text: "CV" });
    await binder.waitForState("investigator_cv", investigatorName, "awaiting_review");
    await binder.upload("gcp_training", coordinatorName, { name: gcpFile, text: "GCP" }, { issuedOn: "2026-11-02" });
    await binder.waitForState("gcp_training", coordinatorName, "awaiting_review");
    // The proposed expiry: issue date + 36 months (3-year GCP renewal, common practice).
    expect(await binder.item("gcp_training", coordinatorName).textContent()).toContain("2029-11-02");
    await site.close();

    // A fresh context for the sponsor (the coordinator's session cookie stays in the first one).
    const sponsorBrowser = await launchBrowser();
    try {
      const sponsor = await newPage(sponsorBrowser.context);
      await new SignInPage(sponsor).signInAndWaitForHome(signIns.byRole.sponsor_admin, signIns.password);
      const review = new BinderPage(sponsor);
      await review.openStudy("KESTREL-VP");
      await review.openMatrix();
      const before = await review.matrixStates("JP01", "gcp_training");
      await review.openReview();
      await review.accept(cvFile);
      await review.reject(gcpFile, "Certificate is not signed by the trainer");

      await review.openSite("JP01");
      await review.waitForState("investigator_cv", investigatorName, "complete");
      await review.waitForState("gcp_training", coordinatorName, "rejected");
      expect(await review.item("gcp_training", coordinatorName).textContent()).toContain("Certificate is not signed by the trainer");

      await review.openMatrix();
      const after = await review.matrixStates("JP01", "gcp_training");
      expect(after.rejected ?? 0).toBe((before.rejected ?? 0) + 1);
    } finally {
      await sponsorBrowser.close();
    }

    // Back at the site: the rejected certificate is on the to-do list.
    const again = await newPage(browser.context);
    const siteBinder = new BinderPage(again);
    await siteBinder.openStudy("KESTREL-VP");
    const todo = await again.locator('[data-testid="binder-todo"]').textContent();
    expect(todo).toMatch(/GCP training certificate — Aoi Tsukishima: rejected \(Certificate is not signed by the trainer\)/);
    await again.close();
  });
});
