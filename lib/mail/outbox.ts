// The mail outbox. A notice is a row written in the caller's transaction (a rolled-back change
// sends nothing, a committed one cannot lose its mail); delivery happens later, off the request
// path, in the worker. Delivery is at-least-once: a worker that dies between the SMTP server's
// "250 OK" and marking the row sent will send that message again after the lease runs out.
import type { Transporter } from "nodemailer";
import { QueryTypes, type Transaction } from "sequelize";
import { z } from "zod";
import { db } from "@/models";
import { appUrl } from "@/lib/config";
import { mailFrom } from "./config";
import { renderMail, type TemplateData, type TemplateName } from "./templates";
import { mailTransport } from "./transport";

/** Give up after this many attempts. */
export const MAX_ATTEMPTS = 5;
/** Wait before attempt n+1 after failed attempt n (1 min, 5 min, 30 min, 2 h), common practice for mail retries. */
export const BACKOFF_MS = [60_000, 5 * 60_000, 30 * 60_000, 2 * 60 * 60_000] as const;
/** A claimed row is invisible to other workers this long; it bounds how late a crashed send is retried. */
export const LEASE_MS = 5 * 60_000;
const BATCH = 20;

const recipientsSchema = z.array(z.email().max(320)).min(1).max(100);

export interface EnqueueInput<T extends TemplateName> {
  to: string[];
  template: T;
  data: TemplateData<T>;
  /** a message with the same key is queued only once, ever (see notices.ts) */
  dedupeKey?: string;
}

/** Render and queue one message; returns its id, or null when the dedupe key was already used. */
export async function enqueueMail<T extends TemplateName>(input: EnqueueInput<T>, transaction?: Transaction): Promise<string | null> {
  const to = [...new Set(recipientsSchema.parse(input.to.map((a) => a.trim().toLowerCase())))];
  const mail = renderMail(input.template, input.data, { appUrl: appUrl() });
  const rows = await db().sequelize.query<{ id: string }>(
    // Due from now, truncated to milliseconds: delivery compares against a JavaScript Date (ms), and a
    // microsecond-precise now() could otherwise stay "in the future" for the rest of that millisecond.
    `INSERT INTO outbox_messages ("to", subject, text, html, template, dedupe_key, next_attempt_at)
     VALUES (ARRAY[:to]::text[], :subject, :text, :html, :template, :dedupeKey, date_trunc('milliseconds', now()))
     ON CONFLICT (dedupe_key) DO NOTHING
     RETURNING id`,
    {
      type: QueryTypes.SELECT,
      replacements: { to, ...mail, template: input.template, dedupeKey: input.dedupeKey ?? null },
      transaction,
    },
  );
  return rows[0]?.id ?? null;
}

export interface DeliverOptions {
  /** the clock; tests move it forward to reach retry times */
  now?: Date;
  /** defaults to the transport from PINCHPOINT_SMTP_URL */
  transport?: Transporter;
  /** defaults to PINCHPOINT_MAIL_FROM (or the demo sender) */
  from?: string;
  limit?: number;
}

export interface DeliveryReport {
  sent: number;
  /** failed this time, will be tried again */
  retrying: number;
  /** failed for good */
  failed: number;
}

interface ClaimedRow {
  id: string;
  to: string[];
  subject: string;
  text: string;
  html: string;
  template: string;
  attempts: number;
}

/** SMTP 5yz replies are permanent (RFC 5321 §4.2.1): trying again later cannot help. */
function isPermanent(error: unknown): boolean {
  const code = (error as { responseCode?: unknown } | null)?.responseCode;
  return typeof code === "number" && code >= 500 && code < 600;
}

function describe(error: unknown): string {
  if (error instanceof Error) {
    const code = (error as { code?: unknown }).code;
    return `${typeof code === "string" ? `${code}: ` : ""}${error.message}`.slice(0, 2000);
  }
  return String(error).slice(0, 2000);
}

let warnedNoFrom = false;

/**
 * Send what is due. Never throws: every failure is logged and recorded on its row, and a
 * database or configuration problem leaves the queue as it was for the next turn.
 */
