import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { BrowserContext } from "playwright-core";
import signIns from "../../scripts/seed/demo-sign-ins.json";
import { navItems } from "@/lib/nav";
import { canSomewhere } from "@/lib/auth/authorize";
import { roles, type Role } from "@/lib/auth/roles";
import { SignInPage } from "./pages/sign-in-page";
import { appUrl, launchBrowser, newPage } from "./support";

let browser: { context: BrowserContext; close: () => Promise<void> };
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => browser?.close());

/** Sections a person holding only `role` study-wide (or at one site) should see. */
function expectedNav(role: Role): string[] {
  const actor = { userId: "x", email: "x", name: "x", memberships: [{ studyId: "s", siteId: role === "investigator" || role === "coordinator" || role === "site_finance" ? "site" : null, role }] };
  return navItems.filter((i) => canSomewhere(actor, i.permission, "s")).map((i) => i.label);
}

describe("signed out", () => {
  it("sends a page request to the sign-in page", async () => {
    const res = await fetch(`${appUrl()}/studies/00000000-0000-4000-8000-000000000000/audit`, { redirect: "manual" });
    expect([302, 307, 308]).toContain(res.status);
    expect(res.headers.get("location")).toMatch(/\/sign-in/);
  });

  it("serves the public files without sign-in, and asks robots to stay away", async () => {
    const robots = await fetch(`${appUrl()}/robots.txt`, { redirect: "manual" });
    expect(robots.status).toBe(200);
    expect(await robots.text()).toContain("Disallow: /");
    const icon = await fetch(`${appUrl()}/favicon.svg`, { redirect: "manual" });
    expect(icon.status).toBe(200);
  });

  it("answers an API request with 401", async () => {
    const res = await fetch(`${appUrl()}/api/v1/studies`);
    expect(res.status).toBe(401);
    expect((await res.json()).error.code).toBe("unauthenticated");
  });

  it("shows a message for a wrong password", async () => {
    const page = await newPage(browser.context);
    const signIn = new SignInPage(page);
    await signIn.signIn(signIns.byRole.auditor, "not-the-password");
    await page.locator("#sign-in-error").waitFor();
    expect(await signIn.error()).toMatch(/do not match/);
    await page.close();
  });
});

describe.each(roles.map((r) => [r]))("demo sign-in as %s", (role: Role) => {
  it("sees that role's navigation, then signs out", async () => {
    const page = await newPage(browser.context);
    const signIn = new SignInPage(page);
    await signIn.signInAndWaitForHome(signIns.byRole[role], signIns.password);
    expect(await signIn.navLabels()).toEqual(expectedNav(role));
    expect(await page.getByTestId("signed-in-as").textContent()).toContain(signIns.byRole[role]);
    await signIn.signOut();
    const res = await page.goto(`${appUrl()}/`);
    expect(page.url()).toMatch(/\/sign-in/);
    expect(res?.status()).toBeLessThan(400);
    await page.close();
  });
});
