// The product's record of analyses (analysis_runs: status, progress, phase, summary) and the queue
// jobs that run them (pg-boss queue `analysis`, lib/data/job-queue.ts). A push queues a run and a
// job in its own transaction; a worker (lib/jobs/analysis.ts) fetches a job, claims the newest
// snapshot's run of that environment here, analyses it and stores the results with the job
// completed in one transaction.
//
// What the queue library does not know, and this file keeps:
// - one analysis per environment at a time: a claim takes an advisory lock per environment and finds
//   the environment busy while another run of it is running with a fresh heartbeat;
// - a newer snapshot supersedes a queued older one: the claim takes the newest snapshot's run and
//   marks older queued runs `superseded`;
// - a presumed-dead worker cannot overwrite: a run belongs to (worker, attempt) while it runs; a run
//   whose heartbeat stopped is handed back to the queue (the job failed through pg-boss, which
//   retries it with backoff), and the old worker's late result is refused.
import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { db } from "@/models";
import type { AnalysisResult } from "@/lib/analysis";
import type { PinchWeights } from "@/lib/analysis/types";
import type { SnapshotContent } from "@/lib/inventory/snapshot";
import { forgetServedState } from "./analysis-results";
import { inTransaction, jobQueue, QUEUES, sendJob } from "./job-queue";

/** A running analysis with no heartbeat for this long is taken to be orphaned (PINCHPOINT_ANALYSIS_STALE_S overrides it). */
export const STALE_AFTER_S = 60;
export const staleAfterS = (): number => Number(process.env.PINCHPOINT_ANALYSIS_STALE_S ?? STALE_AFTER_S);

/** The data of a job in the queue `analysis`: analyse this environment's newest snapshot. */
export interface AnalysisJobData {
  environmentId: string;
}

/** Readers see a queue change at once: after the caller's commit, or now when there is no transaction. */
function forgetAfter(transaction?: Transaction): void {
  if (transaction) transaction.afterCommit(forgetServedState);
  else forgetServedState();
}

/** A job for the environment, unless one is already waiting (its singleton key refuses a second). */
function sendAnalysisJob(environmentId: string, transaction?: Transaction): Promise<string | null> {
  return sendJob(QUEUES.analysis, { environmentId } satisfies AnalysisJobData, { singletonKey: environmentId }, transaction);
}

/** A new snapshot's run, queued with its job in the caller's transaction. */
export async function queueAnalysis({ environmentId, snapshotId }: { environmentId: string; snapshotId: string }, transaction?: Transaction): Promise<void> {
  forgetAfter(transaction);
  await db().models.AnalysisRun.create(
    { environmentId, snapshotId, status: "queued", phase: null, lockedBy: null, heartbeatAt: null, startedAt: null, finishedAt: null, error: null, exact: null, sampleSize: null, timings: null, graph: null },
    { transaction },
  );
  await sendAnalysisJob(environmentId, transaction);
}

/**
 * Analyse the newest snapshot again (its inputs changed: weights, settings). analysis_runs.snapshot_id
 * is unique, so the snapshot's one run goes back to the queue; a worker still holding it loses it, because
 * its result is refused once the row is no longer running for it.
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
      `UPDATE analysis_runs SET status = 'queued', progress = 0, phase = NULL, attempts = 0, locked_by = NULL, job_id = NULL,
              heartbeat_at = NULL, started_at = NULL, finished_at = NULL, error = NULL, updated_at = now()
        WHERE id = :id`,
      { replacements: { id: latest.run_id }, transaction },
    );
    await sendAnalysisJob(environmentId, transaction);
  } else {
    await queueAnalysis({ environmentId, snapshotId: latest.id }, transaction);
  }
  return { snapshot: latest.number };
}

/** A run a worker holds: whose (locked_by), which attempt, and the queue job that claimed it. */
export interface ClaimedRun {
  id: string;
  snapshot_id: string;
  environment_id: string;
  attempts: number;
  job_id: string;
}

/** A fetched job of the queue `analysis`. */
interface AnalysisQueueJob {
  id: string;
  data: AnalysisJobData;
}

export type Claim = { kind: "claimed"; run: ClaimedRun } | { kind: "busy" | "idle" };

