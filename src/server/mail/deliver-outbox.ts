import "server-only";
import { sql } from "drizzle-orm";
import { db } from "@/server/db/client";
import { env } from "@/env";
import type { Transporter } from "nodemailer";
import { mailTransport } from "./transport";

type Claimed = { id: string; to_address: string; subject: string; text_body: string; html_body: string | null; message_id: string; attempts: number };

const LEASE_SECONDS = 60;

/**
 * Send due outbox messages. Each message is claimed with FOR UPDATE SKIP LOCKED and leased
 * (next_attempt_at pushed forward) so several workers never send the same message at once;
 * it is marked sent right after the SMTP server accepts it. A crash between acceptance and the
 * mark can at worst resend with the same Message-ID (receivers de-duplicate on it).
 */
export async function deliverOutbox({
  batchSize = 20,
  transport,
  dedupeKeyPrefix,
}: {
  batchSize?: number;
  transport?: Transporter;
  /** Only messages whose key starts with this (flush one feature's mail, e.g. in a test). */
  dedupeKeyPrefix?: string;
} = {}) {
  const sender = transport ?? mailTransport();
  let sent = 0;
  let failed = 0;
  for (;;) {
    const claimed = await db.execute<Claimed>(sql`
      update outbox_messages set next_attempt_at = now() + make_interval(secs => ${LEASE_SECONDS}), attempts = attempts + 1
      where id in (
        select id from outbox_messages
        where sent_at is null and next_attempt_at <= now()
          and (${dedupeKeyPrefix ?? null}::text is null or starts_with(dedupe_key, ${dedupeKeyPrefix ?? null}::text))
        order by created_at
        limit ${batchSize}
        for update skip locked
      )
      returning id, to_address, subject, text_body, html_body, message_id, attempts`);
    if (claimed.rows.length === 0) break;
    for (const m of claimed.rows) {
      try {
        await sender.sendMail({
          from: env.MAIL_FROM,
          to: m.to_address,
          subject: m.subject,
          text: m.text_body,
          html: m.html_body ?? undefined,
          messageId: m.message_id,
        });
        await db.execute(sql`update outbox_messages set sent_at = now(), last_error = null where id = ${m.id}`);
        sent++;
      } catch (err) {
        // Exponential back-off capped at 15 minutes; the message stays queued.
        const delay = Math.min(900, 5 * 2 ** Math.min(m.attempts, 8));
        await db.execute(sql`update outbox_messages
          set last_error = ${String((err as Error).message).slice(0, 500)}, next_attempt_at = now() + make_interval(secs => ${delay})
          where id = ${m.id}`);
        failed++;
      }
    }
    if (failed > 0) break; // server likely down: stop this pass, retry later
  }
  return { sent, failed };
}
