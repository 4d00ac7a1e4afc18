// The outbox: the product's record of every e-mail (to whom, what, sent or not, why not), written
// in the transaction of the change it announces together with the queue job that delivers it
// (lib/data/job-queue.ts, queue `mail`). The job holds only the message id: what was sent, and the
// one-time link of an invite, stay in this table, which scrubs the link once delivered.
//
// Why a table beside the queue rather than the message in the job: the admin page lists messages
// and failures for as long as we keep them (the queue archives and deletes jobs on its own
// schedule); a dedupe key must hold for ever, not only while a job waits; and an invite's secret
// must not linger in the queue's archive.
import "server-only";
import { Op, QueryTypes, type Transaction } from "sequelize";
import { db } from "@/models";
import type { OutboxStatus } from "@/models/OutboxMessage";
import { fetchJobs, inTransaction, jobQueue, QUEUES, sendJob, type PgBoss } from "./job-queue";

/** The data of a job in the queue `mail`. */
export interface MailJobData {
  messageId: string;
}

interface OutboxInsert {
  to: string[];
  subject: string;
  text: string;
  html: string;
  template: string;
  /** a message with the same key is queued only once, ever */
  dedupeKey: string | null;
}

/** Queue one rendered message and its delivery job; null when its dedupe key was used before. */
export async function insertOutboxMessage(message: OutboxInsert, transaction?: Transaction): Promise<string | null> {
  const { sequelize } = db();
  const work = async (t: Transaction): Promise<string | null> => {
    const [row] = await sequelize.query<{ id: string }>(
      `INSERT INTO outbox_messages ("to", subject, text, html, template, dedupe_key)
       VALUES (ARRAY[:to]::text[], :subject, :text, :html, :template, :dedupeKey)
       ON CONFLICT (dedupe_key) DO NOTHING
       RETURNING id`,
      { type: QueryTypes.SELECT, replacements: { ...message }, transaction: t },
    );
    if (!row) return null;
    const jobId = await sendJob(QUEUES.mail, { messageId: row.id } satisfies MailJobData, {}, t);
    await sequelize.query("UPDATE outbox_messages SET job_id = :jobId WHERE id = :id", { replacements: { id: row.id, jobId }, transaction: t });
    return row.id;
  };
  return transaction ? work(transaction) : sequelize.transaction(work);
}

interface OutboxRow {
  id: string;
  to: string[];
  subject: string;
  text: string;
  html: string;
  template: string;
  status: OutboxStatus;
  attempts: number;
}

export async function loadOutboxMessage({ id }: { id: string }): Promise<OutboxRow | null> {
  const row = await db().models.OutboxMessage.findByPk(id);
  return row ? { id: row.id, to: row.to, subject: row.subject, text: row.text, html: row.html, template: row.template, status: row.status, attempts: row.attempts } : null;
}

/** Due jobs of the queue `mail`; `ignoreStartAfter` takes retries before their backoff ends (tests). */
export function fetchMailJobs({ limit, ignoreStartAfter = false }: { limit: number; ignoreStartAfter?: boolean }): Promise<PgBoss.JobWithMetadata<MailJobData>[]> {
  return fetchJobs<MailJobData>(QUEUES.mail, { batchSize: limit, ignoreStartAfter });
}

/**
 * What one delivery attempt came to. `sent` completes the job; `failed` completes it too (a
 * permanent refusal, or the last attempt) and records why; `retry` records the error and fails the
 * job, so the queue tries again after its backoff.
 */
export async function recordDeliveryAttempt({
  job,
  outcome,
  error = null,
}: {
  job: PgBoss.JobWithMetadata<MailJobData>;
  outcome: "sent" | "failed" | "retry" | "skipped";
  error?: string | null;
}): Promise<void> {
  const { sequelize } = db();
  await sequelize.transaction(async (transaction) => {
    const id = job.data.messageId;
    if (outcome !== "skipped") {
      // An invite carries a one-time secret: once delivered or given up on, the outbox keeps no copy of it.
      await sequelize.query(
        `UPDATE outbox_messages
            SET status = :status, attempts = attempts + 1, last_error = :error,
                sent_at = CASE WHEN :status = 'sent' THEN now() END,
                text = CASE WHEN template = 'invite' AND :status = 'sent' THEN '(invite delivered; the link is not kept)'
                            WHEN template = 'invite' AND :status = 'failed' THEN '(invite not delivered; the link is not kept)' ELSE text END,
                html = CASE WHEN template = 'invite' AND :status <> 'queued' THEN '' ELSE html END
          WHERE id = :id`,
        { replacements: { id, status: outcome === "retry" ? "queued" : outcome, error }, transaction },
      );
    }
    const options = inTransaction(transaction);
    if (outcome === "retry") await jobQueue().fail(QUEUES.mail, job.id, { message: error ?? "" }, options);
    else await jobQueue().complete(QUEUES.mail, job.id, { outcome }, options);
  });
}

interface OutboxOverview {
  counts: Record<OutboxStatus, number>;
  pending: { id: string; to: string[]; subject: string; template: string; status: OutboxStatus; attempts: number; nextAttemptAt: Date | null; lastError: string | null; createdAt: Date }[];
}

/** What the outbox holds, for admins: counts by status and the messages not (yet) sent, with when the queue tries each next. */
export async function outboxOverview({ limit = 20 }: { limit?: number } = {}): Promise<OutboxOverview> {
  const { OutboxMessage } = db().models;
  const grouped = (await OutboxMessage.count({ group: ["status"] })) as unknown as { status: OutboxStatus; count: number | string }[];
  const counts: Record<OutboxStatus, number> = { queued: 0, sent: 0, failed: 0 };
  for (const g of grouped) counts[g.status] = Number(g.count);
  const rows = await OutboxMessage.findAll({ where: { status: { [Op.ne]: "sent" } }, order: [["createdAt", "DESC"]], limit });
  const next = await Promise.all(
    rows.map(async (r) => (r.status === "queued" && r.jobId ? ((await jobQueue().getJobById(QUEUES.mail, r.jobId, { includeArchive: false }))?.startAfter ?? null) : null)),
  );
  return {
    counts,
    pending: rows.map((r, i) => ({
      id: r.id,
      to: r.to,
      subject: r.subject,
      template: r.template,
      status: r.status,
      attempts: r.attempts,
      nextAttemptAt: next[i] ? new Date(next[i]) : null,
      lastError: r.lastError,
      createdAt: r.createdAt,
    })),
  };
}
