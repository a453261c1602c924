import type { Locator, Page } from "playwright-core";
import { appUrl } from "../support";

/** Page object for Documents: a site's binder, the review queue and the all-sites matrix. */
export class BinderPage {
  constructor(private readonly page: Page) {}

  /** Demo people hold roles in one study: the start page leads straight to it. */
  async openStudy(studyCode: string) {
    await this.page.goto(`${appUrl()}/`);
    const link = this.page.getByRole("link", { name: studyCode, exact: true });
    if (await link.count()) await link.first().click();
    await this.page.waitForSelector('[data-testid="main-nav"]');
    await this.page.locator('[data-testid="main-nav"] a', { hasText: "Documents" }).click();
    await this.page.waitForSelector('[data-testid="binder-table"]');
  }

  studyBase(): string {
    const m = /\/studies\/[^/]+/.exec(this.page.url());
    if (!m) throw new Error(`Not on a study page: ${this.page.url()}`);
    return `${appUrl()}${m[0]}`;
  }

  item(typeCode: string, personName?: string): Locator {
    const rows = this.page.locator(`tr[data-testid^="binder-item-${typeCode}-"]`);
    // The person is in the "Whose" column (the uploader's name may appear in another row too).
    return personName ? rows.filter({ has: this.page.locator("td:nth-child(2)", { hasText: personName }) }) : rows.first();
  }

  async itemState(typeCode: string, personName?: string): Promise<string | null> {
    return this.item(typeCode, personName).getAttribute("data-state");
  }

  async waitForState(typeCode: string, personName: string | undefined, state: string) {
    const row = this.item(typeCode, personName);
    await row.and(this.page.locator(`[data-state="${state}"]`)).waitFor();
  }

  /** Open the row's upload panel, fill the dates and choose a PDF; waits for "stored and verified". */
  async upload(typeCode: string, personName: string | undefined, file: { name: string; text: string }, dates: { issuedOn?: string; expiresOn?: string } = {}) {
    const row = this.item(typeCode, personName);
    await row.getByRole("button", { name: /Upload|New version/ }).click();
    const panel = row.locator("xpath=following-sibling::tr[1]");
    if (dates.issuedOn) await panel.locator('input[name="issuedOn"]').fill(dates.issuedOn);
    if (dates.expiresOn) await panel.locator('input[name="expiresOn"]').fill(dates.expiresOn);
    await panel.locator('input[type="file"]').setInputFiles({ name: file.name, mimeType: "application/pdf", buffer: Buffer.from(`%PDF-1.4\n% ${file.text}\n%%EOF\n`) });
  }

  async openReview() {
    await this.page.goto(`${this.studyBase()}/documents/review`);
    await this.page.waitForSelector('[data-testid="review-queue"]');
  }

  reviewRow(fileName: string): Locator {
    return this.page.locator('tr[data-testid^="review-"]', { hasText: fileName });
  }

  async accept(fileName: string) {
    const row = this.reviewRow(fileName);
    await row.getByRole("button", { name: "Accept" }).click();
    await row.waitFor({ state: "detached" });
  }

  async reject(fileName: string, reason: string) {
    const row = this.reviewRow(fileName);
    await row.getByLabel("Reason to reject").fill(reason);
    await row.getByRole("button", { name: "Reject" }).click();
    await row.waitFor({ state: "detached" });
  }

  async openSite(code: string) {
    await this.page.goto(`${this.studyBase()}/documents?site=${code}`);
    await this.page.waitForSelector('[data-testid="binder-table"]');
  }

  async openMatrix() {
    await this.page.goto(`${this.studyBase()}/documents/matrix`);
    await this.page.waitForSelector('[data-testid="binder-matrix"]');
  }

  async matrixStates(siteCode: string, typeCode: string): Promise<Record<string, number>> {
    const cell = this.page.locator(`[data-testid="matrix-cell-${siteCode}-${typeCode}"]`);
    const out: Record<string, number> = {};
    for (const s of await cell.locator("[data-state]").all()) {
      out[(await s.getAttribute("data-state"))!] = Number((await s.locator(".font-mono").textContent())?.trim());
    }
    return out;
  }

  readyText(): Promise<string | null> {
    return this.page.locator('[data-testid="binder-ready"]').textContent();
  }
}
