import "server-only";
import { desc, eq } from "drizzle-orm";
import type { Tx } from "@/server/db/client";
import { exchangeRates, studies } from "@/server/db/schema";
import { notFound, unprocessable } from "@/server/api/errors";

export async function listExchangeRates(tx: Tx, { studyId }: { studyId: string }) {
  return tx.select().from(exchangeRates).where(eq(exchangeRates.studyId, studyId)).orderBy(desc(exchangeRates.rateDate), exchangeRates.currency);
}

/** Record a rate into the study's reporting currency, as of its date. */
export async function addExchangeRate(tx: Tx, { studyId, currency, rate, rateDate, source, actorId }: { studyId: string; currency: string; rate: string; rateDate: string; source: string; actorId: string }) {
  const [study] = await tx.select({ reportingCurrency: studies.reportingCurrency }).from(studies).where(eq(studies.id, studyId)).limit(1);
  if (!study) throw notFound("That study");
  if (currency === study.reportingCurrency) throw unprocessable(`${currency} is the study's reporting currency: it needs no rate.`, { currency: ["Choose another currency"] });
  const [row] = await tx.insert(exchangeRates).values({ studyId, currency, reportingCurrency: study.reportingCurrency, rate, rateDate, source, enteredBy: actorId }).returning();
  return row!;
}