/**
 * Claim the newest snapshot's run of the job's environment for `worker`, or say why not — `busy`:
 * another run of the environment is running (that worker will see the newer snapshot's run queued
 * and send a job for it when it finishes); `idle`: nothing queued. Either way the job is completed
 * in the same transaction, so it neither waits nor counts as a failure.
 */
export async function claimRun({ job, worker }: { job: AnalysisQueueJob; worker: string }): Promise<Claim> {
  const { sequelize } = db();
  const environmentId = job.data.environmentId;
  const claim = await sequelize.transaction(async (transaction): Promise<Claim> => {
    // Claims of one environment, and the end of its runs, take turns (other environments do not wait).
    await sequelize.query("SELECT pg_advisory_xact_lock(hashtextextended('pinchpoint.analysis:' || :environmentId, 0))", { replacements: { environmentId }, transaction });
    const finish = async (kind: "busy" | "idle"): Promise<Claim> => {
      await jobQueue().complete(QUEUES.analysis, job.id, { [kind]: true }, inTransaction(transaction));
      return { kind };
    };
    const [busy] = await sequelize.query<{ id: string }>(
      `SELECT id FROM analysis_runs WHERE environment_id = :environmentId AND status = 'running'
          AND heartbeat_at >= now() - make_interval(secs => :stale) LIMIT 1`,
      { type: QueryTypes.SELECT, replacements: { environmentId, stale: staleAfterS() }, transaction },
    );
    if (busy) return finish("busy");
    const [newest] = await sequelize.query<{ id: string; status: string }>(
      `SELECT a.id, a.status::text AS status FROM analysis_runs a JOIN snapshots s ON s.id = a.snapshot_id
        WHERE a.environment_id = :environmentId ORDER BY s.number DESC LIMIT 1 FOR UPDATE OF a`,
      { type: QueryTypes.SELECT, replacements: { environmentId }, transaction },
    );
    if (!newest || (newest.status !== "queued" && newest.status !== "running")) return finish("idle");
    await sequelize.query(
      `UPDATE analysis_runs SET status = 'superseded', locked_by = NULL, finished_at = now(), updated_at = now(),
              error = 'a newer snapshot was analysed instead'
        WHERE environment_id = :environmentId AND status = 'queued' AND id <> :id`,
      { replacements: { environmentId, id: newest.id }, transaction },
    );
    const [run] = await sequelize.query<ClaimedRun>(
      `UPDATE analysis_runs
          SET status = 'running', locked_by = :worker, job_id = :jobId, heartbeat_at = now(), started_at = now(),
              attempts = attempts + 1, progress = 0, phase = 'starting', error = NULL, finished_at = NULL, updated_at = now()
        WHERE id = :id
        RETURNING id, snapshot_id, environment_id, attempts, job_id`,
      { type: QueryTypes.SELECT, replacements: { id: newest.id, worker, jobId: job.id }, transaction },
    );
    if (!run) return finish("idle");
    return { kind: "claimed", run };
  });
  forgetServedState();
  return claim;
}

/** Is the run still this worker's attempt? Locks its row for the rest of `transaction`. */
async function ownRun({ run, worker, transaction }: { run: ClaimedRun; worker: string; transaction: Transaction }): Promise<boolean> {
  const [owned] = await db().sequelize.query<{ id: string }>(
    "SELECT id FROM analysis_runs WHERE id = :id AND locked_by = :worker AND attempts = :attempts AND status = 'running' FOR UPDATE",
    { type: QueryTypes.SELECT, replacements: { id: run.id, worker, attempts: run.attempts }, transaction },
  );
  return Boolean(owned);
}

/**
 * A worker that lost its run to a re-queue (weights or settings changed) completes its own job: the
 * run has a new one. When the run was taken over (same job, retried by the queue), the job belongs to
 * the worker that holds it now and is left alone.
 */
async function completeIfSuperseded(run: ClaimedRun): Promise<void> {
  const current = await db().models.AnalysisRun.findByPk(run.id, { attributes: ["jobId"] });
  if (current?.jobId !== run.job_id) {
    const job = await jobQueue().getJobById(QUEUES.analysis, run.job_id, { includeArchive: false });
    if (job?.state === "active") await jobQueue().complete(QUEUES.analysis, run.job_id, { superseded: true });
  }
}

