import "server-only";
import nodemailer, { type Transporter } from "nodemailer";
import { env } from "@/env";

let transporter: Transporter | undefined;

export function mailTransport(): Transporter {
  transporter ??= nodemailer.createTransport({
    host: env.SMTP_HOST,
    port: env.SMTP_PORT,
    secure: env.SMTP_SECURE,
    auth: env.SMTP_USER ? { user: env.SMTP_USER, pass: env.SMTP_PASS ?? "" } : undefined,
    // Local fake has no TLS; a real relay negotiates STARTTLS.
    ignoreTLS: env.SMTP_HOST === "127.0.0.1" && !env.SMTP_SECURE,
    connectionTimeout: 5_000,
    greetingTimeout: 5_000,
    socketTimeout: 10_000,
  });
  return transporter;
}
