// Mail delivery: take due jobs of the queue `mail` and send their outbox messages over SMTP. The
// queue retries a failed send with exponential backoff (lib/data/job-queue.ts); a permanent refusal
// (SMTP 5yz) or the last attempt marks the message failed. Never throws: every failure is logged
// and recorded, and a database or configuration problem leaves the queue as it was.
import type { Transporter } from "nodemailer";
import { fetchMailJobs, loadOutboxMessage, recordDeliveryAttempt, type MailJobData } from "@/lib/data/mail-outbox";
import type { PgBoss } from "@/lib/data/job-queue";
import { mailFrom } from "@/lib/mail/config";
import { mailTransport } from "@/lib/mail/transport";

interface DeliverOptions {
  /** defaults to the transport from PINCHPOINT_SMTP_URL */
  transport?: Transporter;
  /** defaults to PINCHPOINT_MAIL_FROM (or the demo sender) */
  from?: string;
  /** jobs taken at once */
  limit?: number;
  /** take retries whose backoff has not ended yet (tests stand in for the passing of time with it) */
  ignoreBackoff?: boolean;
}

interface DeliveryReport {
  sent: number;
  /** failed this time, will be tried again */
  retrying: number;
  /** failed for good */
  failed: number;
}

const BATCH = 20;

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

/** Send every due message, in batches, until none is due. */
export async function deliverDueMail(options: DeliverOptions = {}): Promise<DeliveryReport> {
  const report: DeliveryReport = { sent: 0, retrying: 0, failed: 0 };
  try {
    const from = options.from ?? mailFrom();
    if (!from) {
      // Not an attempt: the messages are fine, the installation is not configured yet; they wait in the queue.
      if (!warnedNoFrom) console.error("[mail] PINCHPOINT_MAIL_FROM is not set: e-mail stays queued until it is");
      warnedNoFrom = true;
      return report;
    }
    const transport = options.transport ?? mailTransport();
    const limit = options.limit ?? BATCH;
    for (;;) {
      const jobs = await fetchMailJobs({ limit, ignoreStartAfter: options.ignoreBackoff });
      await Promise.all(jobs.map((job) => deliverOne({ job, transport, from, report })));
      if (jobs.length < limit) break;
    }
  } catch (error) {
    console.error("[mail] delivery stopped for this turn:", describe(error));
  }
  return report;
}

async function deliverOne({ job, transport, from, report }: { job: PgBoss.JobWithMetadata<MailJobData>; transport: Transporter; from: string; report: DeliveryReport }): Promise<void> {
  const message = await loadOutboxMessage({ id: job.data.messageId });
  // Sent already (a retried job after a worker died past the SMTP "250"), or gone: nothing to do.
  if (!message || message.status !== "queued") return recordDeliveryAttempt({ job, outcome: "skipped" });
  const attempt = job.retryCount + 1;
  try {
    const info = await transport.sendMail({
      from,
      to: message.to,
      subject: message.subject,
      text: message.text,
      html: message.html,
      headers: { "X-Pinchpoint-Template": message.template, "X-Pinchpoint-Outbox-Id": message.id },
    });
    const rejected = (info.rejected ?? []).map(String);
    if (rejected.length) console.warn(`[mail] ${message.id} (${message.template}): server refused ${rejected.join(", ")}; sent to the others`);
    await recordDeliveryAttempt({ job, outcome: "sent", error: rejected.length ? `refused: ${rejected.join(", ")}` : null });
    report.sent++;
  } catch (error) {
    const text = describe(error);
    const giveUp = isPermanent(error) || job.retryCount >= job.retryLimit;
    if (giveUp) {
      console.error(`[mail] gave up on ${message.id} (${message.template} to ${message.to.join(", ")}) after ${attempt} attempt(s): ${text}`);
      report.failed++;
    } else {
      console.warn(`[mail] attempt ${attempt} of ${message.id} (${message.template}) failed, the queue tries again after its backoff: ${text}`);
      report.retrying++;
    }
    await recordDeliveryAttempt({ job, outcome: giveUp ? "failed" : "retry", error: text }).catch((e: unknown) =>
      console.error(`[mail] could not record the failure of ${message.id}:`, describe(e)),
    );
  }
}
