// Benchmark: every site's binder, the sites × document types matrix and its CSV for a large study.
// Run: npx tsx scripts/bench/binder-readiness.ts [runs]
// Deterministic data: 300 sites, the 11 default document types, 8 site people per site, up to
// three versions per item (about 11,000 uploads). Prints the median of the runs.
import { performance } from "node:perf_hooks";
import { computeSiteBinder, type BinderDocument, type BinderPerson, type BinderType } from "../../src/lib/binder/readiness";
import { buildMatrix, matrixCsv } from "../../src/lib/binder/matrix";
import { defaultBinderTypes } from "../../src/lib/binder/default-types";
import { addCalendarDays } from "../../src/lib/visits/calendar-date";
import { siteStatuses } from "../../src/lib/sites/site-status";
import type { Role } from "../../src/lib/auth/roles";
import { seededRandom } from "../lib/seeded-random";

const SITES = 300;
const PEOPLE = 8;
const TODAY = "2026-12-01";
const runs = Number(process.argv[2] ?? 7);

const rng = seededRandom;
const rand = rng(8);
const types: BinderType[] = defaultBinderTypes.map((t, i) => ({ id: `t${i}`, code: t.code, name: t.name, holder: t.holder, appliesToRoles: t.appliesToRoles, requiredFrom: t.requiredFrom, expires: t.expires }));
const roleCycle: Role[] = ["investigator", "coordinator", "site_finance", "investigator"];
const reviewStates = ["accepted", "accepted", "accepted", "awaiting_review", "rejected"] as const;

const sites = Array.from({ length: SITES }, (_, s) => {
  const people: BinderPerson[] = Array.from({ length: PEOPLE }, (_, p) => ({ userId: `u${s}-${p}`, name: `Person ${p}`, roles: [roleCycle[p % roleCycle.length]!] }));
  const documents: BinderDocument[] = [];
  for (const t of types) {
    const holders = t.holder === "site" ? [null] : people.filter((p) => p.roles.some((r) => t.appliesToRoles.includes(r)));
    for (const h of holders) {
      const versions = Math.floor(rand() * 4);
      for (let v = 0; v < versions; v++) {
        documents.push({
          id: `d${s}-${documents.length}`,
          documentTypeId: t.id,
          personId: h?.userId ?? null,
          fileName: "x.pdf",
          createdAt: `2026-0${1 + v}-10T09:00:00.000Z`,
          reviewState: reviewStates[Math.floor(rand() * reviewStates.length)]!,
          issuedOn: null,
          expiresOn: t.expires ? addCalendarDays(TODAY, Math.floor(rand() * 900) - 100) : null,
        });
      }
    }
  }
  return { id: `s${s}`, code: `S${s}`, name: `Site ${s}`, status: siteStatuses[1 + (s % 3)]!, people, documents };
});
const uploads = sites.reduce((n, s) => n + s.documents.length, 0);

const times: number[] = [];
let csvBytes = 0;
for (let r = 0; r < runs; r++) {
  const t0 = performance.now();
  const binders = sites.map((s) => ({ ...s, binder: computeSiteBinder({ today: TODAY, status: s.status, types, people: s.people, documents: s.documents }) }));
  const rows = buildMatrix(binders, types.map((t) => t.id));
  csvBytes = matrixCsv(rows, types).length;
  times.push(performance.now() - t0);
}
times.sort((a, b) => a - b);
console.log(`binder readiness: ${SITES} sites, ${types.length} types, ${uploads} uploads — median ${times[Math.floor(times.length / 2)]!.toFixed(1)} ms over ${runs} runs (min ${times[0]!.toFixed(1)} ms); CSV ${(csvBytes / 1024).toFixed(0)} kB`);
