// The SMTP fake (maildev 3): nodemailer sends, the REST API under /api reads and deletes.
import fs from "node:fs";
import nodemailer from "nodemailer";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startSmtpFake, type SmtpFake } from "../../../docker-free-fakes/smtp.mjs";
import { freePort, tempDir } from "./helpers";

let smtp: SmtpFake;
let dataDir: string;

type Mail = { id: string; subject: string; text?: string; to: { address: string }[]; from: { address: string }[] };

beforeAll(async () => {
  dataDir = tempDir("smtp-fake");
  smtp = await startSmtpFake({ port: await freePort(), webPort: await freePort(), dataDir });
});

afterAll(async () => {
  await smtp?.close();
  fs.rmSync(dataDir, { recursive: true, force: true });
});

describe("SMTP fake", () => {
  it("answers its health check and serves the web inbox", async () => {
    expect(await (await fetch(`${smtp.apiUrl}/healthz`)).json()).toBe(true);
    // The inbox is a single-page app served to requests that accept HTML.
    const inbox = await fetch(smtp.webUrl, { headers: { accept: "text/html" } });
    expect(inbox.status).toBe(200);
    expect(inbox.headers.get("content-type")).toContain("text/html");
  });

  it("receives a message from nodemailer, shows it through the REST API, and deletes it", async () => {
    await fetch(`${smtp.apiUrl}/email/all`, { method: "DELETE" });
    const transport = nodemailer.createTransport({ host: smtp.smtpHost, port: smtp.smtpPort, secure: false, ignoreTLS: true });
    const info = await transport.sendMail({
      from: "Cairn <no-reply@cairn.test>",
      to: "site-finance@example.test",
      subject: "Payment run approved",
      text: "A payment run was approved and will be sent.",
    });
    transport.close();
    expect(info.accepted).toEqual(["site-finance@example.test"]);

    const list = (await (await fetch(`${smtp.apiUrl}/email`)).json()) as Mail[];
    expect(list).toHaveLength(1);
    const mail = list[0]!;
    expect(mail.subject).toBe("Payment run approved");
    expect(mail.to[0]?.address).toBe("site-finance@example.test");
    expect(mail.from[0]?.address).toBe("no-reply@cairn.test");
    expect(mail.text?.trim()).toBe("A payment run was approved and will be sent.");

    const one = await fetch(`${smtp.apiUrl}/email/${mail.id}`);
    expect(one.status).toBe(200);
    const del = await fetch(`${smtp.apiUrl}/email/${mail.id}`, { method: "DELETE" });
    expect(del.ok).toBe(true);
    expect(await (await fetch(`${smtp.apiUrl}/email`)).json()).toEqual([]);
  });
});
