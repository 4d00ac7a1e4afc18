// Analysis jobs: a queue in PostgreSQL (analysis_runs), so that any number of worker processes
// share the work and a restart re-queues what was running. Claiming uses FOR UPDATE SKIP LOCKED;
// a job whose worker stopped sending heartbeats is claimed again.
import { hostname } from "node:os";
import { QueryTypes, type Transaction } from "sequelize";
import { db } from "@/models";
import { analyse, type AnalysisResult } from "@/lib/analysis";
import { analysisInputFromContent } from "@/lib/analysis/input";
import { rankedByBetweenness } from "@/lib/analysis/rank";
import { readSettings } from "@/lib/inventory/settings";
import type { PinchWeights } from "@/lib/analysis/types";
import type { SnapshotContent } from "@/lib/inventory/snapshot";
import { noticeTopTenChanges } from "@/lib/mail";

/** A running job with no heartbeat for this long is taken to be orphaned. */
export const STALE_AFTER_S = 60;
export const MAX_ATTEMPTS = 3;

export async function queueAnalysis({ environmentId, snapshotId }: { environmentId: string; snapshotId: string }, transaction?: Transaction): Promise<void> {
  await db().models.AnalysisRun.create({
    environmentId,
    snapshotId,
    status: "queued",
    phase: null,
    lockedBy: null,
    heartbeatAt: null,
    startedAt: null,
    finishedAt: null,
    error: null,
    exact: null,
    sampleSize: null,
    timings: null,
    graph: null,
  }, { transaction });
}

/**
 * Analyse the newest snapshot again (its inputs changed: weights, settings). analysis_runs.snapshot_id
 * is unique, so the snapshot's one run goes back to the queue; a worker still holding it loses it, because
 * its result is refused once the row is no longer 'running' for it.
 */
export async function requeueLatestAnalysis({ environmentId }: { environmentId: string }, transaction: Transaction): Promise<{ snapshot: number } | null> {
  const { sequelize } = db();
  const [latest] = await sequelize.query<{ id: string; number: number; run_id: string | null }>(
    `SELECT s.id, s.number, a.id AS run_id FROM snapshots s LEFT JOIN analysis_runs a ON a.snapshot_id = s.id
      WHERE s.environment_id = :environmentId ORDER BY s.number DESC LIMIT 1`,
    { type: QueryTypes.SELECT, replacements: { environmentId }, transaction },
  );
  if (!latest) return null;
  if (latest.run_id) {
    await sequelize.query(
      `UPDATE analysis_runs SET status = 'queued', progress = 0, phase = NULL, attempts = 0, locked_by = NULL,
              heartbeat_at = NULL, started_at = NULL, finished_at = NULL, error = NULL, updated_at = now()
        WHERE id = :id`,
      { replacements: { id: latest.run_id }, transaction },
    );
  } else {
    await queueAnalysis({ environmentId, snapshotId: latest.id }, transaction);
  }
  return { snapshot: latest.number };
}

interface ClaimedJob {
  id: string;
  snapshot_id: string;
  environment_id: string;
  attempts: number;
}

export const workerId = () => `${hostname()}:${process.pid}`;

/** Take the oldest queued (or orphaned) job, or null when there is nothing to do. */
export async function claimNextJob(worker = workerId()): Promise<ClaimedJob | null> {
  const { sequelize } = db();
  // Orphans past their last attempt fail for good rather than looping forever.
  await sequelize.query(
    `UPDATE analysis_runs SET status = 'failed', error = 'gave up after ' || attempts || ' attempts', finished_at = now(), updated_at = now()
      WHERE status = 'running' AND heartbeat_at < now() - make_interval(secs => :stale) AND attempts >= :max`,
    { replacements: { stale: STALE_AFTER_S, max: MAX_ATTEMPTS } },
  );
  const rows = await sequelize.query<ClaimedJob>(
    `UPDATE analysis_runs r
        SET status = 'running', locked_by = :worker, heartbeat_at = now(), started_at = now(),
            attempts = r.attempts + 1, progress = 0, phase = 'starting', error = NULL, updated_at = now()
      WHERE r.id = (
        SELECT id FROM analysis_runs
         WHERE status = 'queued'
            OR (status = 'running' AND heartbeat_at < now() - make_interval(secs => :stale))
         ORDER BY created_at
         FOR UPDATE SKIP LOCKED
         LIMIT 1)
      RETURNING r.id, r.snapshot_id, r.environment_id, r.attempts`,
    { type: QueryTypes.SELECT, replacements: { worker, stale: STALE_AFTER_S } },
  );
  return rows[0] ?? null;
}

