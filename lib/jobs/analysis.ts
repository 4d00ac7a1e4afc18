// The analysis job: take a job from the queue `analysis`, claim the environment's newest snapshot,
// analyse it on the warm analysis thread (lib/analysis/thread.ts) while this thread reports
// heartbeats, store the results (lib/data/analysis-runs.ts), then tell owners and architects about
// newcomers to the top ten. The analysis worker (scripts/analysis-worker.ts), the seed and the tests
// all go through here.
import { hostname } from "node:os";
import { analyseInThread, stopAnalysisThread } from "@/lib/analysis/thread";
import { analysisInputFromContent } from "@/lib/analysis/input";
import type { AnalysisOptions } from "@/lib/analysis/types";
import { readSettings } from "@/lib/inventory/settings";
import { noticeTopTenChanges } from "@/lib/mail";
import {
  claimRun,
  failRun,
  loadRunInput,
  reapStaleRuns,
  recordRunHeartbeat,
  sendJobForQueuedRun,
  staleAfterS,
  storeResult,
  type AnalysisJobData,
  type ClaimedRun,
} from "@/lib/data/analysis-runs";
import { fetchJobs, QUEUES, analysisTimeoutS, sendJob } from "@/lib/data/job-queue";

export const workerId = () => `${hostname()}:${process.pid}`;

/** Heartbeats come several times per stale period, so one late beat never orphans a run. */
const beatMs = (): number => Math.max(250, Math.min(10_000, (staleAfterS() * 1000) / 4));

/**
 * The next run for `worker`, or null when there is nothing to do. Runs whose worker stopped beating
 * go back to the queue first. Jobs whose environment is busy or has nothing queued are completed on
 * the way (lib/data/analysis-runs.ts, claimRun).
 */
export async function claimNextJob(worker = workerId()): Promise<ClaimedRun | null> {
  await reapStaleRuns();
  for (;;) {
    const [job] = await fetchJobs<AnalysisJobData>(QUEUES.analysis);
    if (!job) return null;
    const claim = await claimRun({ job, worker });
    if (claim.kind === "claimed") return claim.run;
  }
}

class AnalysisTimeout extends Error {}

/**
 * Run one claimed run to the end, storing results or the error. `options` tune the analysis (tests
 * use them to force, say, a measure that does not converge); the worker passes none.
 */
export async function runJob(run: ClaimedRun, worker = workerId(), options: AnalysisOptions = {}): Promise<"done" | "failed" | "retrying" | "lost"> {
  let input: Awaited<ReturnType<typeof loadRunInput>>;
  try {
    input = await loadRunInput(run);
  } catch (error) {
    // The database went away: the run is taken back once its heartbeat is stale.
    console.error("[analysis] could not load the run's snapshot:", error instanceof Error ? error.message : error);
    return "failed";
  }
  if (!input) return failRun({ run, worker, message: "snapshot or environment no longer exists", permanent: true });

  let lastWrite = 0;
  let pending: Promise<unknown> = Promise.resolve();
  const onProgress = (fraction: number, phase: string) => {
    const now = Date.now();
    if (now - lastWrite < 250 && phase !== "done") return;
    lastWrite = now;
    pending = pending.then(() => recordRunHeartbeat({ run, worker, progress: { fraction, phase } }));
  };
  // The analysis runs on its own thread, so this timer beats however long a phase takes.
  const beat = setInterval(() => void recordRunHeartbeat({ run, worker }).catch(() => undefined), beatMs());
  // The queue fails a job active past its expiry; stop a little before, so this worker says why.
  const limitMs = Math.max(1_000, (analysisTimeoutS() - 30) * 1000);
  let timer: NodeJS.Timeout | undefined;
  const timeout = new Promise<never>((_, reject) => {
    timer = setTimeout(() => reject(new AnalysisTimeout(`the analysis took longer than ${Math.round(limitMs / 1000)} s (PINCHPOINT_ANALYSIS_TIMEOUT_S) and was stopped`)), limitMs);
  });
  try {
    const result = await Promise.race([
      analyseInThread(analysisInputFromContent(input.content, readSettings(input.settings)), { ...options, weights: input.pinchWeights ?? undefined }, onProgress),
      timeout,
    ]);
    await pending;
    const outcome = await storeResult({ run, worker, content: input.content, result });
    // Tell owners and architects about components new to the top ten (compared with the previous analysed snapshot).
    if (outcome === "done") await noticeTopTenChanges({ environmentId: run.environment_id, snapshotId: run.snapshot_id, previousSnapshotId: null });
    // The map's layouts of this snapshot, computed once off the browser (lib/jobs/map-layout.ts). A
    // lost job only means the browser lays the map out itself.
    if (outcome === "done") {
      await sendJob(QUEUES.mapLayout, { snapshotId: run.snapshot_id, environmentId: run.environment_id }).catch((error: unknown) =>
        console.error("[analysis] could not queue the map layout:", error instanceof Error ? error.message : error),
      );
    }
    return outcome;
  } catch (error) {
    // A thread past its time is ended (the next job starts a fresh one).
    if (error instanceof AnalysisTimeout) await stopAnalysisThread();
    await pending.catch(() => undefined);
    const message = error instanceof Error ? error.message : String(error);
    const outcome = await failRun({ run, worker, message }).catch((e: unknown) => {
      console.error("[analysis] could not record the failure:", e instanceof Error ? e.message : e);
      return "failed" as const;
    });
    // A run handed back (worker stopping) or taken over is not this worker's failure to report.
    if (outcome !== "lost") console.error(`[analysis] snapshot ${input.number} of ${input.slug} failed (${outcome === "retrying" ? "the queue tries again" : "for good"}):`, error);
    return outcome;
  } finally {
    clearTimeout(timer);
    clearInterval(beat);
    // A newer snapshot may have been queued while this one ran; its job found the environment busy.
    await sendJobForQueuedRun({ environmentId: run.environment_id, after: run.id }).catch(() => undefined);
  }
}

/** Work through the queue until it is empty (tests, the seed). */
export async function drainAnalysisQueue(worker = workerId(), options: AnalysisOptions = {}): Promise<number> {
  let count = 0;
  for (let run = await claimNextJob(worker); run; run = await claimNextJob(worker)) {
    await runJob(run, worker, options);
    count++;
  }
  return count;
}