/** The inputs of a claimed run: its snapshot and its environment's settings and weights. */
export async function loadRunInput(run: ClaimedRun): Promise<{ number: number; slug: string; content: SnapshotContent; settings: unknown; pinchWeights: PinchWeights | null } | null> {
  const { models } = db();
  const [snapshot, env] = await Promise.all([models.Snapshot.findByPk(run.snapshot_id), models.Environment.findByPk(run.environment_id)]);
  if (!snapshot || !env) return null;
  return { number: snapshot.number, slug: env.slug, content: snapshot.content, settings: env.settings, pinchWeights: env.pinchWeights ?? null };
}

/** The worker is alive and still on it (only its own attempt's row is touched). */
export async function recordRunHeartbeat({ run, worker, progress }: { run: ClaimedRun; worker: string; progress?: { fraction: number; phase: string } }): Promise<void> {
  await db().models.AnalysisRun.update(
    { heartbeatAt: new Date(), ...(progress ? { progress: progress.fraction, phase: progress.phase } : {}) },
    { where: { id: run.id, lockedBy: worker, attempts: run.attempts, status: "running" } },
  );
}

/**
 * The analysis failed. The queue decides whether it is tried again (its retry limit and backoff);
 * the run says so: queued again, or failed with the reason. `permanent` (the snapshot is gone)
 * fails at once. A worker whose run was taken over changes nothing.
 */
export async function failRun({ run, worker, message, permanent = false }: { run: ClaimedRun; worker: string; message: string; permanent?: boolean }): Promise<"failed" | "retrying" | "lost"> {
  const { sequelize } = db();
  const outcome = await sequelize.transaction(async (transaction) => {
    if (!(await ownRun({ run, worker, transaction }))) return "lost" as const;
    const job = await jobQueue().getJobById<AnalysisJobData>(QUEUES.analysis, run.job_id, { includeArchive: false, ...inTransaction(transaction) });
    const active = job?.state === "active";
    const last = permanent || !active || job.retryCount >= job.retryLimit;
    await sequelize.query(
      `UPDATE analysis_runs SET status = :status, error = :message, locked_by = NULL, updated_at = now(),
              finished_at = CASE WHEN :status = 'failed' THEN now() END
        WHERE id = :id`,
      { replacements: { id: run.id, status: last ? "failed" : "queued", message: message.slice(0, 4000) }, transaction },
    );
    if (active) {
      if (permanent) await jobQueue().complete(QUEUES.analysis, run.job_id, { failed: message.slice(0, 500) }, inTransaction(transaction));
      else await jobQueue().fail(QUEUES.analysis, run.job_id, { message: message.slice(0, 500) }, inTransaction(transaction));
    }
    return last ? ("failed" as const) : ("retrying" as const);
  });
  if (outcome === "lost") await completeIfSuperseded(run);
  forgetServedState();
  return outcome;
}

/**
 * The worker is stopping (a deploy, npm start ending): hand the run back at once rather than after
 * its heartbeat goes stale. Not a failure, so no attempt is used: the job is completed and a new one
 * sent, which the next worker takes.
 */
export async function releaseRun({ run, worker }: { run: ClaimedRun; worker: string }): Promise<boolean> {
  const { sequelize } = db();
  const released = await sequelize.transaction(async (transaction) => {
    if (!(await ownRun({ run, worker, transaction }))) return false;
    await sequelize.query(
      `UPDATE analysis_runs SET status = 'queued', locked_by = NULL, job_id = NULL, attempts = GREATEST(attempts - 1, 0),
              progress = 0, phase = NULL, updated_at = now() WHERE id = :id`,
      { replacements: { id: run.id }, transaction },
    );
    await jobQueue().complete(QUEUES.analysis, run.job_id, { released: true }, inTransaction(transaction));
    await sendAnalysisJob(run.environment_id, transaction);
    return true;
  });
  forgetServedState();
  return released;
}

/**
 * Runs whose worker stopped beating (killed, frozen, its machine gone): each goes back to the queue
 * by failing its job through pg-boss, which retries it after its backoff, or gives up once the
 * retry limit is used (then the run fails for good, rather than loop forever).
 */
