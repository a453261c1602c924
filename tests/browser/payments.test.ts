import { spawn, type ChildProcess } from "node:child_process";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { BrowserContext } from "playwright-core";
import signIns from "../../scripts/seed/demo-sign-ins.json";
import { SignInPage } from "./pages/sign-in-page";
import { PaymentRunPage, PaymentRunsPage, ReconciliationPage } from "./pages/payments-pages";
import { launchBrowser, newPage } from "./support";

// Demo study KESTREL-VP: sponsor finance prepares a run of GB01's due lines, a second officer
// approves and sends it, the worker sends the transfer to the Stripe fake, whose webhook marks it
// paid; GB01's finance officer confirms receipt and the reconciliation shows no difference.

let browser: { context: BrowserContext; close: () => Promise<void> };
let worker: ChildProcess;
beforeAll(async () => {
  browser = await launchBrowser();
  // The app's worker (sends queued transfers); `npm test` starts only the app.
  const root = path.resolve(import.meta.dirname, "../..");
  worker = spawn(path.join(root, "node_modules/.bin/tsx"), ["--conditions=react-server", "src/worker/main.ts"], { cwd: root, env: { ...process.env, NODE_ENV: "production" }, stdio: "ignore" });
});
afterAll(async () => {
  worker?.kill("SIGTERM");
  await browser?.close();
});

describe("payment run, end to end", () => {
  it("prepare, approve as a second person, send, paid by webhook, receipt confirmed, zero difference", async () => {
    const page = await newPage(browser.context);
    const signIn = new SignInPage(page);
    await signIn.signInAndWaitForHome(signIns.byRole.sponsor_finance, signIns.password);
    const runs = new PaymentRunsPage(page);
    await runs.openFromHome("KESTREL-VP");
    const { url, lines } = await runs.prepareRunForSite("GB01");
    expect(lines).toBeGreaterThan(0);
    const run = new PaymentRunPage(page);
    expect(await run.runState()).toBe("prepared");
    expect(await run.approveButtonCount(), "the preparer is not offered approval").toBe(0);
    await signIn.signOut();

    await signIn.signInAndWaitForHome("payments2@kestrel-vp.example", signIns.password);
    await run.open(url);
    await run.approve();
    await run.send();
    await run.waitForTransferState("GB01", "paid");
    await page.reload();
    await page.waitForSelector('[data-testid="run-lines"]');
    expect(new Set(await run.lineStates())).toEqual(new Set(["paid"]));
    await signIn.signOut();

    await signIn.signInAndWaitForHome("finance.gb01@kestrel-vp.example", signIns.password);
    const recon = new ReconciliationPage(page);
    await recon.openFromHome("KESTREL-VP");
    await recon.confirmReceipt("GB01", "GB-FPS-9001");
    expect((await recon.figure("GB01", "differenceMinor"))?.trim()).toBe("0.00");
    expect((await recon.figure("GB01", "awaitingConfirmationMinor"))?.trim()).toBe("0.00");
    expect((await recon.figure("GB01", "confirmedMinor"))?.trim()).toBe((await recon.figure("GB01", "paidMinor"))?.trim());
  });
});
