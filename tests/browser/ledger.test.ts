import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { BrowserContext } from "playwright-core";
import signIns from "../../scripts/seed/demo-sign-ins.json";
import { parseCsv } from "../integration/budgets/csv";
import { SignInPage } from "./pages/sign-in-page";
import { LedgerPage } from "./pages/ledger-page";
import { launchBrowser, newPage } from "./support";

// Demo study KESTREL-VP: the finance officer of DE01 opens the ledger, filters one cycle and
// downloads that cycle's CSV statement; the statement's totals equal the totals on the screen.

let browser: { context: BrowserContext; close: () => Promise<void> };
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

describe("site ledger", () => {
  it("filter a cycle, download its CSV statement, totals match the screen", async () => {
    const page = await newPage(browser.context);
    await new SignInPage(page).signInAndWaitForHome(signIns.byRole.site_finance, signIns.password);
    const ledger = new LedgerPage(page);
    await ledger.openFromHome("KESTREL-VP");
    const cycles = await ledger.cycles();
    expect(cycles.length, "the demo site has earned lines in several cycles").toBeGreaterThan(1);
    const all = await ledger.lineCount();
    const cycle = cycles[Math.floor(cycles.length / 2)]!;
    await ledger.filterCycle(cycle);
    await page.waitForFunction((n) => document.querySelectorAll('[data-testid="ledger-line"]').length < n, all);
    const shown = await ledger.lineCount();
    expect(shown).toBeGreaterThan(0);

    const { name, text } = await ledger.downloadCsv();
    expect(name).toContain(cycle);
    const rows = parseCsv(text);
    const header = rows[0]!;
    const total = rows[rows.length - 1]!;
    expect(total[0]).toBe("Total");
    expect(rows.length - 2, "one CSV row per line on the screen").toBe(shown);
    const col = (title: string) => total[header.indexOf(title)];
    expect(col("Fee")).toBe(await ledger.total("gross"));
    expect(col("Net")).toBe(await ledger.total("net"));
    expect(col("Paid")).toBe(await ledger.total("paid"));
    expect(col("Outstanding")).toBe(await ledger.total("outstanding"));
  });
});
