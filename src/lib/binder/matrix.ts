import { toCsv } from "@/lib/csv";
import { emptyCounts, itemStateLabels, itemStates, type ItemState, type SiteBinder, type StateCounts } from "./readiness";

// The study view: sites × document types, each cell counting the items in each state.

export type MatrixSite = { id: string; code: string; name: string; status: string; binder: SiteBinder };
export type MatrixCell = { siteId: string; typeId: string; required: boolean; counts: StateCounts };
export type MatrixRow = { siteId: string; code: string; name: string; status: string; totals: StateCounts; readyCount: number; requiredCount: number; cells: MatrixCell[] };

export function buildMatrix(sites: readonly MatrixSite[], typeIds: readonly string[]): MatrixRow[] {
  return sites.map((s) => {
    const cells = typeIds.map((typeId): MatrixCell => {
      const items = s.binder.items.filter((i) => i.type.id === typeId);
      const counts = emptyCounts();
      for (const i of items) if (i.required || i.current) counts[i.state]++;
      return { siteId: s.id, typeId, required: items.some((i) => i.required), counts };
    });
    return { siteId: s.id, code: s.code, name: s.name, status: s.status, totals: s.binder.counts, readyCount: s.binder.readyCount, requiredCount: s.binder.requiredCount, cells };
  });
}

/** Keep the rows with at least one item in `state` (all rows when no state is given). */
export function filterMatrix(rows: readonly MatrixRow[], { state, siteCode }: { state?: ItemState; siteCode?: string }): MatrixRow[] {
  return rows.filter((r) => (!state || r.totals[state] > 0) && (!siteCode || r.code.toLowerCase().includes(siteCode.toLowerCase())));
}

/** One line per site and document type with the count in each state; CRLF line ends (RFC 4180 §2). */
export function matrixCsv(rows: readonly MatrixRow[], types: readonly { id: string; code: string; name: string }[]): string {
  const header = ["site_code", "site_name", "site_status", "document_type", "document_name", "required", ...itemStates];
  const lines: (string | number)[][] = [];
  const byId = new Map(types.map((t) => [t.id, t]));
  for (const r of rows) {
    for (const c of r.cells) {
      const t = byId.get(c.typeId);
      if (!t) continue;
      lines.push([r.code, r.name, r.status, t.code, t.name, c.required ? "yes" : "no", ...itemStates.map((s) => c.counts[s])]);
    }
  }
  return toCsv(header, lines);
}

export const stateColumnLabels = itemStates.map((s) => ({ state: s, label: itemStateLabels[s] }));
