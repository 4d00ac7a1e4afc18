// GET /api/health: what a load balancer, `npm start` and the overview need to know. Answers without
// a sign-in, so it says nothing an outsider could use beyond counts.
import "server-only";
import { QueryTypes } from "sequelize";
import { db } from "@/models";
import { isDatabaseUnavailable } from "@/lib/errors";
import type { HealthResponse } from "@/lib/api/schemas/health";
import { workerHealth } from "./worker-heartbeats";
import { queueDepth } from "./job-queue";

/**
 * `ok`; `degraded` while no analysis worker is running (the app still serves, analyses wait);
 * `unavailable` while the database is unreachable.
 */
export type HealthReport = HealthResponse;

/** Each probe gives up after this long, so a health check never hangs on a database that does not answer. */
const PROBE_TIMEOUT_MS = 3_000;

function withTimeout<T>(work: Promise<T>, ms: number): Promise<T> {
  let timer: NodeJS.Timeout | undefined;
  const timeout = new Promise<never>((_, reject) => {
    timer = setTimeout(() => reject(Object.assign(new Error(`no answer within ${ms} ms`), { name: "SequelizeConnectionTimedOutError" })), ms);
  });
  return Promise.race([work, timeout]).finally(() => clearTimeout(timer));
}

/** Is PostgreSQL answering? One `SELECT 1` through the app's own pool. */
export async function pingDatabase(): Promise<{ ok: true; latencyMs: number } | { ok: false; message: string }> {
  const started = performance.now();
  try {
    await withTimeout(db().sequelize.query("SELECT 1", { type: QueryTypes.SELECT }), PROBE_TIMEOUT_MS);
    return { ok: true, latencyMs: Math.round((performance.now() - started) * 10) / 10 };
  } catch (error) {
    if (!isDatabaseUnavailable(error)) throw error;
    return { ok: false, message: error instanceof Error ? error.message : String(error) };
  }
}

export async function healthReport(): Promise<HealthReport> {
  const app = { uptimeSeconds: Math.round(process.uptime()), pid: process.pid };
  const ping = await pingDatabase();
  if (!ping.ok) {
    return { status: "unavailable", app, database: { status: "unreachable", latencyMs: null, message: "PostgreSQL does not answer" }, worker: null, queue: null };
  }
  const [worker, queue] = await withTimeout(Promise.all([workerHealth(), queueDepth()]), PROBE_TIMEOUT_MS);
  return { status: worker.status === "ok" ? "ok" : "degraded", app, database: { status: "ok", latencyMs: ping.latencyMs }, worker, queue };
}
