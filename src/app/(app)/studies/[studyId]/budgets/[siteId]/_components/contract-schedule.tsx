import { bpsToPercent, cycleLabels, milestoneLabels, triggerLabels } from "@/lib/budgets";
import { formatMinor } from "@/lib/money";
import { priceFee } from "@/lib/payment-schedule";
import type { BudgetVersionRow } from "@/server/db/schema";

export type ScheduleVersion = Omit<BudgetVersionRow, "createdAt"> & {
  createdAt: Date | string;
  protocolLabel: string | null;
  items: { kind: string; milestone: string | null; n: number | null; visitCode: string | null; amountMinor: string }[];
};

// The budget read like the payment schedule of an agreement: numbered clauses, one block per version.
export function ContractSchedule({ currency, versions }: { currency: string; versions: ScheduleVersion[] }) {
  const m = (minor: bigint) => formatMinor(minor, currency);
  return (
    <div className="space-y-6" data-testid="contract-schedule">
      {[...versions].reverse().map((v, idx) => {
        const amount = (kind: string) => BigInt(v.items.find((i) => i.kind === kind)?.amountMinor ?? "0");
        const visits = v.items.filter((i) => i.kind === "visit");
        const milestones = v.items.filter((i) => i.kind === "milestone");
        return (
          <article key={v.id} className="card space-y-3" aria-label={`Budget version ${v.versionNumber}`}>
            <header>
              <h2>
                Payment schedule, version {v.versionNumber}
                {idx === 0 ? <span className="ml-2 text-sm font-normal text-muted">(latest)</span> : null}
              </h2>
              <p className="text-sm">
                Applies to events with a service date on or after <strong>{v.effectiveFrom}</strong>
                {v.protocolLabel ? <> — follows protocol version {v.protocolLabel}, from the site&apos;s ethics-committee approval of it</> : null}.
                {v.reason ? <> Reason: {v.reason}</> : null}
              </p>
            </header>
            <ol className="list-decimal space-y-2 pl-6 text-sm">
              <li>All amounts are in {currency}. Overhead of {bpsToPercent(v.overheadBps)}% is added to each fee; {bpsToPercent(v.holdbackBps)}% of fee plus overhead is held back from each payment and released at close-out.</li>
              <li>
                Start-up fee: <span className="amount">{m(amount("startup"))}</span>, earned when the site is activated.
              </li>
              <li>
                Milestone fees:
                {milestones.length === 0 ? " none." : null}
                {milestones.length > 0 ? (
                  <table className="table-dense mt-1">
                    <tbody>
                      {milestones.map((i) => (
                        <tr key={`${i.milestone}-${i.n}`}>
                          <td>{i.milestone === "nth_enrolled" ? `${i.n} subjects enrolled` : milestoneLabels[i.milestone as keyof typeof milestoneLabels]}</td>
                          <td className="amount">{m(BigInt(i.amountMinor))}</td>
                        </tr>
                      ))}
                    </tbody>
                  </table>
                ) : null}
              </li>
              <li>
                Fees per completed visit, with overhead, holdback and the net paid per visit:
                <table className="table-dense mt-1">
                  <thead>
                    <tr>
                      <th>Visit</th>
                      <th className="text-right">Fee</th>
                      <th className="text-right">Overhead</th>
                      <th className="text-right">Held back</th>
                      <th className="text-right">Net</th>
                    </tr>
                  </thead>
                  <tbody>
                    {visits.map((i) => {
                      const p = priceFee(BigInt(i.amountMinor), v.overheadBps, v.holdbackBps);
                      return (
                        <tr key={i.visitCode}>
                          <td className="font-mono">{i.visitCode}</td>
                          <td className="amount">{m(p.grossMinor)}</td>
                          <td className="amount">{m(p.overheadMinor)}</td>
                          <td className="amount">{m(p.holdbackMinor)}</td>
                          <td className="amount">{m(p.netMinor)}</td>
                        </tr>
                      );
                    })}
                  </tbody>
                </table>
              </li>
              <li>
                Screen failures: <span className="amount">{m(amount("screen_failure"))}</span> each
                {v.screenFailureCapPerEnrolled ? `, at most one per ${v.screenFailureCapPerEnrolled} subjects enrolled` : ""}
                {v.screenFailureCapMax != null ? `${v.screenFailureCapPerEnrolled ? " and" : ","} at most ${v.screenFailureCapMax} in all` : ""}. A screen failure over the cap is listed at zero and becomes payable when later enrolment lifts the cap.
              </li>
              <li>Pass-through costs (for example ethics-committee fees) are reimbursed at cost, without overhead or holdback, on an approved invoice.</li>
              <li>
                A visit fee is earned on: {triggerLabels[v.trigger].toLowerCase()}. Earned lines are grouped in {cycleLabels[v.cycle].toLowerCase()} cycles and fall due {v.netDays} days after the
                cycle ends.
              </li>
            </ol>
          </article>
        );
      })}
    </div>
  );
}
