import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { db } from "@/server/db/client";
import { listVersionsInForceAtSite } from "@/server/protocol/in-force";
import { getStudyContext } from "@/server/studies/study-context";
import { getSiteBudget } from "@/server/budgets/queries";
import { listPassThroughInvoices } from "@/server/budgets/pass-through-invoices";
import { can } from "@/lib/auth/authorize";
import { idSchema } from "@/lib/api/schemas";
import { studyPath } from "@/lib/nav";
import { ContractSchedule, type ScheduleVersion } from "./_components/contract-schedule";
import { BudgetForm, type BudgetFormDefaults } from "./_components/budget-form";
import { bpsToPercent } from "@/lib/budgets";
import { formatMinor } from "@/lib/money";

export const metadata: Metadata = { title: "Site budget" };

export default async function SiteBudgetPage({ params }: { params: Promise<{ studyId: string; siteId: string }> }) {
  const { studyId, siteId } = await params;
  const { actor } = await getStudyContext(studyId);
  if (!idSchema.safeParse(siteId).success || !can(actor, "budget.read", { studyId, siteId })) notFound();
  const data = await getSiteBudget(db, { siteId });
  if (!data || data.site.studyId !== studyId) notFound();
  const { site, versions } = data;
  const canWrite = can(actor, "budget.write", { studyId, siteId });

  // Protocol versions the site has approved: an amendment may follow one of them.
  const approvals = (await listVersionsInForceAtSite(db, { siteId }))
    .map((v) => ({ id: v.versionId, label: v.versionLabel, approvedOn: v.inForceFrom, schedule: v.schedule }))
    .reverse();
  const labelOf = new Map(approvals.map((a) => [a.id, a.label]));
  const invoices = await listPassThroughInvoices(db, { siteId });

  const shown: ScheduleVersion[] = versions.map((v) => ({
    ...v,
    protocolLabel: v.protocolVersionId ? (labelOf.get(v.protocolVersionId) ?? null) : null,
    items: v.items.map((i) => ({ kind: i.kind, milestone: i.milestone, n: i.n, visitCode: i.visitCode, amountMinor: i.amountMinor.toString() })),
  }));

  const latest = versions[versions.length - 1];
  const money = (m: bigint | undefined) => (m === undefined ? "" : formatMinor(m, site.currency, { withCode: false, grouping: false }));
  const visitCodes = [...new Set((approvals[0]?.schedule ?? []).map((v) => v.code))];
  const defaults: BudgetFormDefaults = latest
    ? {
        startupFee: money(latest.items.find((i) => i.kind === "startup")?.amountMinor),
        screenFailureFee: money(latest.items.find((i) => i.kind === "screen_failure")?.amountMinor),
        milestones: latest.items.filter((i) => i.kind === "milestone").map((i) => ({ kind: i.milestone!, n: i.n ? String(i.n) : "", amount: money(i.amountMinor) })),
        visitFees: [
          ...latest.items.filter((i) => i.kind === "visit").map((i) => ({ visitCode: i.visitCode!, amount: money(i.amountMinor) })),
          ...visitCodes.filter((c) => !latest.items.some((i) => i.visitCode === c)).map((c) => ({ visitCode: c, amount: "" })),
        ],
        screenFailureCapPerEnrolled: latest.screenFailureCapPerEnrolled ? String(latest.screenFailureCapPerEnrolled) : "",
        screenFailureCapMax: latest.screenFailureCapMax != null ? String(latest.screenFailureCapMax) : "",
        overheadPercent: bpsToPercent(latest.overheadBps),
        holdbackPercent: bpsToPercent(latest.holdbackBps),
        cycle: latest.cycle,
        netDays: String(latest.netDays),
        trigger: latest.trigger,
      }
    : {
        startupFee: "",
        screenFailureFee: "",
        milestones: [{ kind: "site_activated", n: "", amount: "" }],
        visitFees: visitCodes.map((c) => ({ visitCode: c, amount: "" })),
        screenFailureCapPerEnrolled: "4",
        screenFailureCapMax: "",
        overheadPercent: "25",
        holdbackPercent: "10",
        cycle: "quarterly",
        netDays: "45",
        trigger: "visit_completed",
      };

  return (
    <div className="space-y-6">
      <p className="text-sm">
        <Link className="underline" href={studyPath(studyId, "budgets")}>
          Budgets
        </Link>{" "}
        / <span className="font-mono">{site.code}</span>
      </p>
      <h1>
        Budget — <span className="font-mono">{site.code}</span> {site.name}
      </h1>
      <p className="governs">
        This is Cairn&apos;s reading of the site&apos;s payment schedule. The signed clinical trial agreement, the approved protocol and the ethics committee&apos;s and regulators&apos; rules
        govern; where they differ from this page, they prevail.
      </p>
      {shown.length === 0 ? <p>No budget has been entered for this site yet.</p> : <ContractSchedule currency={site.currency} versions={shown} />}
      <section className="space-y-2" aria-labelledby="invoices-heading">
        <h2 id="invoices-heading">Pass-through invoices approved</h2>
        {invoices.length === 0 ? (
          <p className="text-sm">None yet.</p>
        ) : (
          <table className="table-dense" data-testid="pass-through-invoices">
            <thead>
              <tr>
                <th>Approved on</th>
                <th>Description</th>
                <th>Invoice file</th>
                <th className="text-right">Amount</th>
              </tr>
            </thead>
            <tbody>
              {invoices.map(({ invoice, fileName }) => (
                <tr key={invoice.id}>
                  <td>{invoice.approvedOn}</td>
                  <td>{invoice.description}</td>
                  <td>{invoice.documentId ? <Link className="underline" href={studyPath(studyId, "documents")}>{fileName ?? "invoice"}</Link> : "—"}</td>
                  <td className="amount">{formatMinor(invoice.amountMinor, site.currency)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </section>
      {canWrite ? (
        <section className="card space-y-3">
          <h2>{latest ? "Amend the budget (a new version)" : "Enter the site's budget"}</h2>
          <p className="text-sm text-muted">
            {latest
              ? `Version ${latest.versionNumber} stays in effect for events before the new version's date; lines already earned keep the version they were earned under.`
              : "Amounts in major units of the site's currency; percentages with up to two decimals."}
          </p>
          <BudgetForm
            siteId={siteId}
            currency={site.currency}
            defaults={defaults}
            protocolVersions={approvals.map((a) => ({ id: a.id, label: a.label, approvedOn: a.approvedOn }))}
            nextVersion={(latest?.versionNumber ?? 0) + 1}
          />
        </section>
      ) : null}
    </div>
  );
}
