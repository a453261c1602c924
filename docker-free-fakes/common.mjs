// Helpers shared by the fakes: ports and data folders from the environment, CLI entry detection.
import fs from "node:fs";
import path from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";

export const LOOPBACK = "127.0.0.1";

/** Integer from an environment variable, or the fallback; refuses garbage instead of guessing. */
export function envInt(name, fallback) {
  const raw = process.env[name];
  if (raw === undefined || raw === "") return fallback;
  const n = Number(raw);
  if (!Number.isInteger(n) || n < 0) throw new Error(`${name} must be a non-negative integer, got "${raw}"`);
  return n;
}

/** Root data folder of the fakes (env CAIRN_FAKES_DIR, default .cairn/fakes under the working directory). */
export function fakesRoot() {
  return path.resolve(process.env.CAIRN_FAKES_DIR || ".cairn/fakes");
}

/** A fake's own data folder, created if missing. */
export function dataDirFor(name, explicit) {
  const dir = path.resolve(explicit ?? path.join(fakesRoot(), name));
  fs.mkdirSync(dir, { recursive: true });
  return dir;
}

/** True when the module at importMetaUrl is the script node was started with. */
export function isMain(importMetaUrl) {
  const entry = process.argv[1];
  if (!entry) return false;
  try {
    return pathToFileURL(fs.realpathSync(entry)).href === pathToFileURL(fs.realpathSync(fileURLToPath(importMetaUrl))).href;
  } catch {
    return false;
  }
}

/** Stops the given closers once on SIGINT/SIGTERM, then exits. */
export function closeOnSignals(closers, log = console.log) {
  let closing = false;
  const stop = async (signal) => {
    if (closing) return;
    closing = true;
    log(`${signal}: stopping`);
    const results = await Promise.allSettled(closers.map((c) => c()));
    const failed = results.filter((r) => r.status === "rejected");
    for (const f of failed) console.error(f.reason);
    process.exit(failed.length ? 1 : 0);
  };
  process.once("SIGINT", () => void stop("SIGINT"));
  process.once("SIGTERM", () => void stop("SIGTERM"));
}
