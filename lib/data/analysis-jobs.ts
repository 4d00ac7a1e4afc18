// Analysis jobs: a queue in PostgreSQL (analysis_runs), so that any number of worker processes
// share the work and a restart re-queues what was running. Claiming uses FOR UPDATE SKIP LOCKED;
// a job whose worker stopped sending heartbeats is claimed again.
import { hostname } from "node:os";
import { QueryTypes, type Transaction } from "sequelize";
import { db } from "@/models";
import type { AnalysisResult } from "@/lib/analysis";
import { analyseInThread } from "@/lib/analysis/thread";
import { analysisInputFromContent } from "@/lib/analysis/input";
import { readSettings } from "@/lib/inventory/settings";
import type { AnalysisOptions, PinchWeights } from "@/lib/analysis/types";
import type { SnapshotContent } from "@/lib/inventory/snapshot";
import { noticeTopTenChanges } from "@/lib/mail";
import { forgetServedState } from "./analysis-results";

/** A running job with no heartbeat for this long is taken to be orphaned (PINCHPOINT_ANALYSIS_STALE_S overrides it). */
export const STALE_AFTER_S = 60;
const staleAfterS = (): number => Number(process.env.PINCHPOINT_ANALYSIS_STALE_S ?? STALE_AFTER_S);
/** Heartbeats come several times per stale period, so one late beat never orphans a job. */
const beatMs = (): number => Math.max(250, Math.min(10_000, (staleAfterS() * 1000) / 4));
export const MAX_ATTEMPTS = 3;

/** Readers see a queue change at once: after the caller's commit, or now when there is no transaction. */
function forgetAfter(transaction?: Transaction): void {
  if (transaction) transaction.afterCommit(forgetServedState);
  else forgetServedState();
}

export async function queueAnalysis({ environmentId, snapshotId }: { environmentId: string; snapshotId: string }, transaction?: Transaction): Promise<void> {
  forgetAfter(transaction);
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
  forgetAfter(transaction);
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
    { replacements: { stale: staleAfterS(), max: MAX_ATTEMPTS } },
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
    { type: QueryTypes.SELECT, replacements: { worker, stale: staleAfterS() } },
  );
  if (rows[0]) forgetServedState();
  return rows[0] ?? null;
}

/**
 * Run one claimed job to the end, storing results or the error. `options` tune the analysis
 * (tests use them to force, say, a measure that does not converge); the worker passes none.
 */
export async function runJob(job: ClaimedJob, worker = workerId(), options: AnalysisOptions = {}): Promise<"done" | "failed" | "lost"> {
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
  // The analysis runs on its own thread (lib/analysis/thread.ts), so this timer beats however long a
  // phase takes; progress reports beat too.
  const beat = setInterval(() => {
    void models.AnalysisRun.update({ heartbeatAt: new Date() }, { where: { id: job.id, lockedBy: worker } });
  }, beatMs());
  try {
    const result = await analyseInThread(analysisInputFromContent(snapshot.content, readSettings(env.settings)), { ...options, weights: env.pinchWeights ?? undefined }, onProgress);
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
    forgetServedState();
  }
}

/** Most entry rows (component, entry it dominates from) kept per snapshot; each component keeps its strongest entries. */
const MAX_DOMINANCE_ROWS = 200_000;
/** Rows per INSERT statement, so that no single bind parameter grows without bound. */
const INSERT_CHUNK = 20_000;

