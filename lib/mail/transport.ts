// The SMTP transport: nodemailer, configured from PINCHPOINT_SMTP_URL (the local sink by default).
import nodemailer, { type Transporter } from "nodemailer";
import { smtpUrl } from "./config";

/**
 * Short timeouts: the outbox worker must move on from an unreachable server and retry later,
 * rather than hold a claimed batch for nodemailer's default of minutes.
 */
export function createMailTransport(url: string = smtpUrl()): Transporter {
  return nodemailer.createTransport({ url, connectionTimeout: 10_000, greetingTimeout: 10_000, socketTimeout: 30_000 });
}

// One transport per URL per process, kept on globalThis like the database (Next may load this module twice).
const holder = globalThis as unknown as { __pinchpointMail?: { url: string; transport: Transporter } };

export function mailTransport(): Transporter {
  const url = smtpUrl();
  if (holder.__pinchpointMail?.url !== url) {
    holder.__pinchpointMail?.transport.close();
    holder.__pinchpointMail = { url, transport: createMailTransport(url) };
  }
  return holder.__pinchpointMail.transport;
}
