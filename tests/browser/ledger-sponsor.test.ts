import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { BrowserContext } from "playwright-core";
import signIns from "../../scripts/seed/demo-sign-ins.json";
import { SignInPage } from "./pages/sign-in-page";
import { BudgetPage } from "./pages/ledger-page";
import { appUrl, launchBrowser, newPage } from "./support";

// Demo study KESTREL-VP, sponsor finance: DE01's budget reads as a payment schedule with its
// amendment; the form refuses an amount with more decimals than the currency has; the study
// summary converts into EUR and the cash-flow chart has its table.

let browser: { context: BrowserContext; close: () => Promise<void> };
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

describe("budgets and the study summary", () => {
  it("shows DE01's two versions and validates the amendment form", async () => {
    const page = await newPage(browser.context);
    await new SignInPage(page).signInAndWaitForHome(signIns.byRole.sponsor_finance, signIns.password);
    const budget = new BudgetPage(page);
    await budget.openSite("KESTREL-VP", "DE01");
    const headings = await budget.versionHeadings();
    // Newest first: the amendment that follows protocol 2.0, then the first version.
    expect(headings.map((h) => /version (\d+)/.exec(h)?.[1])).toEqual(["2", "1"]);
    expect(headings[0]).toContain("(latest)");
    await budget.setStartupFee("8000.123");
    await budget.save();
    // EUR has two minor units (ISO 4217).
    expect((await budget.fieldAlerts()).join(" ")).toMatch(/EUR allows at most 2 decimals/);
  });

  it("summarises by currency with a total in EUR and draws the cash flow with a table alternative", async () => {
    const page = await newPage(browser.context);
    await page.goto(`${appUrl()}/`);
    const study = page.getByRole("link", { name: "KESTREL-VP", exact: true });
    if (await study.count()) await study.first().click();
    await page.locator('[data-testid="main-nav"] a', { hasText: "Payments" }).click();
    const byCurrency = page.locator('[data-testid="summary-by-currency"]');
    await byCurrency.waitFor();
    const currencies = await byCurrency.locator("tbody tr td:first-child").allTextContents();
    expect(currencies).toEqual(expect.arrayContaining(["CHF", "EUR", "GBP", "JPY", "USD"]));
    await expect(byCurrency.locator("tfoot").textContent()).resolves.toMatch(/Total in EUR/);
    await page.locator('[data-testid="cash-flow"] svg[role="img"]').waitFor();
    expect(await page.locator('[data-testid="cash-flow-table"] tbody tr').count()).toBeGreaterThan(12);
  });
});
