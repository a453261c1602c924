import { addDays, format } from "date-fns";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { BrowserContext } from "playwright-core";
import signIns from "../../scripts/seed/demo-sign-ins.json";
import { SignInPage } from "./pages/sign-in-page";
import { SubjectPages } from "./pages/subject-pages";
import { launchBrowser, newPage } from "./support";

// The demo coordinator of DE01 screens, enrols and implants a new subject, reads the calendar,
// records the week-1 visit two days after its window and sees the deviation Cairn opened for it.
let browser: { context: BrowserContext; close: () => Promise<void> };
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => browser?.close());

// Dates relative to today at the site (Europe/Berlin); date-fns does the arithmetic.
const today = new Date(new Date().toLocaleString("en-US", { timeZone: "Europe/Berlin" }));
const day = (offset: number) => format(addDays(today, offset), "yyyy-MM-dd");

describe("a coordinator's subject", () => {
  it("screens, enrols and implants a subject, sees the calendar, records a visit out of window and sees the deviation", async () => {
    const page = await newPage(browser.context);
    await new SignInPage(page).signInAndWaitForHome(signIns.byRole.coordinator, signIns.password);
    const subjects = new SubjectPages(page);
    await subjects.openStudyHome("KESTREL-VP");
    await subjects.openSubjectsFromNav();

    await subjects.screenSubject({ consentDate: day(-40), screeningDate: day(-39) });
    expect(await subjects.subjectCode()).toMatch(/^DE01-\d{3}$/);
    await subjects.moveTo("Enrolled", day(-30));
    await subjects.waitForStatus("Enrolled");
    await subjects.moveTo("Implanted", day(-16), { serial: "KV96-BT0001" });
    await subjects.waitForStatus("Implanted");

    // The calendar: week 1 (day 7 in the demo protocol) counted from the implant date, its window
    // around it (±3 days in version 2.0; read from the page in case a later version is in force).
    const w1 = await subjects.visitCells("W1");
    expect(w1[2]).toBe(day(-16 + 7));
    const [start, end] = w1[3]!.split(" – ");
    expect(start! <= day(-9) && day(-9) <= end!).toBe(true);
    expect(w1[4]).toMatch(/Overdue/);

    // Two days after the window closed.
    const late = format(addDays(new Date(`${end}T12:00:00`), 2), "yyyy-MM-dd");
    await subjects.recordVisit("W1", late, late);
    await page.locator('[data-testid="visit-calendar"] tr[data-visit="W1"]', { hasText: "Done out of window" }).waitFor();
    expect((await subjects.visitCells("W1"))[4]).toMatch(/Done out of window\s*2 d late/);
    const deviations = await subjects.deviations();
    expect(deviations).toHaveLength(1);
    expect(deviations[0]![1]).toBe("visit out of window");
    expect(deviations[0]![2]).toBe("W1");
    expect(deviations[0]![3]).toMatch(/2 days late/);
    expect(deviations[0]![4]).toMatch(/Open/);
    await page.close();
  });
});
