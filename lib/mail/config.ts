// Mail settings from the environment (documented in README.md).
import path from "node:path";
import { demoMode } from "@/lib/config";

const DEFAULT_SMTP_URL = "smtp://127.0.0.1:2525";
const DEMO_FROM = "Pinchpoint <pinchpoint@harbor-pantry.example>";

export const smtpUrl = () => process.env.PINCHPOINT_SMTP_URL || DEFAULT_SMTP_URL;

/**
 * The From header. Demo mode has an invented default; a real installation must say who it sends
 * as, since a made-up sender would be rejected or land in spam at a real mail server.
 */
export function mailFrom(): string | null {
  return process.env.PINCHPOINT_MAIL_FROM || (demoMode() ? DEMO_FROM : null);
}

/** Where the local sink keeps messages (relative paths are taken from the working directory). */
export const mailDir = () => path.resolve(process.env.PINCHPOINT_MAIL_DIR || path.join(".data", "mail"));

export const sinkPort = () => Number(process.env.PINCHPOINT_SMTP_PORT || 2525);
