// The protocol writer and the medical reviewer in the browser: draft → submit → return → fix →
// resubmit → approve → release → redline; and stored hostile content rendering inert.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { BrowserContext, Page } from "playwright-core";
import { eq } from "drizzle-orm";
import { protocolVersions, users } from "@/server/db/schema";
import { hashPassword } from "@/server/auth/password";
import { createStudyFixture, db, type StudyFixture } from "../support/db";
import { baseSchedule, insertVersion } from "../integration/protocol/protocol-fixture";
import { SignInPage } from "./pages/sign-in-page";
import { ProtocolPages } from "./pages/protocol-pages";
import { appUrl, launchBrowser, newPage } from "./support";

const password = "protocol-browser-test-2026";
let fx: StudyFixture;
let v1Id: string;

const v1Content = {
  type: "doc",
  content: [
    { type: "heading", attrs: { level: 1 }, content: [{ type: "text", text: "Design" }] },
    { type: "paragraph", content: [{ type: "text", text: "Subjects are followed for 24 months after implantation." }] },
    { type: "heading", attrs: { level: 2 }, content: [{ type: "text", text: "Visits" }] },
    { type: "paragraph", content: [{ type: "text", text: "Visits follow the schedule of visits." }] },
  ],
};

async function signedIn(role: "protocol_writer" | "medical_reviewer"): Promise<{ page: Page; close: () => Promise<void> }> {
  const b = await launchBrowser();
  const page = await newPage(b.context);
  await new SignInPage(page).signInAndWaitForHome(fx.userByRole[role].email, password);
  return { page, close: b.close };
}

beforeAll(async () => {
  fx = await createStudyFixture();
  const hash = await hashPassword(password);
  for (const role of ["protocol_writer", "medical_reviewer"] as const) await db.update(users).set({ passwordHash: hash }).where(eq(users.id, fx.userByRole[role].id));
  v1Id = (await insertVersion(fx, { label: "1.0", state: "released", content: v1Content, visitSchedule: baseSchedule })).id;
});

describe("protocol amendment in the browser", () => {
  let writer: { page: Page; close: () => Promise<void> };
  let reviewer: { page: Page; close: () => Promise<void> };
  let draftId: string;
  afterAll(async () => {
    await writer?.close();
    await reviewer?.close();
  });

  it("writer drafts, edits text, a table and a visit, and submits", async () => {
    writer = await signedIn("protocol_writer");
    const w = new ProtocolPages(writer.page);
    await w.openList(fx.study.id);
    await w.startAmendment();
    draftId = w.versionIdFromUrl();
    await w.typeAfter("24 months after implantation.", " A brain MRI is done at month 12.");
    await w.insertTableAfter("Visits follow the schedule of visits.", ["Visit", "Imaging"]);
    await w.setVisitField("M1", "Window after", "10");
    await w.waitSaved();
    // Section numbers come from the shared CSS counters (their values are checked in the unit tests):
    // a level-2 heading in the editor carries the two-level number.
    const number = await writer.page.evaluate(() => getComputedStyle(document.querySelector('[data-testid="protocol-editor"] h2')!, "::before").content);
    expect(number).toMatch(/counter\(cairn-s1\) "\." counter\(cairn-s2\)/);
    const rows = await w.prefillSummary("Adds an imaging procedure", "Safety imaging");
    expect(rows).toBeGreaterThanOrEqual(2);
    await w.waitSaved();
    await w.submit();
    expect(await w.state()).toBe("In review");
  });

  it("reviewer returns it with a comment", async () => {
    reviewer = await signedIn("medical_reviewer");
    const r = new ProtocolPages(reviewer.page);
    await r.openVersion(fx.study.id, draftId);
    await r.step("Return with comments", "State who reads the MRI.");
    expect(await r.state()).toBe("Returned");
    expect(await reviewer.page.getByTestId("review-comments").textContent()).toContain("State who reads the MRI.");
  });

  it("writer reopens, fixes and resubmits", async () => {
    const w = new ProtocolPages(writer.page);
    await w.openVersion(fx.study.id, draftId);
    await w.step("Reopen as draft");
    await writer.page.getByRole("link", { name: "Edit draft" }).click();
    await w.editor().waitFor();
    expect(await writer.page.getByText("State who reads the MRI.").count()).toBeGreaterThan(0);
    await w.typeAfter("A brain MRI is done at month 12.", " The site radiologist reads it.");
    await w.waitSaved();
    await w.prefillSummary("Adds an imaging procedure", "Named reader");
    await w.waitSaved();
    await w.submit();
    expect(await w.state()).toBe("In review");
  });

  it("reviewer approves and releases; the hash is shown", async () => {
    const r = new ProtocolPages(reviewer.page);
    await r.openVersion(fx.study.id, draftId);
    await r.step("Approve");
    expect(await r.state()).toBe("Approved");
    reviewer.page.once("dialog", (d) => void d.accept());
    await r.step("Release to sites");
    expect(await r.state()).toBe("Released");
    expect(await reviewer.page.getByTestId("content-hash").textContent()).toMatch(/^[0-9a-f]{64}$/);
  });

  it("the redline shows the change, inline, side by side and in the schedule", async () => {
    const r = new ProtocolPages(reviewer.page);
    await r.openCompare(fx.study.id, v1Id, draftId);
    const inserted = await reviewer.page.locator('[data-testid="redline-inline"] ins').allTextContents();
    expect(inserted.join(" ")).toContain("A brain MRI is done at month 12.");
    expect(inserted.join(" ")).toContain("The site radiologist reads it.");
    expect(await reviewer.page.getByTestId("visit-diff").textContent()).toMatch(/M1.*window after.*7.*10/s);
    await reviewer.page.getByRole("button", { name: "Side by side" }).click();
    expect(await reviewer.page.getByTestId("redline-side").textContent()).toContain("Imaging");
  });
});

