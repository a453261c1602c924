// `npm start`: install what is missing, start a private PostgreSQL on loopback, migrate, seed the
// demo, start the local fakes, build and serve the app and its worker. Ctrl-C stops everything.
import { readFileSync } from "node:fs";
import path from "node:path";
import { clusterDir, ensurePostgresInstalled, startCluster, stopCluster } from "./lib/postgres.mjs";
import { log, stopChild } from "./lib/proc.mjs";
import { appEnv, buildApp, ensureDependencies, migrateAndSeed, persistentSecret, projectDir, startApp, startFakes, startWorker } from "./lib/setup.mjs";

const t0 = Date.now();
const num = (v, d) => (v ? Number(v) : d);
const appPort = num(process.env.PORT, 3000);
const ports = {
  pg: num(process.env.CAIRN_PG_PORT, 54329),
  s3: num(process.env.S3_FAKE_PORT, 4569),
  smtp: num(process.env.SMTP_FAKE_PORT, 1025),
  smtpWeb: num(process.env.SMTP_FAKE_WEB_PORT, 1080),
  stripe: num(process.env.STRIPE_FAKE_PORT, 12111),
};

const children = [];
let pg;
let stopping = false;
async function shutdown(code = 0) {
  if (stopping) return;
  stopping = true;
  log("Stopping …");
  for (const c of children.reverse()) stopChild(c);
  await new Promise((r) => setTimeout(r, 500));
  if (pg) stopCluster(pg);
  log("Stopped.");
  process.exit(code);
}
process.on("SIGINT", () => void shutdown(0));
process.on("SIGTERM", () => void shutdown(0));

try {
  ensureDependencies();
  const bin = ensurePostgresInstalled();
  pg = { bin, dir: clusterDir(projectDir, "pg") };
  const { url } = startCluster({ ...pg, port: ports.pg, database: "cairn" });
  log(`PostgreSQL on 127.0.0.1:${ports.pg} (data in ${path.relative(projectDir, pg.dir) || pg.dir})`);
  const env = appEnv({ databaseUrl: url, appPort, ports, secret: persistentSecret("nextauth-secret") });
  // Fakes first: the seed stores demo documents in the S3 fake.
  children.push(await startFakes({ ...env, CAIRN_FAKES_DIR: path.join(projectDir, ".cairn", "fakes") }, ports));
  migrateAndSeed(env);
  buildApp(env);
  children.push(startWorker(env));
  children.push(await startApp(env, appPort));
  for (const c of children) c.on("exit", (code) => !stopping && (log(`${c.name} stopped (code ${code}).`), void shutdown(1)));

  const signIns = JSON.parse(readFileSync(path.join(projectDir, "scripts/seed/demo-sign-ins.json"), "utf8"));
  const demoSignInsByRole = signIns.byRole;
  const DEMO_PASSWORD = signIns.password;
  const seconds = ((Date.now() - t0) / 1000).toFixed(1);
  console.log(`
  Cairn is running at  http://127.0.0.1:${appPort}   (ready in ${seconds} s)

  Demo sign-ins (password for all: ${DEMO_PASSWORD})
${Object.entries(demoSignInsByRole)
  .map(([role, email]) => `    ${role.padEnd(18)} ${email}`)
  .join("\n")}

  Mail inbox (SMTP fake)   http://127.0.0.1:${ports.smtpWeb}
  S3 fake                  http://127.0.0.1:${ports.s3}
  Stripe fake              http://127.0.0.1:${ports.stripe}/_fake/state
  PostgreSQL               127.0.0.1:${ports.pg}

  Ctrl-C stops everything.
`);
} catch (err) {
  console.error(`[cairn] start failed: ${err.message}`);
  await shutdown(1);
}
