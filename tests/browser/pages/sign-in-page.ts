import type { Page } from "playwright-core";
import { appUrl } from "../support";

/** Page object for the sign-in page and the signed-in shell. */
export class SignInPage {
  constructor(private readonly page: Page) {}

  async open() {
    await this.page.goto(`${appUrl()}/sign-in`);
  }

  async signIn(email: string, password: string) {
    await this.open();
    await this.page.getByLabel("E-mail").fill(email);
    await this.page.getByLabel("Password").fill(password);
    await this.page.getByRole("button", { name: "Sign in" }).click();
  }

  async signInAndWaitForHome(email: string, password: string) {
    await this.signIn(email, password);
    await this.page.waitForSelector('[data-testid="main-nav"]');
  }

  error() {
    return this.page.locator("#sign-in-error").textContent();
  }

  async navLabels(): Promise<string[]> {
    return (await this.page.locator('[data-testid="main-nav"] a').allTextContents()).map((t) => t.trim());
  }

  async signOut() {
    await this.page.getByRole("button", { name: "Sign out" }).click();
    await this.page.waitForURL(/\/sign-in/);
  }
}
