// Small process helpers for the start and test scripts (Node built-ins only).
import { execFileSync, spawn } from "node:child_process";
import { createConnection } from "node:net";

export const log = (msg) => console.log(`[cairn] ${msg}`);

export function run(cmd, args, { quiet = false, env, cwd } = {}) {
  try {
    return execFileSync(cmd, args, { stdio: quiet ? ["ignore", "pipe", "pipe"] : "inherit", env: env ?? process.env, cwd, encoding: "utf8" });
  } catch (err) {
    const detail = [err.stdout, err.stderr].filter(Boolean).join("\n").trim();
    throw new Error(`${cmd} ${args.join(" ")} failed${detail ? `:\n${detail}` : ""}`);
  }
}

/** Start a long-running child; its output is prefixed with a name. */
export function startChild(name, cmd, args, { env, cwd, silent = false } = {}) {
  const child = spawn(cmd, args, { env: env ?? process.env, cwd, stdio: ["ignore", "pipe", "pipe"], detached: true });
  const prefix = (stream, out) => {
    let buf = "";
    stream.on("data", (d) => {
      buf += d.toString();
      let i;
      while ((i = buf.indexOf("\n")) >= 0) {
        const line = buf.slice(0, i);
        buf = buf.slice(i + 1);
        if (!silent) out.write(`[${name}] ${line}\n`);
      }
    });
  };
  prefix(child.stdout, process.stdout);
  prefix(child.stderr, process.stderr);
  child.name = name;
  return child;
}

/** Kill a detached child and its process group. */
export function stopChild(child, signal = "SIGTERM") {
  if (!child || child.exitCode !== null) return;
  try {
    process.kill(-child.pid, signal);
  } catch {
    try {
      child.kill(signal);
    } catch {}
  }
}

export function waitForPort(port, { host = "127.0.0.1", timeoutMs = 60_000, child } = {}) {
  const start = Date.now();
  return new Promise((resolve, reject) => {
    const attempt = () => {
      if (child && child.exitCode !== null) return reject(new Error(`${child.name} exited with code ${child.exitCode}`));
      const sock = createConnection({ port, host });
      sock.once("connect", () => {
        sock.end();
        resolve();
      });
      sock.once("error", () => {
        sock.destroy();
        if (Date.now() - start > timeoutMs) reject(new Error(`Nothing answered on ${host}:${port} after ${timeoutMs} ms`));
        else setTimeout(attempt, 200);
      });
    };
    attempt();
  });
}

export async function waitForHttp(url, { timeoutMs = 60_000, child } = {}) {
  const start = Date.now();
  for (;;) {
    if (child && child.exitCode !== null) throw new Error(`${child.name} exited with code ${child.exitCode}`);
    try {
      const res = await fetch(url, { redirect: "manual" });
      if (res.status < 500) return;
    } catch {}
    if (Date.now() - start > timeoutMs) throw new Error(`${url} did not answer within ${timeoutMs} ms`);
    await new Promise((r) => setTimeout(r, 250));
  }
}

/**
 * A cross-process lock on a directory name (mkdir is atomic). Browser test runs in one checkout
 * share `.next`, so they take turns; a lock left by a dead process is taken over.
 */
export async function acquireDirLock(dir, { what = "lock" } = {}) {
  const { mkdirSync, readFileSync, rmSync, writeFileSync } = await import("node:fs");
  let announced = false;
  for (;;) {
    try {
      mkdirSync(dir);
      writeFileSync(`${dir}/pid`, String(process.pid));
      return () => rmSync(dir, { recursive: true, force: true });
    } catch (err) {
      if (err.code !== "EEXIST") throw err;
      let holder = NaN;
      try {
        holder = Number(readFileSync(`${dir}/pid`, "utf8"));
      } catch {}
      let alive = false;
      if (Number.isInteger(holder) && holder > 0) {
        try {
          process.kill(holder, 0);
          alive = true;
        } catch {}
      }
      if (!alive && Number.isInteger(holder)) {
        rmSync(dir, { recursive: true, force: true });
        continue;
      }
      if (!announced) {
        log(`Waiting for another run holding the ${what} …`);
        announced = true;
      }
      await new Promise((r) => setTimeout(r, 1000));
    }
  }
}