describe("stored hostile content renders inert", () => {
  it("no script runs, no handler or javascript: link reaches the page", async () => {
    // Vectors from the OWASP XSS Filter Evasion Cheat Sheet (from memory), as text, attributes, hrefs and unknown nodes.
    const hostile = {
      type: "doc",
      content: [
        { type: "heading", attrs: { level: 1, onclick: "window.__xss=1" }, content: [{ type: "text", text: "<script>window.__xss=1</script>" }] },
        { type: "paragraph", content: [{ type: "text", text: `<IMG SRC=/ onerror="window.__xss=1">`, marks: [{ type: "link", attrs: { href: "javascript:window.__xss=1" } }] }] },
        { type: "paragraph", content: [{ type: "text", text: "tab", marks: [{ type: "link", attrs: { href: "jav\tascript:window.__xss=1" } }] }] },
        { type: "image", attrs: { src: "x", onerror: "window.__xss=1" } },
        { type: "html", content: [{ type: "text", text: "<svg/onload=window.__xss=1>" }] },
        { type: "paragraph", attrs: { style: "background:url(javascript:window.__xss=1)" }, content: [{ type: "text", text: "styled" }] },
      ],
    };
    const bad = await insertVersion(fx, { label: "0.9", state: "superseded", content: hostile });
    const b = await launchBrowser();
    try {
      const page = await newPage(b.context);
      let dialogs = 0;
      page.on("dialog", (d) => {
        dialogs++;
        void d.dismiss();
      });
      await new SignInPage(page).signInAndWaitForHome(fx.userByRole.protocol_writer.email, password);
      await new ProtocolPages(page).openVersion(fx.study.id, bad.id);
      const article = page.getByTestId("protocol-text");
      await page.locator('[data-testid="protocol-text"] a').first().click({ timeout: 2000 }).catch(() => undefined);
      expect(await page.evaluate(() => (window as unknown as { __xss?: number }).__xss)).toBeUndefined();
      expect(dialogs).toBe(0);
      expect(await article.locator("script, img, svg, iframe").count()).toBe(0);
      const attrs = await article.evaluate((el) => [...el.querySelectorAll("*")].flatMap((n) => [...n.attributes].map((a) => `${a.name}=${a.value}`)));
      expect(attrs.filter((a) => /^on|javascript:/i.test(a) || /^style=.*javascript/i.test(a))).toEqual([]);
      expect(await article.textContent()).toContain("<script>window.__xss=1</script>");
    } finally {
      await b.close();
    }
  });
});

describe("two tabs editing the same draft", () => {
  it("the second save gets the conflict view with the other change; nothing is overwritten until the writer chooses", async () => {
    const draft = await insertVersion(fx, { label: "7.0", state: "draft", parentId: v1Id, content: v1Content });
    const b = await launchBrowser();
    try {
      const first = await newPage(b.context);
      await new SignInPage(first).signInAndWaitForHome(fx.userByRole.protocol_writer.email, password);
      const second = await newPage(b.context);
      const url = `${appUrl()}/studies/${fx.study.id}/protocol/${draft.id}/edit`;
      await first.goto(url);
      await second.goto(url);
      const a = new ProtocolPages(first);
      const c = new ProtocolPages(second);
      await a.editor().waitFor();
      await c.editor().waitFor();
      await a.typeAfter("24 months after implantation.", " Alpha edit.");
      await a.waitSaved();
      await c.typeAfter("24 months after implantation.", " Beta edit.");
      await second.getByTestId("conflict").waitFor({ timeout: 20_000 });
      expect(await c.saveState()).toBe("conflict");
      // The other person's text is shown against ours.
      expect(await second.locator('[data-testid="conflict"] del').allTextContents()).toContain("Alpha");
      expect(await second.locator('[data-testid="conflict"] ins').allTextContents()).toContain("Beta");
      const stored = await db.select().from(protocolVersions).where(eq(protocolVersions.id, draft.id));
      expect(JSON.stringify(stored[0]!.content)).toContain("Alpha edit.");
      expect(JSON.stringify(stored[0]!.content)).not.toContain("Beta edit.");
      await second.getByRole("button", { name: "Use their version (discard mine)" }).click();
      await c.waitSaved();
      expect(await c.editor().textContent()).toContain("Alpha edit.");
      expect(await c.editor().textContent()).not.toContain("Beta edit.");
    } finally {
      await b.close();
    }
  });
});
