// The job queue: pg-boss 10 on our own PostgreSQL (schema `pgboss`, installed by migration
// 0014-job-queue). Every pg-boss statement goes through the app's Sequelize pool, so a job can be
// sent inside the transaction of the change it follows (a rolled-back push queues no analysis, a
// rolled-back invite sends no mail) and no process opens a second pool for the queue.
//
// The queues and their rules live here, in one place:
// - `analysis` (policy `short`: at most one *waiting* job per environment, singletonKey = the
//   environment). A job means "analyse this environment's newest snapshot", so a push made while a
//   job waits adds nothing: the waiting job takes the newest snapshot when it starts, and the older
//   snapshots it passes over are marked `superseded` (lib/data/analysis-runs.ts). One analysis per
//   environment at a time is enforced when a job is claimed, not by pg-boss's `singleton`/`stately`
//   policies: in 10.x a fetch that would make a second job of a key active fails the whole fetch,
//   so one busy environment would hold up every other environment's jobs behind it.
// - `mail`: one job per outbox row, retried with exponential backoff.
// - `review-reminders`, `risk-digest`: filled by pg-boss's scheduler (cron, once per slot across
//   all workers).
// The migration creates the queues with these policies (models/migrations/0014-job-queue.ts).
import "server-only";
import PgBoss from "pg-boss";
import { QueryTypes, type Transaction } from "sequelize";
import { db } from "@/models";

const QUEUE_SCHEMA = "pgboss";

export const QUEUES = {
  analysis: "analysis",
  mail: "mail",
  reviewReminders: "review-reminders",
  riskDigest: "risk-digest",
  mapLayout: "map-layout",
} as const;
type QueueName = (typeof QUEUES)[keyof typeof QUEUES];

/** Seconds, from the environment (README lists each). */
const seconds = (name: string, fallback: number): number => {
  const value = Number(process.env[name]);
  return Number.isFinite(value) && value > 0 ? value : fallback;
};

/**
 * An analysis is given up (and retried) after this long: pg-boss fails a job active past its
 * expiry, and the runner stops the analysis thread a little before that (lib/jobs/analysis.ts).
 * pg-boss allows at most 24 hours.
 */
export const analysisTimeoutS = () => Math.min(seconds("PINCHPOINT_ANALYSIS_TIMEOUT_S", 3600), 23 * 3600);
/** Three attempts in all, as before the queue library: a deterministic failure should not loop. */
const ANALYSIS_RETRY_LIMIT = 2;
/** An SMTP conversation is bounded by the transport's timeouts (lib/mail/transport.ts); this is the backstop. */
const MAIL_TIMEOUT_S = 120;
/** Five attempts in all. */
export const MAIL_RETRY_LIMIT = 4;
/**
 * First wait before a mail retry; pg-boss doubles it each time with jitter (delay·2^n/2 ·(1 + random)),
 * so about 5–10 min, 10–20, 20–40, 40–80: a greylisting server or a short outage is ridden out
 * over about two hours, as mail servers themselves do (common practice).
 */
export const MAIL_RETRY_DELAY_S = () => seconds("PINCHPOINT_MAIL_RETRY_DELAY_S", 300);

function sendOptions(queue: QueueName): PgBoss.SendOptions {
  switch (queue) {
    case "analysis":
      // A failed analysis is retried after 1–2 s, then 2–4 s: long enough not to spin on a bug,
      // short enough that a worker that died is replaced at once.
      return { retryLimit: ANALYSIS_RETRY_LIMIT, retryDelay: 1, retryBackoff: true, expireInSeconds: analysisTimeoutS() };
    case "mail":
      return { retryLimit: MAIL_RETRY_LIMIT, retryDelay: MAIL_RETRY_DELAY_S(), retryBackoff: true, expireInSeconds: MAIL_TIMEOUT_S };
    case "map-layout":
      // Laying out 10,000 components takes about a minute here (npm run bench -- --only map).
      return { retryLimit: 1, retryDelay: 5, expireInSeconds: 15 * 60 };
    default:
      // Scheduled jobs: the next slot comes anyway, so one quick retry is enough.
      return { retryLimit: 1, retryDelay: 60, expireInSeconds: 15 * 60 };
  }
}

/** pg-boss's database interface over Sequelize, inside `transaction` when one is given. */
function executor(transaction?: Transaction): PgBoss.Db {
  return {
    async executeSql(text: string, values?: unknown[]) {
      // Sequelize rewrites `$n` bind markers for pg; undefined is not a value there, NULL is.
      const bind = values?.map((v) => (v === undefined ? null : v));
      const [rows] = await db().sequelize.query(text, { ...(bind ? { bind } : {}), transaction, type: QueryTypes.RAW });
      return { rows: Array.isArray(rows) ? (rows as unknown[]) : [] };
    },
  };
}

const holder = globalThis as unknown as { __pinchpointQueue?: PgBoss };

/**
 * The process's pg-boss instance (kept on globalThis: Next may bundle this module twice). Sending,
 * fetching and completing work without `start()`; only the worker starts it, for pg-boss's
 * maintenance (expiry, archiving) and its scheduler.
 */