/** Run one claimed job to the end, storing results or the error. */
export async function runJob(job: ClaimedJob, worker = workerId()): Promise<"done" | "failed" | "lost"> {
  const { models, sequelize } = db();
  let snapshot: InstanceType<typeof models.Snapshot> | null;
  let env: InstanceType<typeof models.Environment> | null;
  try {
    [snapshot, env] = await Promise.all([models.Snapshot.findByPk(job.snapshot_id), models.Environment.findByPk(job.environment_id)]);
  } catch (error) {
    // The database went away: leave the job to be taken over once its heartbeat is stale.
    console.error("[analysis] could not load the job's snapshot:", error instanceof Error ? error.message : error);
    return "failed";
  }
  if (!snapshot || !env) {
    await models.AnalysisRun.update({ status: "failed", error: "snapshot or environment no longer exists", finishedAt: new Date() }, { where: { id: job.id } });
    return "failed";
  }
  let lastWrite = 0;
  let pending: Promise<unknown> = Promise.resolve();
  const onProgress = (fraction: number, phase: string) => {
    const now = Date.now();
    if (now - lastWrite < 250 && phase !== "done") return;
    lastWrite = now;
    pending = pending.then(() =>
      models.AnalysisRun.update({ progress: fraction, phase, heartbeatAt: new Date() }, { where: { id: job.id, lockedBy: worker } }),
    );
  };
  // The analysis yields between its phases (each well under the stale limit, see npm run bench), and
  // this timer beats then; progress reports beat too.
  const beat = setInterval(() => {
    void models.AnalysisRun.update({ heartbeatAt: new Date() }, { where: { id: job.id, lockedBy: worker } });
  }, 10_000);
  try {
    const result = await analyse(analysisInputFromContent(snapshot.content, readSettings(env.settings)), { weights: env.pinchWeights ?? undefined }, onProgress);
    await pending;
    const outcome = await storeResult({ jobId: job.id, worker, snapshotId: snapshot.id, content: snapshot.content, result });
    // Tell owners and architects about components new to the top ten (compared with the previous analysed snapshot).
    if (outcome === "done") await noticeTopTenChanges({ environmentId: job.environment_id, snapshotId: job.snapshot_id, previousSnapshotId: null });
    return outcome;
  } catch (error) {
    await pending.catch(() => undefined);
    const message = error instanceof Error ? error.message : String(error);
    console.error(`[analysis] snapshot ${snapshot.number} of ${env.slug} failed:`, error);
    await sequelize.query(
      `UPDATE analysis_runs SET status = CASE WHEN attempts >= :max THEN 'failed'::analysis_status ELSE 'queued'::analysis_status END,
              error = :message, locked_by = NULL, updated_at = now(), finished_at = CASE WHEN attempts >= :max THEN now() END
        WHERE id = :id AND locked_by = :worker`,
      { replacements: { id: job.id, worker, message, max: MAX_ATTEMPTS } },
    );
    return "failed";
  } finally {
    clearInterval(beat);
  }
}

async function storeResult({
  jobId,
  worker,
  snapshotId,
  content,
  result,
}: {
  jobId: string;
  worker: string;
  snapshotId: string;
  content: SnapshotContent;
  result: AnalysisResult;
}): Promise<"done" | "lost"> {
  const { sequelize } = db();
  const byKey = new Map(content.components.map((c) => [c.key, c]));
  const ranked = rankedByBetweenness(result.nodes);
  const rows = ranked.map((n, i) => {
    const c = byKey.get(n.key);
    return {
      key: n.key,
      name: c?.name ?? n.key,
      kind: c?.kind ?? "undeclared",
      team: c?.team ?? null,
      tier: c?.tier ?? 3,
      betweenness: n.betweenness,
      pagerank: n.pagerank,
      eigenvector: n.eigenvector,
      clustering: n.clustering,
      articulation: n.articulation,
      in_cycle: n.inCycle,
      blast_down: n.blastDown,
      blast_degraded: n.blastDegraded,
      pinch_score: n.pinchScore,
      single_point: n.singlePoint,
      rank: i + 1,
    };
  });
  return sequelize.transaction(async (transaction) => {
    // Still ours? A worker that was presumed dead must not overwrite the one that took over.
    const [owned] = await sequelize.query<{ id: string }>(
      "SELECT id FROM analysis_runs WHERE id = :id AND locked_by = :worker AND status = 'running' FOR UPDATE",
      { type: QueryTypes.SELECT, replacements: { id: jobId, worker }, transaction },
    );
    if (!owned) return "lost" as const;
    await sequelize.query("DELETE FROM component_metrics WHERE snapshot_id = $1", { bind: [snapshotId], transaction });
    await sequelize.query(
      `INSERT INTO component_metrics (snapshot_id, key, name, kind, team, tier, betweenness, pagerank, eigenvector, clustering,
              articulation, in_cycle, blast_down, blast_degraded, pinch_score, single_point, rank)
       SELECT $1, t.key, t.name, t.kind, t.team, t.tier, t.betweenness, t.pagerank, t.eigenvector, t.clustering,
              t.articulation, t.in_cycle, t.blast_down, t.blast_degraded, t.pinch_score, t.single_point, t.rank
         FROM jsonb_to_recordset($2::jsonb) AS t(key text, name text, kind text, team text, tier smallint,
              betweenness float8, pagerank float8, eigenvector float8, clustering float8, articulation boolean,
              in_cycle boolean, blast_down integer, blast_degraded integer, pinch_score float8, single_point boolean, rank integer)`,
      { bind: [snapshotId, JSON.stringify(rows)], transaction },
    );
    const extra = new Map(result.nodes.map((n) => [n.key, { bootStage: n.bootStage, dominator: n.dominator }]));
    await sequelize.query(
      `UPDATE analysis_runs SET status = 'done', progress = 1, phase = 'done', finished_at = now(), updated_at = now(),
              exact = :exact, sample_size = :sampleSize, timings = :timings::jsonb, graph = :graph::jsonb, locked_by = NULL
        WHERE id = :id`,
      {
        replacements: {
          id: jobId,
          exact: result.graph.exact,
          sampleSize: result.graph.sampleSize,
          timings: JSON.stringify(result.timings),
          graph: JSON.stringify({ ...result.graph, perNode: Object.fromEntries(extra) }),
        },
        transaction,
      },
    );
    return "done" as const;
  });
}

/** Work through the queue until it is empty (tests, the seed, and each worker loop turn). */
export async function drainAnalysisQueue(worker = workerId()): Promise<number> {
  let count = 0;
  for (let job = await claimNextJob(worker); job; job = await claimNextJob(worker)) {
    await runJob(job, worker);
    count++;
  }
  return count;
}

export type { PinchWeights };