export async function reapStaleRuns(): Promise<number> {
  const { sequelize } = db();
  const reaped = await sequelize.transaction(async (transaction) => {
    const stale = await sequelize.query<{ id: string; environment_id: string; job_id: string | null; attempts: number }>(
      `SELECT id, environment_id, job_id, attempts FROM analysis_runs
        WHERE status = 'running' AND heartbeat_at < now() - make_interval(secs => :stale)
        FOR UPDATE SKIP LOCKED`,
      { type: QueryTypes.SELECT, replacements: { stale: staleAfterS() }, transaction },
    );
    for (const run of stale) {
      const job = run.job_id ? await jobQueue().getJobById(QUEUES.analysis, run.job_id, { includeArchive: false, ...inTransaction(transaction) }) : null;
      const active = job?.state === "active";
      const last = active && job.retryCount >= job.retryLimit;
      await sequelize.query(
        `UPDATE analysis_runs SET status = :status, locked_by = NULL, updated_at = now(), error = :error,
                finished_at = CASE WHEN :status = 'failed' THEN now() END
          WHERE id = :id`,
        {
          replacements: {
            id: run.id,
            status: last ? "failed" : "queued",
            error: last ? `gave up after ${run.attempts} attempts: the worker stopped answering` : `taken back from a worker that stopped answering for ${staleAfterS()} s`,
          },
          transaction,
        },
      );
      if (active && run.job_id) await jobQueue().fail(QUEUES.analysis, run.job_id, { message: "the worker stopped answering" }, inTransaction(transaction));
      // No job of its own any more (completed, or never had one): give the run a new one.
      else if (!last) await sendAnalysisJob(run.environment_id, transaction);
    }
    return stale.length;
  });
  if (reaped) forgetServedState();
  return reaped;
}

/**
 * After a run ends: a newer snapshot of the environment may have been queued meanwhile, while its
 * job found the environment busy. (The run itself, if it is to be retried, waits for its queue
 * retry and its backoff.)
 */
export async function sendJobForQueuedRun({ environmentId, after }: { environmentId: string; after: string }): Promise<void> {
  const { sequelize } = db();
  await sequelize.transaction(async (transaction) => {
    await sequelize.query("SELECT pg_advisory_xact_lock(hashtextextended('pinchpoint.analysis:' || :environmentId, 0))", { replacements: { environmentId }, transaction });
    const [queued] = await sequelize.query<{ id: string }>(
      "SELECT id FROM analysis_runs WHERE environment_id = :environmentId AND status = 'queued' AND id <> :after LIMIT 1",
      { type: QueryTypes.SELECT, replacements: { environmentId, after }, transaction },
    );
    if (queued) await sendAnalysisJob(environmentId, transaction);
  });
}

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

/** Most entry rows (component, entry it dominates from) kept per snapshot; each component keeps its strongest entries. */
const MAX_DOMINANCE_ROWS = 200_000;
/** Rows per INSERT statement, so that no single bind parameter grows without bound. */
const INSERT_CHUNK = 20_000;

/**
 * Store an analysis and mark its run done, with the queue job completed in the same transaction —
 * unless the run is no longer this worker's attempt: a worker presumed dead (its run handed back to
 * the queue and claimed again) must not overwrite the one that took over. Then `lost`, and the job
 * is left to whoever holds it now (or completed, when the run was re-queued with a new job).
 */
export async function storeResult({
  run,
  worker,
  content,
  result,
}: {
  run: ClaimedRun;
  worker: string;
  content: SnapshotContent;
  result: AnalysisResult & { thread?: boolean };
}): Promise<"done" | "lost"> {
  const snapshotId = run.snapshot_id;
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
  const outcome = await sequelize.transaction(async (transaction) => {
    if (!(await ownRun({ run, worker, transaction }))) return "lost" as const;
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
          id: run.id,
          exact: g.exact,
          sampleSize: g.sampleSize,
          timings: JSON.stringify(result.timings),
          graph: JSON.stringify(summary),
          bridges: JSON.stringify(g.bridges),
        },
        transaction,
      },
    );
    await jobQueue().complete(QUEUES.analysis, run.job_id, {}, inTransaction(transaction));
    return "done" as const;
  });
  if (outcome === "lost") await completeIfSuperseded(run);
  forgetServedState();
  return outcome;
}


export type { PinchWeights };
