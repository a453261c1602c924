// `npm test`: the same set-up as `npm start` on a throw-away PostgreSQL cluster and fresh fakes on
// free ports, then every test (unit, integration, browser) in one vitest run, then a closing line
// "N passed, N failed". Leaves nothing running.
//   npm test                         everything
//   npm test -- tests/unit/money     only matching files (vitest filters); the app is built and
//                                    served only when browser tests are selected
import { existsSync, mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { spawn } from "node:child_process";
import { clusterDir, ensurePostgresInstalled, removeCluster, startCluster, stopCluster } from "./lib/postgres.mjs";
import { acquireDirLock, log, stopChild } from "./lib/proc.mjs";
import { appEnv, buildApp, ensureChromium, ensureDependencies, freePort, migrateAndSeed, projectDir, startApp, startFakes } from "./lib/setup.mjs";

const t0 = Date.now();
const args = process.argv.slice(2);
const wantsBrowser = args.length === 0 || args.some((a) => a.includes("browser"));
const children = [];
let pg;
let fakesDir;
let releaseBuildLock;

function cleanup() {
  for (const c of children.reverse()) stopChild(c);
  releaseBuildLock?.();
  if (pg) {
    stopCluster(pg);
    removeCluster(pg);
  }
  if (fakesDir) rmSync(fakesDir, { recursive: true, force: true });
}
process.on("SIGINT", () => (cleanup(), process.exit(130)));
process.on("SIGTERM", () => (cleanup(), process.exit(143)));

function runVitest(env, outFile) {
  const vitest = path.join(projectDir, "node_modules", ".bin", "vitest");
  const vArgs = ["run", "--reporter=default", "--reporter=json", `--outputFile.json=${outFile}`, ...args];
  return new Promise((resolve) => {
    const child = spawn(vitest, vArgs, { cwd: projectDir, env, stdio: "inherit" });
    child.on("exit", (code) => resolve(code ?? 1));
  });
}

let exitCode = 1;
try {
  ensureDependencies();
  const pgBin = ensurePostgresInstalled();
  const chromium = wantsBrowser ? ensureChromium() : undefined;
  const ports = { pg: await freePort(), s3: await freePort(), smtp: await freePort(), smtpWeb: await freePort(), stripe: await freePort() };
  const appPort = await freePort();
  pg = { bin: pgBin, dir: clusterDir(projectDir, `pg-test-${process.pid}`) };
  const { url } = startCluster({ ...pg, port: ports.pg, database: "cairn_test", fast: true });
  log(`Throw-away PostgreSQL on 127.0.0.1:${ports.pg}`);
  fakesDir = mkdtempSync(path.join(tmpdir(), "cairn-fakes-"));
  const env = {
    ...appEnv({ databaseUrl: url, appPort, ports, secret: "cairn-test-secret-0123456789abcdef" }),
    CAIRN_FAKES_DIR: fakesDir,
    STRIPE_FAKE_CONTROL_URL: `http://127.0.0.1:${ports.stripe}/_fake`,
    CAIRN_TEST_POSTGRES_BIN: pgBin,
    ...(chromium ? { CHROMIUM_PATH: chromium } : {}),
  };
  children.push(await startFakes(env, ports, { silent: true }));
  migrateAndSeed(env);
  if (wantsBrowser) {
    releaseBuildLock = await acquireDirLock(path.join(projectDir, ".cairn", "build.lock"), { what: "app build" });
    buildApp({ ...env, NODE_ENV: "production" });
    children.push(await startApp(env, appPort, { silent: true }));
    env.CAIRN_APP_URL = `http://127.0.0.1:${appPort}`;
  }
  log(`Set-up done in ${((Date.now() - t0) / 1000).toFixed(1)} s; running tests …`);
  const outFile = path.join(mkdtempSync(path.join(tmpdir(), "cairn-results-")), "results.json");
  const code = await runVitest({ ...env, NODE_ENV: "test" }, outFile);
  let passed = 0;
  let failed = 0;
  let skipped = 0;
  if (existsSync(outFile)) {
    const r = JSON.parse(readFileSync(outFile, "utf8"));
    passed = r.numPassedTests ?? 0;
    skipped = (r.numPendingTests ?? 0) + (r.numTodoTests ?? 0);
    // A file that fails to load has no failed test inside: count it as one failure.
    const brokenFiles = (r.testResults ?? []).filter((t) => t.status === "failed" && !(t.assertionResults ?? []).some((a) => a.status === "failed")).length;
    failed = (r.numFailedTests ?? 0) + brokenFiles;
  } else {
    failed = 1;
  }
  if (code !== 0 && failed === 0) failed = 1; // vitest failed without a counted test (e.g. a file that does not load)
  exitCode = failed > 0 ? 1 : 0;
  log(`Total time ${((Date.now() - t0) / 1000).toFixed(1)} s`);
  cleanup();
  console.log(`\n${passed} passed, ${failed} failed${skipped ? `, ${skipped} skipped` : ""}`);
} catch (err) {
  console.error(`[cairn] test set-up failed: ${err.message}`);
  cleanup();
  console.log(`\n0 passed, 1 failed`);
}
process.exit(exitCode);
