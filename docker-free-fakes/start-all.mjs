// Starts the S3, SMTP and Stripe fakes in this process, waits until each answers, prints their
// addresses, and stops them all on SIGINT/SIGTERM. Ports and folders come from the environment.
import net from "node:net";
import { closeOnSignals } from "./common.mjs";
import { startS3Fake } from "./s3.mjs";
import { startSmtpFake } from "./smtp.mjs";
import { startStripeFake } from "./stripe.mjs";

/** Polls until check() resolves true, or fails after timeoutMs. */
async function waitUntil(name, check, timeoutMs = 15_000) {
  const deadline = Date.now() + timeoutMs;
  let lastError;
  while (Date.now() < deadline) {
    try {
      if (await check()) return;
    } catch (err) {
      lastError = err;
    }
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error(`${name} did not answer within ${timeoutMs} ms${lastError ? `: ${lastError.message}` : ""}`);
}

const httpOk = (url) => async () => (await fetch(url, { signal: AbortSignal.timeout(2000) })).status < 500;

/** True once the SMTP server sends its 220 greeting. */
function smtpGreets(host, port) {
  return () =>
    new Promise((resolve) => {
      const socket = net.connect(port, host);
      socket.setTimeout(2000, () => (socket.destroy(), resolve(false)));
      socket.once("data", (d) => {
        socket.end("QUIT\r\n");
        resolve(d.toString().startsWith("220"));
      });
      socket.once("error", () => resolve(false));
    });
}

const started = [];
try {
  const s3 = await startS3Fake();
  started.push(s3);
  const smtp = await startSmtpFake();
  started.push(smtp);
  const stripe = await startStripeFake();
  started.push(stripe);

  await Promise.all([
    waitUntil("S3 fake", httpOk(`${s3.url}/${s3.bucket}`)),
    waitUntil("SMTP fake (SMTP)", smtpGreets(smtp.smtpHost, smtp.smtpPort)),
    waitUntil("SMTP fake (web)", httpOk(`${smtp.apiUrl}/healthz`)),
    waitUntil("Stripe fake", httpOk(`${stripe.url}/_fake/health`)),
  ]);

  console.log(
    [
      "Fakes ready:",
      `  S3      ${s3.url}  bucket ${s3.bucket}`,
      `  SMTP    ${smtp.smtpUrl}  inbox ${smtp.webUrl}  REST ${smtp.apiUrl}`,
      `  Stripe  ${stripe.url}  control ${stripe.url}/_fake/state`,
      `  data under ${process.env.CAIRN_FAKES_DIR || ".cairn/fakes"}`,
    ].join("\n"),
  );
  closeOnSignals(started.map((f) => () => f.close()));
} catch (err) {
  console.error(`start-all: ${err?.message ?? err}`);
  await Promise.allSettled(started.map((f) => f.close()));
  process.exit(1);
}
