import "server-only";
import { and, desc, eq } from "drizzle-orm";
import type { Tx } from "@/server/db/client";
import { documents, passThroughInvoices, sites } from "@/server/db/schema";
import { notFound, unprocessable, validationError } from "@/server/api/errors";
import { passThroughInvoiceInput } from "@/lib/budgets/api-schemas";

export async function listPassThroughInvoices(tx: Tx, { siteId }: { siteId: string }) {
  return tx
    .select({ invoice: passThroughInvoices, fileName: documents.fileName })
    .from(passThroughInvoices)
    .leftJoin(documents, eq(documents.id, passThroughInvoices.documentId))
    .where(eq(passThroughInvoices.siteId, siteId))
    .orderBy(desc(passThroughInvoices.approvedOn));
}

/** An approved pass-through invoice: the stored invoice file of this site, its amount in the site's currency. */
export async function approvePassThroughInvoice(tx: Tx, { siteId, body, actorId }: { siteId: string; body: unknown; actorId: string }) {
  const [site] = await tx.select().from(sites).where(eq(sites.id, siteId)).limit(1);
  if (!site) throw notFound("That site");
  const parsed = passThroughInvoiceInput(site.currency).safeParse(body);
  if (!parsed.success) throw validationError(parsed.error, "invoice");
  const input = parsed.data;
  const [doc] = await tx
    .select({ id: documents.id, state: documents.state })
    .from(documents)
    .where(and(eq(documents.id, input.documentId), eq(documents.siteId, siteId)))
    .limit(1);
  if (!doc) throw unprocessable("The invoice file must be a document of this site.", { documentId: ["Not a document of this site"] });
  if (doc.state !== "stored") throw unprocessable("The invoice file has not finished uploading.", { documentId: ["Upload not verified yet"] });
  const [row] = await tx
    .insert(passThroughInvoices)
    .values({ studyId: site.studyId, siteId, documentId: doc.id, description: input.description, amountMinor: input.amount, approvedOn: input.approvedOn, approvedBy: actorId })
    .returning();
  return row!;
}
