import "server-only";
import { and, eq } from "drizzle-orm";
import type { Tx } from "@/server/db/client";
import { paymentConfirmations, paymentTransfers, sites } from "@/server/db/schema";
import { conflict, unprocessable } from "@/server/api/errors";
import { enqueueMail } from "@/server/mail/enqueue-mail";
import { formatMinor, parseMajorToMinor } from "@/lib/money";
import { sponsorFinanceEmails } from "./recipients";

/** Site finance confirms that a payment reached the site's account, as its bank shows it. */
export async function confirmPaymentReceipt(
  tx: Tx,
  { siteId, transferId, receivedOn, amount, bankReference, actorId }: { siteId: string; transferId: string; receivedOn: string; amount: string; bankReference: string; actorId: string },
) {
  const [t] = await tx.select().from(paymentTransfers).where(and(eq(paymentTransfers.id, transferId), eq(paymentTransfers.siteId, siteId))).limit(1);
  if (!t) throw unprocessable("No payment with that id was made to this site.", { transferId: ["Not a payment to this site"] });
  if (t.state !== "paid") throw conflict(`This payment is ${t.state}; only a paid payment can be confirmed.`);
  let amountMinor: bigint;
  try {
    amountMinor = parseMajorToMinor(amount, t.currency);
  } catch (err) {
    throw unprocessable((err as Error).message, { amount: [(err as Error).message] });
  }
  const [existing] = await tx.select().from(paymentConfirmations).where(eq(paymentConfirmations.transferId, t.id)).limit(1);
  if (existing) throw conflict("This payment's receipt is already confirmed.");
  const [row] = await tx.insert(paymentConfirmations).values({ transferId: t.id, studyId: t.studyId, siteId, receivedOn, amountMinor, bankReference, confirmedBy: actorId }).returning();
  if (amountMinor !== t.amountMinor) {
    const [site] = await tx.select({ code: sites.code }).from(sites).where(eq(sites.id, siteId)).limit(1);
    for (const email of await sponsorFinanceEmails(tx, { studyId: t.studyId })) {
      await enqueueMail(tx, {
        dedupeKey: `confirmation-difference:${row!.id}:${email}`,
        to: email,
        subject: `Site ${site?.code ?? ""} received a different amount`,
        text: `Site ${site?.code ?? ""} confirmed ${formatMinor(amountMinor, t.currency)} received on ${receivedOn} (bank reference ${bankReference}) for a payment of ${formatMinor(t.amountMinor, t.currency)}.`,
      });
    }
  }
  return row!;
}