/** The small summary kept in analysis_runs.graph: what the screens say about the analysis as a whole. */
export interface AnalysisSummary {
  nodeCount: number;
  edgeCount: number;
  selfLoops: string[];
  implicitKeyCount: number;
  bridgeCount: number;
  cycleCount: number;
  bootCycleCount: number;
  bootStageCount: number;
  exact: boolean;
  sampleSize: number;
  betweennessThreads: number;
  betweennessMs: number;
  pagerank: AnalysisResult["graph"]["pagerank"];
  eigenvector: AnalysisResult["graph"]["eigenvector"];
  dominators: { entries: number; complete: boolean; entriesAnalysed: number };
  weights: AnalysisResult["graph"]["weights"];
  /** whether the analysis ran on its worker thread */
  thread: boolean;
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
  result: AnalysisResult & { thread?: boolean };
}): Promise<"done" | "lost"> {
  const { sequelize } = db();
  const byKey = new Map(content.components.map((c) => [c.key, c]));
  const rows = result.nodes.map((n) => {
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
      rank: n.ranks.betweenness.rank,
      tied: n.ranks.betweenness.tied,
      rank_pagerank: n.ranks.pagerank.rank,
      tied_pagerank: n.ranks.pagerank.tied,
      rank_eigenvector: n.ranks.eigenvector.rank,
      tied_eigenvector: n.ranks.eigenvector.tied,
      rank_pinch: n.ranks.pinchScore.rank,
      tied_pinch: n.ranks.pinchScore.tied,
      rank_blast: n.ranks.blastDown.rank,
      tied_blast: n.ranks.blastDown.tied,
      boot_stage: n.bootStage,
      waits_on_cycle: n.waitsOnCycle,
      entry: n.entry,
      entries_reaching: n.dominator.reachedFrom,
      entries_dominated: n.dominator.dominatesFrom,
      max_dominated: n.dominator.maxDominated,
      dominated_all: n.dominator.allDominated,
      idom_all: n.dominator.allIdom,
    };
  });
  // Each component's strongest entries, fewer per component when an estate has thousands of entries.
  const listed = result.nodes.filter((n) => n.dominator.topEntries.length > 0);
  const perComponent = Math.max(1, Math.floor(MAX_DOMINANCE_ROWS / Math.max(1, listed.length)));
  const dominance = listed.flatMap((n) => n.dominator.topEntries.slice(0, perComponent).map((t) => ({ key: n.key, entry: t.entry, dominated: t.dominated })));
  const g = result.graph;
  const cycles = [
    ...g.cycles.map((members, position) => ({ kind: "runtime", position, members, start_order: null, breaks: null, break_count: null })),
    ...g.bootOrder.cycles.map((members, position) => {
      const plan = g.bootOrder.plans[position];
      return { kind: "boot", position, members, start_order: plan?.order ?? null, breaks: plan?.breaks ?? null, break_count: plan?.breakCount ?? null };
    }),
  ];
  const summary: AnalysisSummary = {
    nodeCount: g.nodeCount,
    edgeCount: g.edgeCount,
    selfLoops: g.selfLoops.slice(0, 100),
    implicitKeyCount: g.implicitKeys.length,
    bridgeCount: g.bridges.length,
    cycleCount: g.cycles.length,
    bootCycleCount: g.bootOrder.cycles.length,
    bootStageCount: g.bootOrder.stages.length,
    exact: g.exact,
    sampleSize: g.sampleSize,
    betweennessThreads: g.betweennessThreads,
    betweennessMs: g.betweennessMs,
    pagerank: g.pagerank,
    eigenvector: g.eigenvector,
    dominators: { entries: g.dominators.roots.length, complete: g.dominators.complete, entriesAnalysed: g.dominators.entriesAnalysed },
    weights: g.weights,
    thread: result.thread ?? false,
  };
  const chunks = <T>(xs: T[]): T[][] => Array.from({ length: Math.ceil(xs.length / INSERT_CHUNK) }, (_, i) => xs.slice(i * INSERT_CHUNK, (i + 1) * INSERT_CHUNK));
  return sequelize.transaction(async (transaction) => {
    // Still ours? A worker that was presumed dead must not overwrite the one that took over.
    const [owned] = await sequelize.query<{ id: string }>(
      "SELECT id FROM analysis_runs WHERE id = :id AND locked_by = :worker AND status = 'running' FOR UPDATE",
      { type: QueryTypes.SELECT, replacements: { id: jobId, worker }, transaction },
    );
    if (!owned) return "lost" as const;
    for (const table of ["component_metrics", "component_dominance", "analysis_cycles"]) {
      await sequelize.query(`DELETE FROM ${table} WHERE snapshot_id = $1`, { bind: [snapshotId], transaction });
    }
    for (const chunk of chunks(rows)) {
      await sequelize.query(
        `INSERT INTO component_metrics (snapshot_id, key, name, kind, team, tier, betweenness, pagerank, eigenvector, clustering,
                articulation, in_cycle, blast_down, blast_degraded, pinch_score, single_point, rank, tied, rank_pagerank, tied_pagerank,
                rank_eigenvector, tied_eigenvector, rank_pinch, tied_pinch, rank_blast, tied_blast, boot_stage, waits_on_cycle, entry,
                entries_reaching, entries_dominated, max_dominated, dominated_all, idom_all)
         SELECT $1, t.key, t.name, t.kind, t.team, t.tier, t.betweenness, t.pagerank, t.eigenvector, t.clustering,
                t.articulation, t.in_cycle, t.blast_down, t.blast_degraded, t.pinch_score, t.single_point, t.rank, t.tied, t.rank_pagerank,
                t.tied_pagerank, t.rank_eigenvector, t.tied_eigenvector, t.rank_pinch, t.tied_pinch, t.rank_blast, t.tied_blast,
                t.boot_stage, t.waits_on_cycle, t.entry, t.entries_reaching, t.entries_dominated, t.max_dominated, t.dominated_all, t.idom_all
           FROM jsonb_to_recordset($2::jsonb) AS t(key text, name text, kind text, team text, tier smallint,
                betweenness float8, pagerank float8, eigenvector float8, clustering float8, articulation boolean,
                in_cycle boolean, blast_down integer, blast_degraded integer, pinch_score float8, single_point boolean, rank integer,
                tied integer, rank_pagerank integer, tied_pagerank integer, rank_eigenvector integer, tied_eigenvector integer,
                rank_pinch integer, tied_pinch integer, rank_blast integer, tied_blast integer, boot_stage integer, waits_on_cycle boolean,
                entry boolean, entries_reaching integer, entries_dominated integer, max_dominated integer, dominated_all integer, idom_all text)`,
        { bind: [snapshotId, JSON.stringify(chunk)], transaction },
      );
    }
    for (const chunk of chunks(dominance)) {
      await sequelize.query(
        `INSERT INTO component_dominance (snapshot_id, key, entry, dominated)
         SELECT $1, t.key, t.entry, t.dominated FROM jsonb_to_recordset($2::jsonb) AS t(key text, entry text, dominated integer)`,
        { bind: [snapshotId, JSON.stringify(chunk)], transaction },
      );
    }
    for (const chunk of chunks(cycles)) {
      await sequelize.query(
        `INSERT INTO analysis_cycles (snapshot_id, kind, position, members, start_order, breaks, break_count)
         SELECT $1, t.kind, t.position, ARRAY(SELECT jsonb_array_elements_text(t.members)),
                CASE WHEN t.start_order IS NULL THEN NULL ELSE ARRAY(SELECT jsonb_array_elements_text(t.start_order)) END,
                t.breaks, t.break_count
           FROM jsonb_to_recordset($2::jsonb) AS t(kind text, position integer, members jsonb, start_order jsonb, breaks jsonb, break_count integer)`,
        { bind: [snapshotId, JSON.stringify(chunk)], transaction },
      );
    }
    await sequelize.query(
      `UPDATE analysis_runs SET status = 'done', progress = 1, phase = 'done', finished_at = now(), updated_at = now(),
              exact = :exact, sample_size = :sampleSize, timings = :timings::jsonb, graph = :graph::jsonb, bridges = :bridges::jsonb, locked_by = NULL
        WHERE id = :id`,
      {
        replacements: {
          id: jobId,
          exact: g.exact,
          sampleSize: g.sampleSize,
          timings: JSON.stringify(result.timings),
          graph: JSON.stringify(summary),
          bridges: JSON.stringify(g.bridges),
        },
        transaction,
      },
    );
    return "done" as const;
  });
}

/** Work through the queue until it is empty (tests, the seed, and each worker loop turn). */
export async function drainAnalysisQueue(worker = workerId(), options: AnalysisOptions = {}): Promise<number> {
  let count = 0;
  for (let job = await claimNextJob(worker); job; job = await claimNextJob(worker)) {
    await runJob(job, worker, options);
    count++;
  }
  return count;
}

export type { PinchWeights };
