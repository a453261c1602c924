// Shared steps of `npm start` and `npm test` (Node built-ins only: runs before npm packages exist).
import { createHash, randomBytes } from "node:crypto";
import { existsSync, mkdirSync, readFileSync, readdirSync, statSync, writeFileSync } from "node:fs";
import { createServer } from "node:net";
import { tmpdir } from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { log, run, startChild, waitForHttp, waitForPort } from "./proc.mjs";

export const projectDir = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "../..");
export const stateDir = path.join(projectDir, ".cairn");
const bin = (name) => path.join(projectDir, "node_modules", ".bin", name);

function fileHash(files) {
  const h = createHash("sha256");
  for (const f of files) {
    if (!existsSync(f)) continue;
    h.update(f);
    h.update(readFileSync(f));
  }
  return h.digest("hex");
}

/**
 * `npm ci` when node_modules is missing; `npm install` when package-lock.json changed since the last
 * install (it never deletes node_modules under processes that are using it).
 */
export function ensureDependencies() {
  const lock = path.join(projectDir, "package-lock.json");
  const marker = path.join(projectDir, "node_modules", ".cairn-lock-hash");
  const want = fileHash([lock]);
  if (existsSync(marker) && readFileSync(marker, "utf8") === want) return;
  const fresh = !existsSync(path.join(projectDir, "node_modules"));
  log(fresh ? "Installing npm packages (npm ci) …" : "package-lock.json changed: updating npm packages (npm install) …");
  const install = `${fresh ? "npm ci" : "npm install"} --no-audit --no-fund`;
  // Under a lock, re-checking the marker: two scripts started together install once, and never
  // delete node_modules under each other.
  const script = `[ "$(cat '${marker}' 2>/dev/null)" = '${want}' ] || { ${install} && printf %s '${want}' > '${marker}'; }`;
  if (existsSync("/usr/bin/flock")) run("/usr/bin/flock", [path.join(tmpdir(), "cairn-npm.lock"), "sh", "-c", script], { cwd: projectDir });
  else run("sh", ["-c", script], { cwd: projectDir });
}

/** Debian's chromium for the browser tests, installed with apt-get when missing. */
export function ensureChromium() {
  if (existsSync("/usr/bin/chromium")) return "/usr/bin/chromium";
  log("Installing Debian's chromium for the browser tests (apt-get) …");
  run("apt-get", ["update", "-qq"]);
  run("apt-get", ["install", "-y", "-qq", "chromium"], { env: { ...process.env, DEBIAN_FRONTEND: "noninteractive" } });
  return "/usr/bin/chromium";
}

export function freePort() {
  return new Promise((resolve, reject) => {
    const srv = createServer();
    srv.unref();
    srv.on("error", reject);
    srv.listen(0, "127.0.0.1", () => {
      const { port } = srv.address();
      srv.close(() => resolve(port));
    });
  });
}

/** A secret kept in .cairn so sessions survive restarts of `npm start`. */
export function persistentSecret(name) {
  mkdirSync(stateDir, { recursive: true });
  const f = path.join(stateDir, name);
  if (!existsSync(f)) writeFileSync(f, randomBytes(32).toString("base64url"), { mode: 0o600 });
  return readFileSync(f, "utf8").trim();
}

export function migrateAndSeed(env) {
  run(bin("tsx"), ["scripts/migrate.ts"], { cwd: projectDir, env });
  run(bin("tsx"), ["scripts/seed.ts"], { cwd: projectDir, env });
}

/** Start the three local fakes (one child process) and wait for their ports. */
export async function startFakes(env, ports, { silent = false } = {}) {
  const child = startChild("fakes", process.execPath, ["docker-free-fakes/start-all.mjs"], { cwd: projectDir, env, silent });
  await Promise.all([ports.s3, ports.smtp, ports.smtpWeb, ports.stripe].map((p) => waitForPort(p, { child, timeoutMs: 30_000 })));
  return child;
}

function walk(dir, out = []) {
  if (!existsSync(dir)) return out;
  for (const name of readdirSync(dir).sort()) {
    const p = path.join(dir, name);
    const st = statSync(p);
    if (st.isDirectory()) walk(p, out);
    else out.push(p);
  }
  return out;
}

/** `next build` unless the last build was made from exactly these sources. */
export function buildApp(env) {
  const inputs = [
    ...walk(path.join(projectDir, "src")),
    ...walk(path.join(projectDir, "public")),
    ...["package-lock.json", "next.config.ts", "tailwind.config.ts", "postcss.config.mjs", "tsconfig.json"].map((f) => path.join(projectDir, f)),
  ];
  const want = fileHash(inputs);
  const marker = path.join(projectDir, ".next", "cairn-source-hash");
  if (existsSync(path.join(projectDir, ".next", "BUILD_ID")) && existsSync(marker) && readFileSync(marker, "utf8") === want) {
    log("App build is up to date.");
    return false;
  }
  log("Building the app (next build) …");
  const started = Date.now();
  run(bin("next"), ["build"], { cwd: projectDir, env });
  writeFileSync(marker, want);
  log(`Built in ${((Date.now() - started) / 1000).toFixed(1)} s.`);
  return true;
}

export async function startApp(env, port, { silent = false } = {}) {
  const child = startChild("app", bin("next"), ["start", "-H", "127.0.0.1", "-p", String(port)], { cwd: projectDir, env, silent });
  await waitForHttp(`http://127.0.0.1:${port}/sign-in`, { child, timeoutMs: 60_000 });
  return child;
}

export function startWorker(env, { silent = false } = {}) {
  return startChild("worker", bin("tsx"), ["--conditions=react-server", "src/worker/main.ts"], { cwd: projectDir, env, silent });
}

/** Environment for the app, worker, seed and tests, from the addresses chosen. */
export function appEnv({ databaseUrl, appPort, ports, secret, nodeEnv = "production" }) {
  return {
    ...process.env,
    NODE_ENV: nodeEnv,
    NEXT_TELEMETRY_DISABLED: "1",
    AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED: "true",
    DATABASE_URL: databaseUrl,
    NEXTAUTH_URL: `http://127.0.0.1:${appPort}`,
    NEXTAUTH_SECRET: secret,
    S3_ENDPOINT: process.env.S3_ENDPOINT ?? `http://127.0.0.1:${ports.s3}`,
    S3_FAKE_PORT: String(ports.s3),
    SMTP_HOST: process.env.SMTP_HOST ?? "127.0.0.1",
    SMTP_PORT: process.env.SMTP_PORT ?? String(ports.smtp),
    SMTP_FAKE_PORT: String(ports.smtp),
    SMTP_FAKE_WEB_PORT: String(ports.smtpWeb),
    MAILDEV_API_URL: `http://127.0.0.1:${ports.smtpWeb}`,
    STRIPE_API_HOST: process.env.STRIPE_API_HOST ?? "127.0.0.1",
    STRIPE_API_PORT: process.env.STRIPE_API_PORT ?? String(ports.stripe),
    STRIPE_FAKE_PORT: String(ports.stripe),
    STRIPE_FAKE_WEBHOOK_URL: `http://127.0.0.1:${appPort}/api/v1/webhooks/stripe`,
  };
}