export function jobQueue(): PgBoss {
  holder.__pinchpointQueue ??= new PgBoss({
    db: executor(),
    schema: QUEUE_SCHEMA,
    // The worker process runs these; see startJobQueue.
    supervise: false,
    schedule: false,
    migrate: false,
  });
  return holder.__pinchpointQueue;
}

/** A connection option for pg-boss calls that must be part of `transaction`. */
export const inTransaction = (transaction: Transaction): PgBoss.ConnectionOptions => ({ db: executor(transaction) });

/** Send a job; inside `transaction` it exists only if the transaction commits. Null when a singleton key refused it. */
export async function sendJob(queue: QueueName, data: object, options: PgBoss.SendOptions = {}, transaction?: Transaction): Promise<string | null> {
  return jobQueue().send(queue, data, { ...sendOptions(queue), ...options, ...(transaction ? inTransaction(transaction) : {}) });
}

/** Take up to `batchSize` due jobs of a queue (SKIP LOCKED: workers never get the same one). */
export async function fetchJobs<T extends object>(queue: QueueName, { batchSize = 1, ignoreStartAfter = false }: { batchSize?: number; ignoreStartAfter?: boolean } = {}): Promise<PgBoss.JobWithMetadata<T>[]> {
  return jobQueue().fetch<T>(queue, { batchSize, includeMetadata: true, ignoreStartAfter });
}

/** A cron schedule for a queue (pg-boss keeps it in pgboss.schedule; the same call again updates it). */
export async function scheduleJob(queue: QueueName, cron: string, tz: string): Promise<void> {
  await jobQueue().schedule(queue, cron, {}, { ...sendOptions(queue), tz });
}

/** Run `handler` for each job of a queue in this process (the worker), polling every few seconds. */
export async function workQueue(queue: QueueName, handler: () => Promise<void>): Promise<string> {
  return jobQueue().work(queue, { pollingIntervalSeconds: 5 }, async () => handler());
}

/** Run `handler` on each job's data (the worker); a throw fails the job and pg-boss retries it. */
export async function workQueueData<T extends object>(queue: QueueName, handler: (data: T) => Promise<void>): Promise<string> {
  return jobQueue().work<T>(queue, { pollingIntervalSeconds: 2 }, async (jobs) => {
    for (const job of jobs) await handler(job.data);
  });
}

/**
 * The worker's pg-boss: maintenance (a job active past its expiry is failed and retried; finished
 * jobs are archived, then deleted) and the scheduler. Several workers may run it; pg-boss makes
 * each maintenance run and each cron slot happen once across them.
 */
let stopped = false;

export async function startJobQueue(): Promise<PgBoss> {
  stopped = false;
  const boss = new PgBoss({
    db: executor(),
    schema: QUEUE_SCHEMA,
    supervise: true,
    schedule: true,
    migrate: false,
    maintenanceIntervalSeconds: 30,
    // Finished jobs go to pgboss.archive after a day and are deleted after a week; the product's
    // own records of them are analysis_runs and outbox_messages.
    archiveCompletedAfterSeconds: 24 * 3600,
    deleteAfterDays: 7,
  });
  boss.on("error", (error: Error) => console.error("[queue]", error.message));
  await boss.start();
  holder.__pinchpointQueue = boss;
  return boss;
}

/** Stop the worker's pg-boss: no new jobs, the ones in hand get `graceMs` to finish. */
export async function stopJobQueue({ graceMs = 4_000 }: { graceMs?: number } = {}): Promise<void> {
  const boss = holder.__pinchpointQueue;
  if (!boss || stopped) return;
  stopped = true;
  await boss.stop({ graceful: true, timeout: graceMs, close: false });
}

/** What /api/health says about the queues: analyses waiting and running, the oldest wait, e-mail waiting. */
export async function queueDepth(): Promise<{ analysisQueued: number; analysisRunning: number; oldestQueuedSeconds: number | null; mailQueued: number }> {
  // pgboss.job is partitioned by queue name, so each count reads only its queue's table.
  const [row] = await db().sequelize.query<{ queued: string; running: string; oldest: number | null; mail: string }>(
    `SELECT count(*) FILTER (WHERE name = :analysis AND state < 'active') AS queued,
            count(*) FILTER (WHERE name = :analysis AND state = 'active') AS running,
            extract(epoch FROM now() - min(created_on) FILTER (WHERE name = :analysis AND state < 'active'))::float8 AS oldest,
            count(*) FILTER (WHERE name = :mail AND state < 'active') AS mail
       FROM ${QUEUE_SCHEMA}.job
      WHERE name IN (:analysis, :mail) AND state <= 'active'`,
    { type: QueryTypes.SELECT, replacements: { analysis: QUEUES.analysis, mail: QUEUES.mail } },
  );
  return {
    analysisQueued: Number(row?.queued ?? 0),
    analysisRunning: Number(row?.running ?? 0),
    oldestQueuedSeconds: row?.oldest === null || row?.oldest === undefined ? null : Math.round(row.oldest),
    mailQueued: Number(row?.mail ?? 0),
  };
}

export type { PgBoss };
