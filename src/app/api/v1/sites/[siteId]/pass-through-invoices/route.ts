// GET /api/v1/sites/:siteId/pass-through-invoices — approved pass-through invoices; POST — approve one (with its stored file)
import { z } from "zod";
import { apiRoute } from "@/server/api/route";
import { siteParams } from "@/lib/api/schemas";
import { scopeOfSite } from "@/server/budgets/site-scope";
import { approvePassThroughInvoice, listPassThroughInvoices } from "@/server/budgets/pass-through-invoices";

export const GET = apiRoute(
  { permission: "budget.read", params: siteParams, scope: ({ params }, tx) => scopeOfSite(tx, params.siteId) },
  async ({ tx, input }) => ({ invoices: await listPassThroughInvoices(tx, { siteId: input.params.siteId }) }),
);

export const POST = apiRoute(
  // Validated in the domain function against the site's currency.
  { permission: "budget.write", params: siteParams, body: z.record(z.string(), z.unknown()), scope: ({ params }, tx) => scopeOfSite(tx, params.siteId), status: 201 },
  async ({ tx, input, actor, audit }) => {
    const invoice = await approvePassThroughInvoice(tx, { siteId: input.params.siteId, body: input.body, actorId: actor.userId });
    await audit({ action: "pass_through_invoice.approved", entityType: "pass_through_invoice", entityId: invoice.id, after: { ...invoice, amountMinor: invoice.amountMinor.toString() } });
    return { invoice };
  },
);
