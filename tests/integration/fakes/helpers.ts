// Shared helpers for the fakes' own tests: free ports, temporary data folders, a webhook receiver.
import fs from "node:fs";
import http from "node:http";
import net from "node:net";
import os from "node:os";
import path from "node:path";

/** A port that was free a moment ago (for servers that cannot report a port chosen by 0). */
export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = net.createServer();
    srv.once("error", reject);
    srv.listen(0, "127.0.0.1", () => {
      const addr = srv.address();
      const port = typeof addr === "object" && addr ? addr.port : 0;
      srv.close(() => resolve(port));
    });
  });
}

export function tempDir(prefix: string): string {
  return fs.mkdtempSync(path.join(os.tmpdir(), `cairn-${prefix}-`));
}

export interface ReceivedWebhook {
  body: string;
  signature: string;
}

/** A tiny HTTP receiver; `statuses` are answered in turn (then 200), like a flaky endpoint. */
export async function startWebhookReceiver() {
  const received: ReceivedWebhook[] = [];
  const statuses: number[] = [];
  const server = http.createServer((req, res) => {
    const chunks: Buffer[] = [];
    req.on("data", (c: Buffer) => chunks.push(c));
    req.on("end", () => {
      received.push({ body: Buffer.concat(chunks).toString("utf8"), signature: String(req.headers["stripe-signature"] ?? "") });
      res.writeHead(statuses.shift() ?? 200, { "content-type": "text/plain" });
      res.end("ok");
    });
  });
  await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", () => resolve()));
  const addr = server.address();
  const port = typeof addr === "object" && addr ? addr.port : 0;
  return {
    url: `http://127.0.0.1:${port}/webhooks/stripe`,
    received,
    statuses,
    clear() {
      received.length = 0;
      statuses.length = 0;
    },
    close: () =>
      new Promise<void>((resolve) => {
        server.closeAllConnections();
        server.close(() => resolve());
      }),
  };
}

/** JSON call to a fake's control API. */
export async function control<T = unknown>(baseUrl: string, method: string, pathname: string, body?: unknown): Promise<T> {
  const res = await fetch(`${baseUrl}${pathname}`, {
    method,
    headers: body === undefined ? {} : { "content-type": "application/json" },
    body: body === undefined ? undefined : JSON.stringify(body),
  });
  const json = (await res.json()) as T;
  if (!res.ok) throw new Error(`${method} ${pathname} -> ${res.status} ${JSON.stringify(json)}`);
  return json;
}

/** Polls until check() is truthy; fails with the message after timeoutMs. */
export async function eventually<T>(check: () => T | Promise<T>, message: string, timeoutMs = 10_000): Promise<NonNullable<T>> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const v = await check();
    if (v) return v as NonNullable<T>;
    if (Date.now() > deadline) throw new Error(`timed out: ${message}`);
    await new Promise((r) => setTimeout(r, 25));
  }
}
