// `npm run bench`: performance figures, printed (never asserted by tests).
//   npm run bench                 pure computations, database-backed API benches, first-load JS per route
//   npm run bench -- --start      also times a cold and a warm `npm start` in a fresh clone, and `npm test`
import { execFileSync, spawn } from "node:child_process";
import { existsSync, mkdtempSync, readFileSync, readdirSync, rmSync, statSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { gzipSync } from "node:zlib";
import { clusterDir, ensurePostgresInstalled, removeCluster, startCluster, stopCluster } from "./lib/postgres.mjs";
import { log } from "./lib/proc.mjs";
import { appEnv, buildApp, ensureDependencies, freePort, projectDir } from "./lib/setup.mjs";

const args = process.argv.slice(2);
const tsx = path.join(projectDir, "node_modules", ".bin", "tsx");
const benchDir = path.join(projectDir, "scripts", "bench");
// Benchmarks that need PostgreSQL read DATABASE_URL; the others are pure.
const needsDatabase = (file) => /DATABASE_URL/.test(readFileSync(path.join(benchDir, file), "utf8"));

function runBench(file, env) {
  log(`bench ${file}`);
  execFileSync(tsx, ["--conditions=react-server", path.join(benchDir, file)], { cwd: projectDir, env, stdio: "inherit" });
}

function firstLoadJs() {
  const manifestFile = path.join(projectDir, ".next", "build-manifest.json");
  if (!existsSync(manifestFile)) return;
  const m = JSON.parse(readFileSync(manifestFile, "utf8"));
  const size = (f) => {
    const p = path.join(projectDir, ".next", f);
    if (!existsSync(p)) return [0, 0];
    const buf = readFileSync(p);
    return [buf.length, gzipSync(buf).length];
  };
  console.log("\nFirst-load JS per route (raw / gzip, kB):");
  for (const [route, group] of Object.entries(m.pagesChunkGroupBootstrapParams ?? {})) {
    const files = new Set([...(m.rootMainFiles ?? []), ...(group.otherChunks ?? []), ...pageEntryFiles(route)]);
    let raw = 0;
    let gz = 0;
    for (const f of files) {
      const [r, g] = size(f);
      raw += r;
      gz += g;
    }
    console.log(`  ${route.padEnd(60)} ${(raw / 1024).toFixed(0).padStart(6)} / ${(gz / 1024).toFixed(0).padStart(5)}`);
  }
}

/** Client chunks a page loads, from its client-reference manifest. */
function pageEntryFiles(route) {
  const file = path.join(projectDir, ".next", "server", "app", `${route}_client-reference-manifest.js`);
  if (!existsSync(file)) return [];
  const g = {};
  new Function("globalThis", readFileSync(file, "utf8"))(g);
  const manifest = g.__RSC_MANIFEST?.[route];
  return Object.values(manifest?.entryJSFiles ?? {}).flat();
}

function timeCommand(label, cmd, cmdArgs, { cwd, untilLine, env }) {
  return new Promise((resolve, reject) => {
    const t0 = Date.now();
    const child = spawn(cmd, cmdArgs, { cwd, env, stdio: ["ignore", "pipe", "pipe"], detached: true });
    let out = "";
    const onData = (d) => {
      out += d.toString();
      if (untilLine && out.includes(untilLine)) {
        const s = (Date.now() - t0) / 1000;
        process.kill(-child.pid, "SIGINT");
        child.on("exit", () => resolve(s));
      }
    };
    child.stdout.on("data", onData);
    child.stderr.on("data", onData);
    child.on("exit", (code) => {
      if (!untilLine) resolve((Date.now() - t0) / 1000);
      else if (!out.includes(untilLine)) reject(new Error(`${label} exited (${code}) before "${untilLine}":\n${out.slice(-2000)}`));
    });
  });
}

async function startTimings() {
  const clone = mkdtempSync(path.join("/var/tmp", "cairn-bench-clone-"));
  try {
    execFileSync("git", ["clone", "-q", projectDir, clone]);
    const env = { ...process.env, PORT: String(await freePort()), CAIRN_PG_PORT: String(await freePort()), S3_FAKE_PORT: String(await freePort()), SMTP_FAKE_PORT: String(await freePort()), SMTP_FAKE_WEB_PORT: String(await freePort()), STRIPE_FAKE_PORT: String(await freePort()) };
    const cold = await timeCommand("cold start", "npm", ["start"], { cwd: clone, env, untilLine: "Ctrl-C stops everything" });
    await new Promise((r) => setTimeout(r, 2000));
    const warm = await timeCommand("warm start", "npm", ["start"], { cwd: clone, env, untilLine: "Ctrl-C stops everything" });
    await new Promise((r) => setTimeout(r, 2000));
    const test = await timeCommand("npm test", "npm", ["test"], { cwd: clone, env });
    console.log(`\nnpm start on a fresh clone (cold): ${cold.toFixed(1)} s`);
    console.log(`npm start again (warm):            ${warm.toFixed(1)} s`);
    console.log(`npm test:                          ${test.toFixed(1)} s`);
  } finally {
    rmSync(clone, { recursive: true, force: true });
  }
}

ensureDependencies();
const benches = readdirSync(benchDir).filter((f) => f.endsWith(".ts") && statSync(path.join(benchDir, f)).isFile() && !f.startsWith("generate-") && !f.startsWith("_"));
const baseEnv = { ...process.env, NODE_ENV: "production", AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED: "true" };
for (const f of benches.filter((f) => !needsDatabase(f))) runBench(f, baseEnv);

const dbBenches = benches.filter(needsDatabase);
if (dbBenches.length > 0) {
  const pgBin = ensurePostgresInstalled();
  const pg = { bin: pgBin, dir: clusterDir(projectDir, `pg-bench-${process.pid}`) };
  try {
    const { url } = startCluster({ ...pg, port: await freePort(), database: "cairn_bench", fast: true });
    const ports = { s3: await freePort(), smtp: await freePort(), smtpWeb: await freePort(), stripe: await freePort() };
    const env = { ...appEnv({ databaseUrl: url, appPort: await freePort(), ports, secret: "cairn-bench-secret-0123456789" }), NODE_ENV: "production" };
    execFileSync(tsx, ["scripts/migrate.ts"], { cwd: projectDir, env, stdio: "inherit" });
    for (const f of dbBenches) runBench(f, env);
  } finally {
    stopCluster(pg);
    removeCluster(pg);
  }
}

buildApp({ ...baseEnv });
firstLoadJs();
if (args.includes("--start")) await startTimings();
