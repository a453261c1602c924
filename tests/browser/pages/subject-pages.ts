import type { Page } from "playwright-core";
import { appUrl } from "../support";

/** Page objects for Subjects: the list with its screening form, and one subject with its calendar. */
export class SubjectPages {
  constructor(private readonly page: Page) {}

  async openStudyHome(studyCode: string) {
    await this.page.goto(`${appUrl()}/`);
    const link = this.page.getByRole("link", { name: studyCode, exact: true });
    if (await link.count()) await link.first().click();
    await this.page.waitForSelector('[data-testid="home-panels"]');
  }

  async openSubjectsFromNav() {
    await this.page.locator('[data-testid="main-nav"] a', { hasText: "Subjects" }).click();
    await this.page.waitForSelector('[data-testid="subjects-table"]');
  }

  /** Screens a subject with the next free code; lands on the subject's page. */
  async screenSubject({ consentDate, screeningDate }: { consentDate: string; screeningDate: string }) {
    const form = this.page.getByRole("form", { name: "Screen a subject" });
    await form.getByLabel("Consent date").fill(consentDate);
    await form.getByLabel("Screening date").fill(screeningDate);
    await form.getByRole("button", { name: "Screen subject" }).click();
    await this.page.waitForURL(/\/subjects\/[0-9a-f-]{36}$/);
    await this.page.waitForSelector('[data-testid="visit-calendar"]');
  }

  subjectCode() {
    return this.page.locator('[data-testid="subject-code"]').textContent();
  }

  async moveTo(status: string, date: string, extra: { serial?: string; reason?: string } = {}) {
    const form = this.page.getByRole("form", { name: "Change the subject's status" });
    await form.getByLabel("Move to").selectOption({ label: status });
    await form.locator('input[name="effectiveOn"]').fill(date);
    if (extra.serial) await form.getByLabel("Device serial number").fill(extra.serial);
    if (extra.reason) await form.getByLabel("Reason").fill(extra.reason);
    await form.getByRole("button", { name: "Record" }).click();
  }

  async waitForStatus(label: string) {
    await this.page.locator("h1", { hasText: label }).waitFor();
  }

  visitRow(code: string) {
    return this.page.locator(`[data-testid="visit-calendar"] tr[data-visit="${code}"]`);
  }

  async visitCells(code: string): Promise<string[]> {
    return (await this.visitRow(code).locator("td").allTextContents()).map((t) => t.trim());
  }

  async recordVisit(code: string, visitDate: string, dataEnteredOn: string) {
    await this.visitRow(code).getByRole("button", { name: `Record ${code}` }).click();
    const form = this.page.getByRole("form", { name: `Record visit ${code}` });
    await form.getByLabel("Visit date").fill(visitDate);
    await form.getByLabel("Data entered on").fill(dataEnteredOn);
    await form.getByRole("button", { name: `Save ${code}` }).click();
    await form.waitFor({ state: "detached" });
  }

  async deviations(): Promise<string[][]> {
    const rows = this.page.locator('[data-testid="subject-deviations"] tbody tr');
    const out: string[][] = [];
    for (let i = 0; i < (await rows.count()); i++) out.push((await rows.nth(i).locator("td").allTextContents()).map((t) => t.trim()));
    return out;
  }
}
