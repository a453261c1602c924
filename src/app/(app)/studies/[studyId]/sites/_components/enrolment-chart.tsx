import type { SiteEnrolment } from "@/server/sites/enrolment-overview";

// Enrolment against target per site: horizontal bars (SVG) with the same figures as a table for
// screen readers and for reading exact numbers. Bars use pattern and text, not colour alone.
export function EnrolmentChart({ rows }: { rows: SiteEnrolment[] }) {
  const shown = rows.filter((r) => r.target > 0 || r.enrolled > 0);
  const max = Math.max(1, ...shown.map((r) => Math.max(r.target, r.enrolled)));
  const rowH = 26;
  const left = 64;
  const width = 560;
  const scale = (n: number) => ((width - left - 90) * n) / max;
  const height = shown.length * rowH + 24;
  const total = shown.reduce((a, r) => ({ enrolled: a.enrolled + r.enrolled, target: a.target + r.target }), { enrolled: 0, target: 0 });
  return (
    <figure className="space-y-3" data-testid="enrolment-chart">
      <figcaption className="text-sm">
        Enrolled subjects against target, by site — {total.enrolled} of {total.target} in all. Filled bar: enrolled; outline: target.
      </figcaption>
      <svg role="img" aria-labelledby="enrolment-chart-title" viewBox={`0 0 ${width} ${height}`} className="w-full max-w-2xl">
        <title id="enrolment-chart-title">Enrolment against target by site (figures in the table below)</title>
        {shown.map((r, i) => {
          const y = i * rowH + 4;
          return (
            <g key={r.siteId}>
              <text x={0} y={y + 15} className="fill-ink font-mono" fontSize={12}>
                {r.code}
              </text>
              <rect x={left} y={y + 2} width={scale(r.target)} height={rowH - 10} className="fill-none stroke-ink" strokeDasharray="4 2" />
              <rect x={left} y={y + 5} width={scale(r.enrolled)} height={rowH - 16} className="fill-lichen" />
              <text x={left + Math.max(scale(r.target), scale(r.enrolled)) + 6} y={y + 15} fontSize={12} className="fill-ink">
                {r.enrolled} / {r.target}
              </text>
            </g>
          );
        })}
      </svg>
      <table className="table-dense" data-testid="enrolment-table">
        <caption className="sr-only">Enrolment by site</caption>
        <thead>
          <tr>
            <th scope="col">Site</th>
            <th scope="col" className="text-right">
              Target
            </th>
            <th scope="col" className="text-right">
              Screened
            </th>
            <th scope="col" className="text-right">
              Screen failed
            </th>
            <th scope="col" className="text-right">
              Enrolled
            </th>
            <th scope="col" className="text-right">
              Implanted
            </th>
            <th scope="col" className="text-right">
              Withdrawn
            </th>
            <th scope="col" className="text-right">
              Visits overdue
            </th>
          </tr>
        </thead>
        <tbody>
          {rows.map((r) => (
            <tr key={r.siteId}>
              <th scope="row" className="font-mono">
                {r.code}
              </th>
              <td className="amount">{r.target}</td>
              <td className="amount">{r.screened}</td>
              <td className="amount">{r.screenFailed}</td>
              <td className="amount">{r.enrolled}</td>
              <td className="amount">{r.implanted}</td>
              <td className="amount">{r.withdrawn}</td>
              <td className="amount">{r.overdueVisits}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </figure>
  );
}
