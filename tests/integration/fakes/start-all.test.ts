// docker-free-fakes/start-all.mjs as a process: starts the three fakes on the ports from the
// environment, reports them ready, and stops cleanly on SIGTERM.
import { spawn } from "node:child_process";
import fs from "node:fs";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { eventually, freePort, tempDir } from "./helpers";

const dataDir = tempDir("start-all");

afterAll(() => fs.rmSync(dataDir, { recursive: true, force: true }));

describe("start-all.mjs", () => {
  it("starts S3, SMTP and Stripe, answers on each, and exits 0 on SIGTERM", async () => {
    const ports = { s3: await freePort(), smtp: await freePort(), web: await freePort(), stripe: await freePort() };
    const child = spawn(process.execPath, [path.resolve("docker-free-fakes/start-all.mjs")], {
      env: {
        ...process.env,
        CAIRN_FAKES_DIR: dataDir,
        S3_BUCKET: "cairn-documents",
        S3_FAKE_PORT: String(ports.s3),
        SMTP_FAKE_PORT: String(ports.smtp),
        SMTP_FAKE_WEB_PORT: String(ports.web),
        STRIPE_FAKE_PORT: String(ports.stripe),
        STRIPE_FAKE_WEBHOOK_URL: "",
      },
      stdio: ["ignore", "pipe", "pipe"],
    });
    let output = "";
    child.stdout.on("data", (d: Buffer) => (output += d.toString()));
    child.stderr.on("data", (d: Buffer) => (output += d.toString()));
    const exited = new Promise<number | null>((resolve) => child.on("exit", (code) => resolve(code)));
    try {
      await eventually(() => output.includes("Fakes ready"), `start-all did not report ready; output so far:\n${output}`, 30_000);
      expect(output).toContain(`http://127.0.0.1:${ports.stripe}`);
      expect((await fetch(`http://127.0.0.1:${ports.stripe}/_fake/health`)).status).toBe(200);
      expect(await (await fetch(`http://127.0.0.1:${ports.web}/api/healthz`)).json()).toBe(true);
      expect((await fetch(`http://127.0.0.1:${ports.s3}/cairn-documents`)).status).toBe(200);
    } finally {
      child.kill("SIGTERM");
    }
    expect(await exited).toBe(0);
    expect(fs.existsSync(path.join(dataDir, "stripe", "state.json"))).toBe(true);
    await expect(fetch(`http://127.0.0.1:${ports.stripe}/_fake/health`)).rejects.toThrow();
  });
});
