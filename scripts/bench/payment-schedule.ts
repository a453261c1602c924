// Benchmark of the payment-schedule engine on a generated 200-site study.
// Run: npx tsx scripts/bench/payment-schedule.ts  (add --expose-gc through NODE_OPTIONS for steadier heap figures)
import { performance } from "node:perf_hooks";
import { computePaymentSchedule } from "../../src/lib/payment-schedule/compute-payment-schedule";
import { generateStudy } from "./generate-study";

const RUNS = 7;
const gc = (globalThis as { gc?: () => void }).gc;

const t0 = performance.now();
const snapshot = generateStudy({ sites: 200, subjects: 10_000, visits: 150_000, seed: 42 });
const generateMs = performance.now() - t0;
gc?.();
const heapBefore = process.memoryUsage().heapUsed;

const times: number[] = [];
let result = computePaymentSchedule(snapshot);
for (let i = 0; i < RUNS; i++) {
  gc?.();
  const start = performance.now();
  result = computePaymentSchedule(snapshot);
  times.push(performance.now() - start);
}
const heapAfter = process.memoryUsage().heapUsed;
times.sort((a, b) => a - b);
const median = times[Math.floor(times.length / 2)] as number;
const mb = (n: number) => (n / 1024 / 1024).toFixed(1);

console.log(`study: ${snapshot.sites.length} sites, ${snapshot.subjects.length} subjects, ${snapshot.visits.length} visits, ${(snapshot.payments ?? []).length} payments, ${snapshot.projection?.scheduledVisits.length ?? 0} scheduled visits (generated in ${generateMs.toFixed(0)} ms)`);
console.log(`output: ${result.lines.length} lines, ${result.cycles.length} cycle summaries, ${result.currencies.length} currencies, ${result.pending.length} pending events`);
console.log(`engine: median ${median.toFixed(1)} ms over ${RUNS} runs (min ${times[0]!.toFixed(1)}, max ${times[times.length - 1]!.toFixed(1)}) — target < 300 ms`);
console.log(`heap used: ${mb(heapAfter)} MB total with snapshot and one result held (${mb(heapBefore)} MB with the snapshot alone) — target < 300 MB`);
console.log(`rss: ${mb(process.memoryUsage().rss)} MB`);
