import type { Page } from "playwright-core";
import { appUrl } from "../support";

/** Page objects for the Protocol section: versions list, one version, the draft editor, the redline. */
export class ProtocolPages {
  constructor(private readonly page: Page) {}

  async openList(studyId: string) {
    await this.page.goto(`${appUrl()}/studies/${studyId}/protocol`);
    await this.waitForOne("protocol-versions");
  }

  async startAmendment() {
    await this.page.getByRole("button", { name: "Start an amendment" }).click();
    await this.page.waitForURL(/\/edit$/);
    await this.editor().waitFor();
  }

  async openVersion(studyId: string, versionId: string) {
    await this.page.goto(`${appUrl()}/studies/${studyId}/protocol/${versionId}`);
    await this.waitForVersionPage();
  }

  async waitForVersionPage() {
    await this.waitForOne("protocol-text");
  }

  /** Streaming may hold hidden copies of a page for a moment before React reveals it: wait for one shown copy. */
  async waitForOne(testId: string) {
    await this.page.waitForFunction((id) => {
      const found = document.querySelectorAll(`[data-testid="${id}"]`);
      return found.length === 1 && !found[0]!.closest("[hidden]");
    }, testId);
  }

  versionIdFromUrl(): string {
    const m = /\/protocol\/([0-9a-f-]{36})/.exec(this.page.url());
    if (!m) throw new Error(`No version id in ${this.page.url()}`);
    return m[1]!;
  }

  editor() {
    return this.page.getByTestId("protocol-editor");
  }

  /** Put the caret at the end of the paragraph containing `text` and type. */
  async typeAfter(text: string, typed: string) {
    await this.editor().locator("p", { hasText: text }).first().click();
    await this.page.keyboard.press("End");
    await this.page.keyboard.type(typed);
  }

  async insertTableAfter(text: string, cells: string[]) {
    await this.typeAfter(text, "");
    await this.page.keyboard.press("Enter");
    await this.page.getByRole("button", { name: "Insert table" }).click();
    for (const [i, c] of cells.entries()) {
      if (i > 0) await this.page.keyboard.press("Tab");
      await this.page.keyboard.type(c);
    }
  }

  async setVisitField(code: string, label: string, value: string) {
    const input = this.page.getByLabel(`${label} of visit ${code}`, { exact: true });
    await input.fill(value);
  }

  async waitSaved() {
    await this.page.locator('[data-testid="save-state"][data-state="saved"]').waitFor({ timeout: 20_000 });
  }

  async saveState() {
    return this.page.getByTestId("save-state").getAttribute("data-state");
  }

  async prefillSummary(reason: string, rationale: string) {
    await this.page.getByLabel("Reason for the kind of amendment").fill(reason);
    await this.page.getByRole("button", { name: "Prefill from the differences" }).click();
    const rationales = this.page.getByLabel(/^Rationale, row \d+$/);
    const n = await rationales.count();
    for (let i = 0; i < n; i++) {
      const box = rationales.nth(i);
      if (!(await box.inputValue()).trim()) await box.fill(`${rationale} (${i + 1})`);
    }
    return n;
  }

  async submit() {
    await this.page.getByRole("button", { name: "Submit for review" }).click();
    await this.page.waitForURL(/\/protocol\/[0-9a-f-]{36}$/);
    await this.waitForVersionPage();
  }

  async state() {
    return (await this.page.getByTestId("version-state").first().textContent())?.trim();
  }

  async step(name: "Return with comments" | "Approve" | "Release to sites" | "Reopen as draft", comment?: string) {
    const before = await this.state();
    if (comment) await this.page.getByLabel("Review comments").fill(comment);
    await this.page.getByRole("button", { name }).click();
    await this.page.waitForFunction((b) => document.querySelector('[data-testid="version-state"]')?.textContent?.trim() !== b, before);
  }

  async openCompare(studyId: string, from: string, to: string) {
    await this.page.goto(`${appUrl()}/studies/${studyId}/protocol/compare?from=${from}&to=${to}`);
    await this.page.getByTestId("redline-inline").waitFor();
  }
}