export async function deliverOutbox(options: DeliverOptions = {}): Promise<DeliveryReport> {
  const report: DeliveryReport = { sent: 0, retrying: 0, failed: 0 };
  try {
    const from = options.from ?? mailFrom();
    if (!from) {
      // Not counted as an attempt: the messages are fine, the installation is not configured yet.
      if (!warnedNoFrom) console.error("[mail] PINCHPOINT_MAIL_FROM is not set: e-mail stays queued until it is");
      warnedNoFrom = true;
      return report;
    }
    const transport = options.transport ?? mailTransport();
    const limit = options.limit ?? BATCH;
    for (;;) {
      const now = options.now ?? new Date();
      const claimed = await claimDue({ now, limit });
      await Promise.all(claimed.map((row) => sendOne({ row, transport, from, now, report })));
      if (claimed.length < limit) break;
    }
  } catch (error) {
    console.error("[mail] outbox delivery stopped for this turn:", describe(error));
  }
  return report;
}

async function claimDue({ now, limit }: { now: Date; limit: number }): Promise<ClaimedRow[]> {
  // Claiming pushes next_attempt_at past a lease instead of holding row locks during SMTP, so
  // several workers share the queue and a dead worker's rows come back by themselves.
  return db().sequelize.query<ClaimedRow>(
    `UPDATE outbox_messages m
        SET attempts = m.attempts + 1, next_attempt_at = :leaseEnd
      WHERE m.id IN (
        SELECT id FROM outbox_messages
         WHERE status = 'queued' AND next_attempt_at <= :now
         ORDER BY next_attempt_at, created_at
         FOR UPDATE SKIP LOCKED
         LIMIT :limit)
      RETURNING m.id, m."to", m.subject, m.text, m.html, m.template, m.attempts`,
    { type: QueryTypes.SELECT, replacements: { now, leaseEnd: new Date(now.getTime() + LEASE_MS), limit } },
  );
}

async function sendOne({ row, transport, from, now, report }: { row: ClaimedRow; transport: Transporter; from: string; now: Date; report: DeliveryReport }): Promise<void> {
  const { sequelize } = db();
  try {
    const info = await transport.sendMail({
      from,
      to: row.to,
      subject: row.subject,
      text: row.text,
      html: row.html,
      headers: { "X-Pinchpoint-Template": row.template, "X-Pinchpoint-Outbox-Id": row.id },
    });
    const rejected = (info.rejected ?? []).map(String);
    if (rejected.length) console.warn(`[mail] ${row.id} (${row.template}): server refused ${rejected.join(", ")}; sent to the others`);
    // An invite carries a one-time secret: once delivered, the outbox keeps no copy of it.
    await sequelize.query(
      `UPDATE outbox_messages SET status = 'sent', sent_at = :now, last_error = :note,
              text = CASE WHEN template = 'invite' THEN '(invite delivered; the link is not kept)' ELSE text END,
              html = CASE WHEN template = 'invite' THEN '' ELSE html END
        WHERE id = :id`,
      { replacements: { id: row.id, now: new Date(), note: rejected.length ? `refused: ${rejected.join(", ")}` : null } },
    );
    report.sent++;
  } catch (error) {
    const message = describe(error);
    const giveUp = row.attempts >= MAX_ATTEMPTS || isPermanent(error);
    const wait = BACKOFF_MS[Math.min(row.attempts, BACKOFF_MS.length) - 1] ?? LEASE_MS;
    const next = new Date(now.getTime() + wait);
    if (giveUp) {
      console.error(`[mail] gave up on ${row.id} (${row.template} to ${row.to.join(", ")}) after ${row.attempts} attempt(s): ${message}`);
      report.failed++;
    } else {
      console.warn(`[mail] attempt ${row.attempts} of ${row.id} (${row.template}) failed, next at ${next.toISOString()}: ${message}`);
      report.retrying++;
    }
    await sequelize
      .query(
        `UPDATE outbox_messages SET status = :status, last_error = :message, next_attempt_at = :next,
                text = CASE WHEN :status = 'failed' AND template = 'invite' THEN '(invite not delivered; the link is not kept)' ELSE text END,
                html = CASE WHEN :status = 'failed' AND template = 'invite' THEN '' ELSE html END
          WHERE id = :id`, {
        replacements: { id: row.id, status: giveUp ? "failed" : "queued", message, next },
      })
      .catch((e: unknown) => console.error(`[mail] could not record the failure of ${row.id}:`, describe(e)));
  }
}
