// The worker process's work, in one loop per kind: analyses (one at a time per process), mail
// delivery, traced calls taken into the graph, and the scheduled jobs (lib/jobs/schedules.ts). Any
// number of worker processes share the queue (pg-boss hands each job to one of them).
import { hostname } from "node:os";
import { recordWorkerHeartbeat, WORKER_BEAT_MS } from "@/lib/data/worker-heartbeats";
import { startJobQueue, stopJobQueue } from "@/lib/data/job-queue";
import { releaseRun, type ClaimedRun } from "@/lib/data/analysis-runs";
import { runTraceUpkeep } from "@/lib/data/traces";
import { stopAnalysisThread } from "@/lib/analysis/thread";
import { claimNextJob, runJob, workerId } from "./analysis";
import { deliverDueMail } from "./mail";
import { startSchedules } from "./schedules";
import { startMapLayouts } from "./map-layout";

const POLL_MS = () => Number(process.env.PINCHPOINT_WORKER_POLL_MS ?? 500);
/** How often traces' waiting calls are swept and changed observed sets taken into the graph. */
const TRACE_TICK_MS = () => Number(process.env.PINCHPOINT_TRACE_TICK_MS ?? 2_000);
/** How often due e-mail is looked for. */
const MAIL_TICK_MS = () => Number(process.env.PINCHPOINT_MAIL_TICK_MS ?? 2_000);

const message = (error: unknown) => (error instanceof Error ? error.message : String(error));
/** Resolves after `ms`, or at once when `signal` aborts; leaves no listener behind either way. */
function sleep(ms: number, signal: AbortSignal): Promise<void> {
  return new Promise((resolve) => {
    if (signal.aborted) return resolve();
    const done = () => {
      clearTimeout(timer);
      signal.removeEventListener("abort", done);
      resolve();
    };
    const timer = setTimeout(done, ms);
    signal.addEventListener("abort", done);
  });
}

/** Resolves with "stopping" when `signal` aborts; `cancel` removes its listener. */
function whenAborted(signal: AbortSignal): { promise: Promise<"stopping">; cancel: () => void } {
  let listener = () => undefined as void;
  const promise = new Promise<"stopping">((resolve) => {
    listener = () => resolve("stopping");
    if (signal.aborted) resolve("stopping");
    else signal.addEventListener("abort", listener, { once: true });
  });
  return { promise, cancel: () => signal.removeEventListener("abort", listener) };
}

/** A loop that runs `turn` every `everyMs` until `signal` aborts; a turn never overlaps the next. */
async function every(everyMs: () => number, signal: AbortSignal, turn: () => Promise<void>): Promise<void> {
  while (!signal.aborted) {
    await turn();
    await sleep(everyMs(), signal);
  }
}

/**
 * Run until `signal` aborts. Then: stop taking jobs; an analysis in hand is handed back to the queue
 * (not a failure: the next worker takes it up at once); pg-boss gives scheduled jobs in hand a few
 * seconds.
 */
export async function runWorker({ signal }: { signal: AbortSignal }): Promise<void> {
  const id = workerId();
  const startedAt = new Date();
  let running: ClaimedRun | null = null;
  // Alive, whether idle or busy: the overview and /api/health say when no worker has been heard from.
  const beat = () =>
    recordWorkerHeartbeat({ workerId: id, host: hostname(), pid: process.pid, startedAt, jobId: running?.id ?? null }).catch((error: unknown) =>
      console.error("[worker] could not report a heartbeat:", message(error)),
    );
  void beat();
  const beating = setInterval(() => void beat(), WORKER_BEAT_MS);

  await startJobQueue();
  await startSchedules();
  await startMapLayouts();
  console.log(`[worker] ${id} waiting for jobs`);

  const traces = every(TRACE_TICK_MS, signal, async () => {
    await runTraceUpkeep().catch((error: unknown) => console.error("[worker] trace upkeep failed:", message(error)));
  });
  const mail = every(MAIL_TICK_MS, signal, async () => {
    const report = await deliverDueMail();
    if (report.sent || report.retrying || report.failed) console.log(`[mail] sent ${report.sent}, retrying ${report.retrying}, failed ${report.failed}`);
  });
  const analyses = (async () => {
    while (!signal.aborted) {
      const run = await claimNextJob(id).catch((error: unknown) => {
        console.error("[worker] could not reach the queue:", message(error));
        return null;
      });
      if (!run) {
        await sleep(POLL_MS(), signal);
        continue;
      }
      running = run;
      const started = Date.now();
      const stopping = whenAborted(signal);
      const outcome = await Promise.race([
        runJob(run, id).catch((error: unknown) => {
          // Never let one job stop the worker: the run is taken back when its heartbeat goes stale.
          console.error("[worker] job failed unexpectedly:", error);
          return "failed" as const;
        }),
        stopping.promise,
      ]);
      stopping.cancel();
      if (outcome === "stopping") {
        const released = await releaseRun({ run, worker: id }).catch(() => false);
        console.log(`[worker] stopping: snapshot ${run.snapshot_id} ${released ? "handed back to the queue" : "was no longer ours"}`);
        await stopAnalysisThread();
      } else {
        console.log(`[worker] snapshot ${run.snapshot_id}: ${outcome} in ${Date.now() - started} ms`);
      }
      running = null;
    }
  })();

  await Promise.all([traces, mail, analyses]);
  clearInterval(beating);
  await stopJobQueue();
}
