import type { Page } from "playwright-core";
import { appUrl } from "../support";

/** Page object for Payments: the site ledger, its cycle filter, totals and statement downloads. */
export class LedgerPage {
  constructor(private readonly page: Page) {}

  async openFromHome(studyCode: string) {
    await this.page.goto(`${appUrl()}/`);
    const study = this.page.getByRole("link", { name: studyCode, exact: true });
    if (await study.count()) await study.first().click();
    await this.page.locator('[data-testid="main-nav"] a', { hasText: "Payments" }).click();
    await this.page.waitForSelector('[data-testid="ledger-table"]');
  }

  cycleFilter() {
    return this.page.locator('[data-testid="ledger-cycle-filter"]');
  }

  async cycles(): Promise<string[]> {
    return (await this.cycleFilter().locator("option").evaluateAll((os) => os.map((o) => (o as HTMLOptionElement).value))).filter(Boolean);
  }

  async filterCycle(cycle: string) {
    await this.cycleFilter().selectOption(cycle);
  }

  async lineCount(): Promise<number> {
    return this.page.locator('[data-testid="ledger-line"]').count();
  }

  /** A figure of the totals row, without thousands separators ("1,388.88" → "1388.88"). */
  async total(figure: "gross" | "net" | "paid" | "outstanding"): Promise<string> {
    return ((await this.page.locator(`[data-testid="ledger-total-${figure}"]`).textContent()) ?? "").replaceAll(",", "").trim();
  }

  /** Click the CSV statement link and return the downloaded text. */
  async downloadCsv(): Promise<{ name: string; text: string }> {
    const [download] = await Promise.all([this.page.waitForEvent("download"), this.page.locator('[data-testid="statement-csv"]').click()]);
    const stream = await download.createReadStream();
    const chunks: Buffer[] = [];
    for await (const c of stream) chunks.push(c as Buffer);
    return { name: download.suggestedFilename(), text: Buffer.concat(chunks).toString("utf8") };
  }
}

/** Page object for Budgets: the list, a site's contract-schedule view and the amendment form. */
export class BudgetPage {
  constructor(private readonly page: Page) {}

  async openSite(studyCode: string, siteCode: string) {
    await this.page.goto(`${appUrl()}/`);
    const study = this.page.getByRole("link", { name: studyCode, exact: true });
    if (await study.count()) await study.first().click();
    await this.page.locator('[data-testid="main-nav"] a', { hasText: "Budgets" }).click();
    await this.page.locator('[data-testid="budgets-table"] a', { hasText: siteCode }).click();
    await this.page.waitForSelector('[data-testid="contract-schedule"]');
  }

  versionHeadings() {
    return this.page.locator('[data-testid="contract-schedule"] article h2').allTextContents();
  }

  async setStartupFee(value: string) {
    await this.page.getByLabel(/^Start-up fee/).fill(value);
  }

  async save() {
    await this.page.getByRole("button", { name: /^Save version/ }).click();
  }

  fieldAlerts() {
    return this.page.locator('form[aria-label="Budget version"] [role="alert"]').allTextContents();
  }
}
