import type { Page } from "playwright-core";
import { appUrl } from "../support";

// Locators take the visible copy: a streamed or preserved page can leave a hidden duplicate in the DOM.
/** Page object for Acknowledgements: the investigator's task, the signing form and the compliance matrix. */
export class AcknowledgementPage {
  constructor(private readonly page: Page) {}

  /** Demo people hold roles in one study: the start page leads straight to it. */
  async openStudyHome(studyCode: string) {
    await this.page.goto(`${appUrl()}/`);
    const link = this.page.getByRole("link", { name: studyCode, exact: true });
    if (await link.count()) await link.first().click();
    await this.page.waitForSelector('[data-testid="home-panels"]');
  }

  studyId(): string {
    const m = /\/studies\/([^/?#]+)/.exec(this.page.url());
    if (!m) throw new Error(`Not on a study page: ${this.page.url()}`);
    return m[1]!;
  }

  /** JSON API call with the page's session cookie. */
  async api<T>(method: string, path: string, body?: unknown): Promise<{ status: number; json: T }> {
    return this.page.evaluate(
      async ({ method, path, body }) => {
        const res = await fetch(path, { method, headers: body === undefined ? {} : { "content-type": "application/json" }, body: body === undefined ? undefined : JSON.stringify(body) });
        const text = await res.text();
        return { status: res.status, json: text ? JSON.parse(text) : null };
      },
      { method, path, body },
    );
  }

  homeTask(versionLabel: string) {
    return this.page.locator('[data-testid="home-my-acknowledgements"] a:visible', { hasText: `protocol version ${versionLabel}` });
  }

  async openRedline() {
    await this.page.locator('[data-testid="open-redline"]:visible').click();
    await this.page.waitForURL(/\/protocol\/compare\?from=/);
  }

  async sign(password: string) {
    const agree = this.page.locator('[data-testid="sign-agree"]:visible');
    if (!(await agree.isChecked())) await agree.check();
    await this.page.locator('[data-testid="sign-password"]:visible').fill(password);
    await this.page.locator('[data-testid="sign-submit"]:visible').click();
  }

  signError() {
    return this.page.locator('[data-testid="sign-error"]:visible');
  }

  signatureRecord() {
    return this.page.locator('[data-testid="signature-record"]:visible');
  }

  async openMatrix(versionLabel: string) {
    await this.page.goto(`${appUrl()}/studies/${this.studyId()}/acknowledgements`);
    await this.page.waitForSelector('[data-testid="compliance-matrix"]');
    await this.page.locator('[data-testid="compliance-matrix"]:visible').getByLabel("Version").selectOption({ label: versionLabel });
    await this.page.waitForSelector('[data-testid="matrix-table"]');
  }

  matrixRow(name: string) {
    return this.page.locator('[data-testid="matrix-table"]:visible tr', { hasText: name });
  }

  async openAdoption() {
    await this.page.goto(`${appUrl()}/studies/${this.studyId()}/adoption`);
    await this.page.waitForSelector('[data-testid="adoption-matrix"]');
  }

  /** Coordinator: choose the version, the approval date and the letter (a small PDF), then record. */
  async recordApproval(versionLabel: string, approvedOn: string, letterName: string) {
    const form = this.page.locator('[data-testid="record-approval"]:visible');
    await form.getByLabel("Protocol version").selectOption({ label: versionLabel });
    await form.getByLabel("Ethics approval date (site date)").fill(approvedOn);
    await form.locator('input[type="file"]').setInputFiles({ name: letterName, mimeType: "application/pdf", buffer: Buffer.from(`%PDF-1.4\n% ethics approval letter\n%%EOF\n`) });
    await form.getByText(`Approval letter: ${letterName}`).waitFor();
    await form.getByRole("button", { name: "Record approval" }).click();
  }

  adoptionCell(siteCode: string, versionLabel: string) {
    return this.page.locator(`[data-testid="adoption-${siteCode}-${versionLabel}"]:visible`);
  }

  inForce(siteCode: string) {
    return this.page.locator(`[data-testid="in-force-${siteCode}"]:visible`);
  }
}
