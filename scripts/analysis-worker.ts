// The analysis worker: takes jobs from the queue in PostgreSQL and runs them, off the request path.
// Run any number of these (npm start runs one); they share the queue without stepping on each other.
import { hostname } from "node:os";
import { closeDb } from "../models";
import { claimNextJob, runJob, workerId } from "../lib/data/analysis-jobs";
import { recordWorkerHeartbeat, WORKER_BEAT_MS } from "../lib/data/worker-heartbeats";
import { startOutboxLoop } from "../lib/mail";
import { runTraceUpkeep } from "../lib/data/traces";

const POLL_MS = Number(process.env.PINCHPOINT_WORKER_POLL_MS ?? 500);
/** How often traces' waiting calls are swept and changed observed sets taken into the graph. */
const TRACE_TICK_MS = Number(process.env.PINCHPOINT_TRACE_TICK_MS ?? 2_000);
let lastTraceTick = 0;
let stopping = false;

async function main() {
  const id = workerId();
  console.log(`[worker] ${id} waiting for analysis jobs`);
  // Alive, whether idle or busy: the overview and /api/health say when no worker has been heard from.
  const startedAt = new Date();
  let jobId: string | null = null;
  const beat = () =>
    recordWorkerHeartbeat({ workerId: id, host: hostname(), pid: process.pid, startedAt, jobId }).catch((error: unknown) =>
      console.error("[worker] could not report a heartbeat:", error instanceof Error ? error.message : error),
    );
  void beat();
  const beating = setInterval(() => void beat(), WORKER_BEAT_MS);
  // The same process delivers queued e-mail (and the daily review reminders) between jobs.
  const stopMail = startOutboxLoop({ intervalMs: 5_000 });
  while (!stopping) {
    if (Date.now() - lastTraceTick >= TRACE_TICK_MS) {
      lastTraceTick = Date.now();
      await runTraceUpkeep().catch((error: unknown) => console.error("[worker] trace upkeep failed:", error instanceof Error ? error.message : error));
    }
    const job = await claimNextJob(id).catch((error: unknown) => {
      console.error("[worker] could not reach the queue:", error instanceof Error ? error.message : error);
      return null;
    });
    if (!job) {
      await new Promise((r) => setTimeout(r, POLL_MS));
      continue;
    }
    const started = Date.now();
    jobId = job.id;
    const outcome = await runJob(job, id).catch((error: unknown) => {
      // Never let one job stop the worker: the job is re-queued when its heartbeat goes stale.
      console.error("[worker] job failed unexpectedly:", error);
      return "failed" as const;
    });
    jobId = null;
    console.log(`[worker] snapshot ${job.snapshot_id}: ${outcome} in ${Date.now() - started} ms`);
  }
  clearInterval(beating);
  await stopMail();
  await closeDb();
}

for (const signal of ["SIGINT", "SIGTERM"] as const) {
  process.on(signal, () => {
    // Finish the job in hand; an interrupted one is re-queued by its stale heartbeat anyway.
    stopping = true;
    setTimeout(() => process.exit(0), 5_000).unref();
  });
}

main().catch((error: unknown) => {
  console.error("[worker] stopped:", error);
  process.exit(1);
});
