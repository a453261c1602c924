import { randomUUID } from "node:crypto";
import { eq, sql } from "drizzle-orm";
import nodemailer from "nodemailer";
import { afterAll, describe, expect, it } from "vitest";
import { enqueueMail } from "@/server/mail/enqueue-mail";
import { deliverOutbox } from "@/server/mail/deliver-outbox";
import { outboxMessages } from "@/server/db/schema";
import { startSmtpFake, type SmtpFake } from "../../../docker-free-fakes/smtp.mjs";
import { db } from "../../support/db";
import { freePort } from "../../support/ports";

let fake: SmtpFake | undefined;
afterAll(async () => fake?.close());

describe("transactional outbox", () => {
  it("keeps mail queued while the SMTP server is down and delivers it once when it returns", async () => {
    const smtpPort = await freePort();
    const webPort = await freePort();
    const transport = nodemailer.createTransport({ host: "127.0.0.1", port: smtpPort, ignoreTLS: true, connectionTimeout: 1000, greetingTimeout: 1000 });
    const subject = `Outbox test ${randomUUID()}`;
    const key = `test:${subject}`;

    // Queued in the same transaction as a change; a rolled-back change queues nothing.
    await db
      .transaction(async (tx) => {
        await enqueueMail(tx, { dedupeKey: `${key}:rolled-back`, to: "nobody@test.example", subject: `${subject} (rolled back)`, text: "x" });
        throw new Error("rollback");
      })
      .catch(() => undefined);
    await db.transaction(async (tx) => {
      expect(await enqueueMail(tx, { dedupeKey: key, to: "someone@test.example", subject, text: "Hello" })).toBe(true);
      expect(await enqueueMail(tx, { dedupeKey: key, to: "someone@test.example", subject, text: "Hello" })).toBe(false);
    });
    expect(await db.select().from(outboxMessages).where(eq(outboxMessages.dedupeKey, `${key}:rolled-back`))).toHaveLength(0);

    // Server down: the message stays queued, with the error noted. (Only this test's messages are
    // flushed: other tests share the outbox.)
    await deliverOutbox({ transport, dedupeKeyPrefix: key });
    let [row] = await db.select().from(outboxMessages).where(eq(outboxMessages.dedupeKey, key));
    expect(row?.sentAt).toBeNull();
    expect(row?.lastError).toBeTruthy();

    // Server back: due now, delivered once; further passes send nothing more.
    fake = await startSmtpFake({ port: smtpPort, webPort, dataDir: `/tmp/cairn-outbox-test-${smtpPort}` });
    await db.execute(sql`update outbox_messages set next_attempt_at = now() where dedupe_key = ${key}`);
    await deliverOutbox({ transport, dedupeKeyPrefix: key });
    await deliverOutbox({ transport, dedupeKeyPrefix: key });
    [row] = await db.select().from(outboxMessages).where(eq(outboxMessages.dedupeKey, key));
    expect(row?.sentAt).not.toBeNull();

    const inbox = (await (await fetch(`${fake.apiUrl}/email`)).json()) as { subject: string; messageId: string }[];
    const ours = inbox.filter((m) => m.subject === subject);
    expect(ours).toHaveLength(1);
  });
});
