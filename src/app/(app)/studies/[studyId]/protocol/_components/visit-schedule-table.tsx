import type { ScheduledVisit } from "@/lib/protocol/visit-schedule";

const anchorLabels = { consent: "Consent", enrolment: "Enrolment", implant: "Implant" } as const;
export const signedDay = (d: number) => (d > 0 ? `+${d}` : String(d));

/** Read-only schedule of visits. */
export function VisitScheduleTable({ visits }: { visits: readonly ScheduledVisit[] }) {
  if (visits.length === 0) return <p className="text-sm">No visits defined.</p>;
  return (
    <div className="overflow-x-auto">
      <table className="table-dense" data-testid="visit-schedule">
        <thead>
          <tr>
            <th>Code</th>
            <th>Visit</th>
            <th>Anchor</th>
            <th className="text-right">Day</th>
            <th className="text-right">Window before</th>
            <th className="text-right">Window after</th>
            <th>Procedures</th>
          </tr>
        </thead>
        <tbody>
          {visits.map((v) => (
            <tr key={v.code}>
              <td className="font-mono">{v.code}</td>
              <td>{v.label}</td>
              <td>{anchorLabels[v.anchor]}</td>
              <td className="amount">{signedDay(v.dayOffset)}</td>
              <td className="amount">−{v.windowBefore}</td>
              <td className="amount">+{v.windowAfter}</td>
              <td>{v.procedures.join("; ")}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
