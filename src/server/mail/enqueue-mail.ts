import "server-only";
import { randomUUID } from "node:crypto";
import { outboxMessages } from "@/server/db/schema";
import type { Tx } from "@/server/db/client";

export type MailToQueue = {
  /** Same key twice = one message (e.g. "ack-request:<versionId>:<userId>"). */
  dedupeKey: string;
  to: string;
  subject: string;
  text: string;
  html?: string;
};

/**
 * Put a message in the outbox inside the caller's transaction: it is sent only if the change
 * commits, and a mail-server outage delays it without losing it. Returns false when a message
 * with the same key was already queued.
 */
export async function enqueueMail(tx: Tx, mail: MailToQueue): Promise<boolean> {
  const rows = await tx
    .insert(outboxMessages)
    .values({
      dedupeKey: mail.dedupeKey,
      toAddress: mail.to,
      subject: mail.subject,
      textBody: mail.text,
      htmlBody: mail.html ?? null,
      messageId: `<${randomUUID()}@cairn.invalid>`,
    })
    .onConflictDoNothing({ target: outboxMessages.dedupeKey })
    .returning({ id: outboxMessages.id });
  return rows.length > 0;
}
