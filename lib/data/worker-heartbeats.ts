// Analysis workers say they are alive every few seconds (scripts/analysis-worker.ts), so the health
// endpoint and the overview can tell when none is running: queued analyses would wait forever.
import "server-only";
import { QueryTypes } from "sequelize";
import { db } from "@/models";

/** A worker not heard from for this long is taken to be gone (the overview says so). */
const WORKER_MISSING_AFTER_S = 60;
export const WORKER_BEAT_MS = 10_000;

export async function recordWorkerHeartbeat({ workerId, host, pid, startedAt, jobId }: { workerId: string; host: string; pid: number; startedAt: Date; jobId: string | null }): Promise<void> {
  const { sequelize } = db();
  await sequelize.query(
    `INSERT INTO worker_heartbeats (worker_id, host, pid, started_at, last_seen_at, job_id)
     VALUES (:workerId, :host, :pid, :startedAt, now(), :jobId)
     ON CONFLICT (worker_id) DO UPDATE SET last_seen_at = now(), job_id = EXCLUDED.job_id`,
    { replacements: { workerId, host, pid, startedAt, jobId } },
  );
  // Rows of workers long gone only tell history: keep a day of them.
  await sequelize.query(`DELETE FROM worker_heartbeats WHERE last_seen_at < now() - interval '1 day'`);
}

export interface WorkerHealth {
  /** `ok`: a worker was heard from within the last minute; `missing`: not for longer; `never`: no worker has ever reported */
  status: "ok" | "missing" | "never";
  /** workers heard from within the last minute */
  live: number;
  lastSeenAt: string | null;
  secondsSinceSeen: number | null;
}

export async function workerHealth(): Promise<WorkerHealth> {
  const [row] = await db().sequelize.query<{ last: Date | null; live: string; age: number | null }>(
    `SELECT max(last_seen_at) AS last,
            count(*) FILTER (WHERE last_seen_at >= now() - make_interval(secs => :after)) AS live,
            extract(epoch FROM now() - max(last_seen_at))::float8 AS age
       FROM worker_heartbeats`,
    { type: QueryTypes.SELECT, replacements: { after: WORKER_MISSING_AFTER_S } },
  );
  const live = Number(row?.live ?? 0);
  if (!row?.last) return { status: "never", live: 0, lastSeenAt: null, secondsSinceSeen: null };
  return { status: live > 0 ? "ok" : "missing", live, lastSeenAt: row.last.toISOString(), secondsSinceSeen: Math.round(row.age ?? 0) };
}
