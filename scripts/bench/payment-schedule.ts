// Benchmark of the payment-schedule engine on a generated 200-site study.
// Run: npx tsx scripts/bench/payment-schedule.ts
import { existsSync, readFileSync } from "node:fs";
import { performance } from "node:perf_hooks";
import { setFlagsFromString } from "node:v8";
import { runInNewContext } from "node:vm";
import { computePaymentSchedule } from "../../src/lib/payment-schedule/compute-payment-schedule";
import { generateStudy } from "./generate-study";

// A server computes schedules again and again: the figure that counts is the steady state, after the
// optimiser has compiled the engine and the heap has grown to its working size. The cold first run
// and the warm-up runs are printed too.
const WARMUP = 3;
const RUNS = 15;

// CPU time of the main thread alone (Linux): not inflated when other processes hold the cores.
const TICKS_PER_MS = 100 / 1000; // USER_HZ = 100 on Linux
function mainThreadCpuMs(): number | null {
  const file = `/proc/self/task/${process.pid}/stat`;
  if (!existsSync(file)) return null;
  const fields = readFileSync(file, "utf8").split(") ")[1]!.split(" ");
  return (Number(fields[11]) + Number(fields[12])) / TICKS_PER_MS;
}
// A full collection before reading the heap, so the figure is live data, not garbage.
setFlagsFromString("--expose-gc");
const gc = ((globalThis as { gc?: () => void }).gc ?? runInNewContext("gc")) as () => void;

const t0 = performance.now();
const snapshot = generateStudy({ sites: 200, subjects: 10_000, visits: 150_000, seed: 42 });
const generateMs = performance.now() - t0;
gc();
const heapBefore = process.memoryUsage().heapUsed;

// No forced collection between runs: a full GC shrinks the young generation and makes the next
// run pay for regrowing it, which a running server does not.
// One computation from a collected heap: live data plus that run's garbage, before any collection
// of the old generation (V8 may defer it while memory is plentiful).
const coldStart = performance.now();
let result = computePaymentSchedule(snapshot);
const coldMs = performance.now() - coldStart;
const heapAfterOneRun = process.memoryUsage().heapUsed;
const warmupTimes: number[] = [];
for (let i = 0; i < WARMUP; i++) {
  const start = performance.now();
  result = computePaymentSchedule(snapshot);
  warmupTimes.push(performance.now() - start);
}
const times: number[] = [];
const cpuTimes: number[] = [];
const mainCpuTimes: number[] = [];
let peakHeap = 0;
for (let i = 0; i < RUNS; i++) {
  const start = performance.now();
  const cpu = process.cpuUsage();
  const mainCpu = mainThreadCpuMs();
  result = computePaymentSchedule(snapshot);
  const mainCpuAfter = mainThreadCpuMs();
  if (mainCpu !== null && mainCpuAfter !== null) mainCpuTimes.push(mainCpuAfter - mainCpu);
  times.push(performance.now() - start);
  const used = process.cpuUsage(cpu);
  cpuTimes.push((used.user + used.system) / 1000);
  peakHeap = Math.max(peakHeap, process.memoryUsage().heapUsed);
}
gc();
const heapAfter = process.memoryUsage().heapUsed;
cpuTimes.sort((a, b) => a - b);
mainCpuTimes.sort((a, b) => a - b);
times.sort((a, b) => a - b);
const median = times[Math.floor(times.length / 2)] as number;
const p90 = times[Math.ceil(times.length * 0.9) - 1] as number;
const mb = (n: number) => (n / 1024 / 1024).toFixed(1);

console.log(`study: ${snapshot.sites.length} sites, ${snapshot.subjects.length} subjects, ${snapshot.visits.length} visits, ${(snapshot.payments ?? []).length} payments, ${snapshot.projection?.scheduledVisits.length ?? 0} scheduled visits (generated in ${generateMs.toFixed(0)} ms)`);
console.log(`output: ${result.lines.length} lines, ${result.cycles.length} cycle summaries, ${result.currencies.length} currencies, ${result.pending.length} pending events`);
console.log(`engine: median ${median.toFixed(1)} ms, p90 ${p90.toFixed(1)} ms over ${RUNS} runs (min ${times[0]!.toFixed(1)}, max ${times[times.length - 1]!.toFixed(1)}) — target < 300 ms; first (cold) run ${coldMs.toFixed(0)} ms, then ${WARMUP} warm-up runs ${warmupTimes.map((t) => t.toFixed(0)).join(", ")} ms`);
console.log(`CPU time per run: median ${cpuTimes[Math.floor(cpuTimes.length / 2)]!.toFixed(1)} ms all threads (incl. parallel GC)${mainCpuTimes.length ? `, ${mainCpuTimes[Math.floor(mainCpuTimes.length / 2)]!.toFixed(0)} ms main thread (10 ms ticks)` : ""}; machine load average ${(await import("node:os")).loadavg()[0]!.toFixed(2)} on ${(await import("node:os")).cpus().length} cores`);
console.log(`heap used after a full GC: ${mb(heapAfter)} MB with the snapshot and one result held (${mb(heapBefore)} MB snapshot alone, result ≈ ${mb(heapAfter - heapBefore)} MB); heap right after one run ${mb(heapAfterOneRun)} MB (its garbage included); highest heap seen across the ${RUNS} timed runs ${mb(peakHeap)} MB (garbage of several runs not yet collected) — target < 300 MB`);
console.log(`rss: ${mb(process.memoryUsage().rss)} MB`);
