import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { db } from "@/server/db/client";
import { getStudyContext } from "@/server/studies/study-context";
import { getStudySummary } from "@/server/ledger/get-study-summary";
import { accessibleSiteIds, can, canSomewhere } from "@/lib/auth/authorize";
import { studyPath } from "@/lib/nav";
import { formatMinor } from "@/lib/money";
import { SiteLedger } from "./_components/site-ledger";
import { CashFlowChart } from "./_components/cash-flow-chart";
import { RateForm } from "./_components/rate-form";

export const metadata: Metadata = { title: "Payments" };

const FIGURES = [
  ["earnedMinor", "Earned"],
  ["paidMinor", "Paid"],
  ["outstandingMinor", "Outstanding"],
  ["overdueMinor", "of which overdue"],
  ["heldBackMinor", "Held back"],
] as const;

export default async function LedgerPage({ params, searchParams }: { params: Promise<{ studyId: string }>; searchParams: Promise<{ site?: string }> }) {
  const { studyId } = await params;
  const { site: siteParam } = await searchParams;
  const { actor } = await getStudyContext(studyId);
  if (!canSomewhere(actor, "ledger.read", studyId)) notFound();
  const siteIds = accessibleSiteIds(actor, "ledger.read", studyId);
  const summary = await getStudySummary(db, { studyId, siteIds });
  const selected = summary.sites.find((s) => s.siteId === siteParam) ?? (summary.sites.length === 1 ? summary.sites[0] : undefined);
  const studyWide = siteIds === "all";
  const m = (minor: bigint, currency: string) => formatMinor(minor, currency);

  return (
    <div className="space-y-6">
      <h1>Payments</h1>
      <p className="governs">
        Cairn computes these figures from the recorded events and each site&apos;s budget. The signed clinical trial agreement, the approved protocol and the ethics committee&apos;s and regulators&apos;
        rules govern what is owed and when.
      </p>

      <section className="space-y-2" aria-labelledby="summary-heading">
        <h2 id="summary-heading">{studyWide ? "Study summary by site" : "Your site"}</h2>
        <div className="overflow-x-auto">
          <table className="table-dense" data-testid="summary-by-site">
            <thead>
              <tr>
                <th>Site</th>
                <th>Currency</th>
                {FIGURES.map(([, label]) => (
                  <th key={label} className="text-right">
                    {label}
                  </th>
                ))}
              </tr>
            </thead>
            <tbody>
              {summary.sites.map((s) => (
                <tr key={s.siteId} aria-current={selected?.siteId === s.siteId ? "true" : undefined}>
                  <td>
                    <Link className="underline" href={`${studyPath(studyId, "ledger")}?site=${s.siteId}`}>
                      <span className="font-mono">{s.code}</span> {s.name}
                    </Link>
                  </td>
                  <td>{s.currency}</td>
                  {FIGURES.map(([f]) => (
                    <td key={f} className="amount">
                      {m(s[f], s.currency)}
                    </td>
                  ))}
                </tr>
              ))}
            </tbody>
          </table>
        </div>
        {studyWide ? (
          <>
            <h3>By currency, and converted into {summary.reportingCurrency}</h3>
            <table className="table-dense" data-testid="summary-by-currency">
              <thead>
                <tr>
                  <th>Currency</th>
                  <th className="text-right">Sites</th>
                  {FIGURES.map(([, label]) => (
                    <th key={label} className="text-right">
                      {label}
                    </th>
                  ))}
                  <th>Rate used</th>
                </tr>
              </thead>
              <tbody>
                {summary.currencies.map((c) => {
                  const r = summary.converted.earnedMinor.lines.find((l) => l.currency === c.currency);
                  return (
                    <tr key={c.currency}>
                      <td>{c.currency}</td>
                      <td className="amount">{c.siteCount}</td>
                      {FIGURES.map(([f]) => (
                        <td key={f} className="amount">
                          {m(c[f], c.currency)}
                        </td>
                      ))}
                      <td className="text-sm">{c.currency === summary.reportingCurrency ? "—" : r?.rate ? `${r.rate} (${r.rateDate})` : "no rate entered"}</td>
                    </tr>
                  );
                })}
              </tbody>
              <tfoot>
                <tr className="font-semibold">
                  <td colSpan={2}>Total in {summary.reportingCurrency}</td>
                  {FIGURES.map(([f]) => (
                    <td key={f} className="amount">
                      {m(summary.converted[f].totalMinor, summary.reportingCurrency)}
                    </td>
                  ))}
                  <td className="text-sm">{summary.converted.earnedMinor.missing.length ? `leaves out ${summary.converted.earnedMinor.missing.join(", ")} (no rate)` : ""}</td>
                </tr>
              </tfoot>
            </table>
            <p className="text-xs text-muted">Converted with the latest rate entered on or before {summary.asOf.slice(0, 10)}; each amount is converted once and rounded half away from zero.</p>
            {can(actor, "rates.write", { studyId }) ? (
              <RateForm studyId={studyId} reportingCurrency={summary.reportingCurrency} currencies={summary.currencies.map((c) => c.currency).filter((c) => c !== summary.reportingCurrency)} />
            ) : null}
          </>
        ) : null}
      </section>

      <section className="space-y-2" aria-labelledby="cash-heading">
        <h2 id="cash-heading">Cash flow: paid, due and projected</h2>
        <CashFlowChart studyId={studyId} />
      </section>

      <section className="space-y-2" aria-labelledby="ledger-heading">
        <h2 id="ledger-heading">{selected ? <>Ledger — <span className="font-mono">{selected.code}</span> {selected.name}</> : "Site ledger"}</h2>
        {selected ? <SiteLedger studyId={studyId} siteId={selected.siteId} /> : <p>Choose a site in the table above to see its ledger.</p>}
      </section>
    </div>
  );
}
