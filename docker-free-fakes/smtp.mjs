// SMTP fake: maildev 3 (programmatic API) with SMTP and its web inbox + REST API (/api) on 127.0.0.1.
import { MailDev } from "maildev";
import { LOOPBACK, closeOnSignals, dataDirFor, envInt, isMain } from "./common.mjs";

export const DEFAULT_SMTP_PORT = 1025;
export const DEFAULT_SMTP_WEB_PORT = 1080;

/**
 * Starts the SMTP fake. Both ports must be concrete (maildev does not report a port chosen by 0).
 * @param {{ port?: number, webPort?: number, dataDir?: string, silent?: boolean }} [options]
 */
export async function startSmtpFake(options = {}) {
  const port = options.port ?? envInt("SMTP_FAKE_PORT", DEFAULT_SMTP_PORT);
  const webPort = options.webPort ?? envInt("SMTP_FAKE_WEB_PORT", DEFAULT_SMTP_WEB_PORT);
  const mailDirectory = dataDirFor("smtp", options.dataDir);
  const maildev = new MailDev({
    smtp: port,
    ip: LOOPBACK,
    web: webPort,
    webIp: LOOPBACK,
    mailDirectory,
    silent: options.silent ?? true,
  });
  await maildev.start();
  const webUrl = `http://${LOOPBACK}:${webPort}`;
  let closed = false;
  return {
    /** The web inbox; the REST API is under `${url}/api`. */
    url: webUrl,
    webUrl,
    apiUrl: `${webUrl}/api`,
    smtpHost: LOOPBACK,
    smtpPort: port,
    smtpUrl: `smtp://${LOOPBACK}:${port}`,
    directory: mailDirectory,
    async close() {
      if (closed) return;
      closed = true;
      await maildev.stop();
    },
  };
}

if (isMain(import.meta.url)) {
  const smtp = await startSmtpFake({ silent: process.env.SMTP_FAKE_VERBOSE !== "1" });
  console.log(`SMTP fake: ${smtp.smtpUrl} inbox=${smtp.webUrl} api=${smtp.apiUrl} data=${smtp.directory}`);
  closeOnSignals([() => smtp.close()]);
}
