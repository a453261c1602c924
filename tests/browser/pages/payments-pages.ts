import type { Page } from "playwright-core";
import { appUrl } from "../support";

/** Page objects for Payment runs (list, prepare, run detail) and Reconciliation. */
export class PaymentRunsPage {
  constructor(private readonly page: Page) {}

  async openFromHome(studyCode: string) {
    await this.page.goto(`${appUrl()}/`);
    const study = this.page.getByRole("link", { name: studyCode, exact: true });
    if (await study.count()) await study.first().click();
    await this.page.locator('[data-testid="main-nav"] a', { hasText: "Payment runs" }).click();
    await this.page.waitForSelector('[data-testid="payee-accounts"]');
  }

  /** Select one site's due lines and prepare a run of all of them; returns the run page URL. */
  async prepareRunForSite(siteCode: string): Promise<{ url: string; lines: number }> {
    await this.page.getByLabel("Site", { exact: true }).selectOption({ label: siteCode });
    await this.page.waitForSelector('[data-testid="due-lines"] tbody tr');
    await this.page.waitForFunction(
      (code) => [...document.querySelectorAll('[data-testid="due-lines"] tbody tr td:nth-child(2)')].every((td) => td.textContent === code),
      siteCode,
    );
    const lines = await this.page.locator('[data-testid="due-lines"] tbody tr').count();
    await this.page.getByRole("button", { name: /^Prepare run of/ }).click();
    await this.page.waitForURL(/\/payment-runs\/[0-9a-f-]{36}$/);
    await this.page.waitForSelector('[data-testid="run-lines"]');
    return { url: this.page.url(), lines };
  }
}

export class PaymentRunPage {
  constructor(private readonly page: Page) {}

  async open(url: string) {
    await this.page.goto(url);
    await this.page.waitForSelector('[data-testid="run-lines"]');
  }

  runState() {
    return this.page.locator("h1 + span [data-state]").getAttribute("data-state");
  }

  async approve() {
    await this.page.getByRole("button", { name: "Approve run" }).click();
    await this.page.waitForSelector('h1 + span [data-state="approved"]');
  }

  async send() {
    await this.page.getByRole("button", { name: "Send payments" }).click();
    await this.page.waitForSelector('[data-testid="run-transfers"]');
  }

  async waitForTransferState(siteCode: string, state: string, timeout = 60_000) {
    await this.page.waitForSelector(`[data-testid="run-transfers"] tr[data-site="${siteCode}"] [data-state="${state}"]`, { timeout });
  }

  approveButtonCount() {
    return this.page.getByRole("button", { name: "Approve run" }).count();
  }

  lineStates() {
    return this.page.locator('[data-testid="run-lines"] [data-state]').evaluateAll((els) => els.map((e) => e.getAttribute("data-state")));
  }
}

export class ReconciliationPage {
  constructor(private readonly page: Page) {}

  async openFromHome(studyCode: string) {
    await this.page.goto(`${appUrl()}/`);
    const study = this.page.getByRole("link", { name: studyCode, exact: true });
    if (await study.count()) await study.first().click();
    await this.page.locator('[data-testid="main-nav"] a', { hasText: "Reconciliation" }).click();
    await this.page.waitForSelector('[data-testid^="recon-site-"]');
  }

  /** Confirm the first paid, unconfirmed payment of a site with the amount shown. */
  async confirmReceipt(siteCode: string, bankReference: string) {
    const section = this.page.locator(`[data-testid="recon-site-${siteCode}"]`);
    await section.getByRole("button", { name: "Confirm receipt" }).first().click();
    const form = section.getByRole("form", { name: "Confirm receipt" });
    await form.getByLabel("Bank reference").fill(bankReference);
    await form.getByRole("button", { name: "Save confirmation" }).click();
    await form.waitFor({ state: "detached" });
    await section.getByText(bankReference).waitFor();
  }

  figure(siteCode: string, key: string) {
    return this.page.locator(`[data-testid="recon-figures-${siteCode}"] [data-figure="${key}"]`).first().textContent();
  }
}
