// Reading stored analysis: which snapshot the rankings come from, its status, and each result
// where it is stored (component_metrics, component_dominance, analysis_cycles); analysis_runs.graph
// is only a small summary.
import "server-only";
import { QueryTypes } from "sequelize";
import { db } from "@/models";
import type { ComponentKind, Strength, Tier } from "@/lib/inventory/types";
import { rankedMeasureOf, type RankingSort } from "@/lib/api/ranking-sorts";
import type { AnalysisSummary } from "./analysis-runs";

interface AnalysisStatusInfo {
  status: "queued" | "running" | "done" | "failed" | "none";
  progress: number;
  phase: string | null;
  computedAt: string | null;
  exact: boolean | null;
  sampleSize: number | null;
  error: string | null;
}

export interface SnapshotRef {
  id: string;
  number: number;
  createdAt: string;
  componentCount: number;
  undeclaredCount: number;
}

/** The newest snapshot, its analysis, and the newest snapshot whose analysis is done (what we serve). */
export interface AnalysisView {
  latest: SnapshotRef | null;
  latestAnalysis: AnalysisStatusInfo;
  served: SnapshotRef | null;
  servedAnalysis: AnalysisStatusInfo | null;
  /** the served analysis' summary (counts, convergence of iterative measures, dominators); null for none */
  summary: Partial<AnalysisSummary> | null;
}

interface RunRow {
  snapshot_id: string;
  number: number;
  created_at: Date;
  component_count: number;
  undeclared_count: number;
  status: AnalysisStatusInfo["status"] | null;
  progress: number | null;
  phase: string | null;
  finished_at: Date | null;
  exact: boolean | null;
  sample_size: number | null;
  error: string | null;
}

const toRef = (r: RunRow): SnapshotRef => ({
  id: r.snapshot_id,
  number: r.number,
  createdAt: r.created_at.toISOString(),
  componentCount: r.component_count,
  undeclaredCount: r.undeclared_count,
});

const toStatus = (r: RunRow): AnalysisStatusInfo => ({
  status: r.status ?? "none",
  progress: r.progress ?? 0,
  phase: r.phase,
  computedAt: r.finished_at?.toISOString() ?? null,
  exact: r.exact,
  sampleSize: r.sample_size,
  error: r.error,
});

const RUN_SELECT = `SELECT s.id AS snapshot_id, s.number, s.created_at, s.component_count, s.undeclared_count,
                           a.status, a.progress, a.phase, a.finished_at, a.exact, a.sample_size, a.error
                      FROM snapshots s LEFT JOIN analysis_runs a ON a.snapshot_id = s.id`;

type ServedState = Awaited<ReturnType<typeof readServedState>>;

/**
 * The served state of an environment, answered from memory for up to STATE_CACHE_MS. Every analysis
 * read starts with it, so under concurrent readers its round trip was the largest cost left. Changes
 * made in this process (a push queueing an analysis, a job finishing, an owner assigned, an
 * environment renamed) clear it at once (`forgetServedState`); the worker's progress, from another
 * process, shows within STATE_CACHE_MS. Kept on globalThis: Next may bundle this module twice.
 */
const STATE_CACHE_MS = Number(process.env.PINCHPOINT_STATE_CACHE_MS ?? 1000);
const stateCache = ((globalThis as unknown as { __pinchpointServed?: Map<string, { at: number; state: Promise<ServedState> }> }).__pinchpointServed ??= new Map());

export function getServedState({ slug }: { slug: string }): Promise<ServedState> {
  const now = Date.now();
  const hit = stateCache.get(slug);
  if (hit && now - hit.at < STATE_CACHE_MS) return hit.state;
  const state = readServedState({ slug });
  if (stateCache.size >= 1000) stateCache.clear();
  stateCache.set(slug, { at: now, state });
  state.catch(() => stateCache.delete(slug));
  return state;
}

/** After any change to what an analysis read shows: the next read asks the database again. */
export function forgetServedState(): void {
  stateCache.clear();
}

/**
 * An environment, its newest snapshot and newest analysed snapshot, and a version of its owner
 * annotations (rankings show effective owners), in one round trip.
 */
async function readServedState({ slug }: { slug: string }): Promise<{
  environment: { id: string; slug: string; name: string; pinchWeights: unknown; settings: unknown };
  view: AnalysisView;
  /** changes whenever the served analysis, the analysis in progress or an owner annotation changes */
  version: string;
} | null> {
  const cols = (p: string) =>
    `${p}.snapshot_id AS ${p}_snapshot_id, ${p}.number AS ${p}_number, ${p}.created_at AS ${p}_created_at, ${p}.component_count AS ${p}_component_count,
     ${p}.undeclared_count AS ${p}_undeclared_count, ${p}.status AS ${p}_status, ${p}.progress AS ${p}_progress, ${p}.phase AS ${p}_phase,
     ${p}.finished_at AS ${p}_finished_at, ${p}.exact AS ${p}_exact, ${p}.sample_size AS ${p}_sample_size, ${p}.error AS ${p}_error`;
  const [row] = await db().sequelize.query<Record<string, unknown>>(
    `SELECT e.id, e.slug, e.name, e.pinch_weights, e.settings, ${cols("l")}, ${cols("v")}, v.graph AS v_graph, v.run_id AS v_run_id,
            (SELECT count(*) || '.' || COALESCE(extract(epoch FROM max(updated_at))::text, '') FROM component_annotations x WHERE x.environment_id = e.id) AS annotations
       FROM environments e
       LEFT JOIN LATERAL (${RUN_SELECT} WHERE s.environment_id = e.id ORDER BY s.number DESC LIMIT 1) l ON true
       LEFT JOIN LATERAL (${RUN_SELECT.replace("a.error", "a.error, a.graph, a.id AS run_id")} WHERE s.environment_id = e.id AND a.status = 'done'
                          ORDER BY s.number DESC LIMIT 1) v ON true
      WHERE e.slug = :slug`,
    { type: QueryTypes.SELECT, replacements: { slug } },
  );
  if (!row) return null;
  const pick = (p: string): RunRow | null =>
    row[`${p}_snapshot_id`]
      ? (Object.fromEntries(
          ["snapshot_id", "number", "created_at", "component_count", "undeclared_count", "status", "progress", "phase", "finished_at", "exact", "sample_size", "error"].map((k) => [k, row[`${p}_${k}`]]),
        ) as unknown as RunRow)
      : null;
  const latest = pick("l");
  const served = pick("v");
  const view: AnalysisView = {
    latest: latest ? toRef(latest) : null,
    latestAnalysis: latest ? toStatus(latest) : { status: "none", progress: 0, phase: null, computedAt: null, exact: null, sampleSize: null, error: null },
    served: served ? toRef(served) : null,
    servedAnalysis: served ? toStatus(served) : null,
    summary: (row.v_graph as Partial<AnalysisSummary> | null) ?? null,
  };
  const version = [row.v_run_id, served?.finished_at?.toISOString(), latest?.snapshot_id, latest?.status, latest?.progress, latest?.phase, row.annotations].join("|");
  return { environment: { id: row.id as string, slug: row.slug as string, name: row.name as string, pinchWeights: row.pinch_weights, settings: row.settings }, view, version };
}

export async function getAnalysisView({ environmentId }: { environmentId: string }): Promise<AnalysisView> {
  const { sequelize } = db();
  const [latest] = await sequelize.query<RunRow>(`${RUN_SELECT} WHERE s.environment_id = :environmentId ORDER BY s.number DESC LIMIT 1`, {
    type: QueryTypes.SELECT,
    replacements: { environmentId },
  });
  const [served] = await sequelize.query<RunRow & { graph: Partial<AnalysisSummary> | null }>(
    `${RUN_SELECT.replace("a.error", "a.error, a.graph")} WHERE s.environment_id = :environmentId AND a.status = 'done' ORDER BY s.number DESC LIMIT 1`,
    { type: QueryTypes.SELECT, replacements: { environmentId } },
  );
  return {
    latest: latest ? toRef(latest) : null,
    latestAnalysis: latest ? toStatus(latest) : { status: "none", progress: 0, phase: null, computedAt: null, exact: null, sampleSize: null, error: null },
    served: served ? toRef(served) : null,
    servedAnalysis: served ? toStatus(served) : null,
    summary: served?.graph ?? null,
  };
}

/** The measure columns of component_metrics, as rows come back from SQL. */
export interface MetricColumns {
  betweenness: number;
  pagerank: number | null;
  eigenvector: number | null;
  clustering: number;
  blast_down: number;
  blast_degraded: number;
  pinch_score: number;
  articulation: boolean;
  in_cycle: boolean;
  single_point: boolean;
  entries_dominated: number | null;
  dominated_all: number | null;
}
export const METRIC_COLUMNS =
  "betweenness, pagerank, eigenvector, clustering, blast_down, blast_degraded, pinch_score, articulation, in_cycle, single_point, entries_dominated, dominated_all";

/** Sort key → the SQL column it orders by (the keys are lib/api/ranking-sorts.ts). */
const RANKING_SORTS: Record<RankingSort, string> = {
  betweenness: "m.betweenness",
  pagerank: "m.pagerank",
  eigenvector: "m.eigenvector",
  clustering: "m.clustering",
  blastDown: "m.blast_down",
  blastDegraded: "m.blast_degraded",
  pinchScore: "m.pinch_score",
  entriesDominated: "m.entries_dominated",
  tier: "m.tier",
  key: "m.key",
  name: "m.name",
  team: "team",
  kind: "m.kind",
  articulation: "m.articulation",
  inCycle: "m.in_cycle",
  rank: "m.rank",
};

/** The stored competition rank and tie count of each ranked measure. */
const RANK_COLUMNS = {
  betweenness: ["m.rank", "m.tied"],
  pagerank: ["m.rank_pagerank", "m.tied_pagerank"],
  eigenvector: ["m.rank_eigenvector", "m.tied_eigenvector"],
  pinchScore: ["m.rank_pinch", "m.tied_pinch"],
  blastDown: ["m.rank_blast", "m.tied_blast"],
} as const;

/** ORDER BY for a sort: ranked measures walk their rank index (ties by key); others by value, then betweenness rank. */
function orderBy(sort: RankingSort, order: "asc" | "desc"): string {
  const measure = rankedMeasureOf(sort);
  if (measure && sort !== "rank") {
    const [rank] = RANK_COLUMNS[measure];
    return `${rank} ${order === "desc" ? "ASC" : "DESC"} NULLS LAST, m.key ASC`;
  }
  return `${RANKING_SORTS[sort]} ${order === "asc" ? "ASC" : "DESC"} NULLS LAST, m.rank ASC, m.key ASC`;
}

export interface RankingItem {
  key: string;
  name: string;
  kind: ComponentKind;
  team: string | null;
  tier: Tier;
  /** competition rank by betweenness: equal values share a rank (1, 2, 2, 4) */
  rank: number;
  /** how many components share that rank (1 = none) */
  tied: number;
  /** rank and ties in the measure the list is ranked by (`rankBy` of the response) */
  position: { rank: number | null; tied: number };
  betweenness: number;
  /** null when PageRank did not converge (the response's analysis block says why) */
  pagerank: number | null;
  /** null when eigenvector centrality did not converge */
  eigenvector: number | null;
  clustering: number;
  blastRadius: { down: number; degraded: number };
  pinchScore: number;
  articulation: boolean;
  inCycle: boolean;
  /** one replica or fewer than two zones: the S of the pinch score, as the analysis saw it */
  singlePoint: boolean;
  /** entry points (tier 1, nothing depends on them) from which every path to something passes through it; null when not computed */
  entriesDominated: number | null;
  /** components that every path from any entry passes through it to reach */
  dominatedAll: number | null;
}

export interface RankingQuery {
  snapshotId: string;
  environmentId: string;
  sort: RankingSort;
  order: "asc" | "desc";
  limit: number;
  offset: number;
  team?: string;
  kind?: string;
  tier?: number;
  q?: string;
}

export async function getRankings(query: RankingQuery): Promise<{ total: number; rankBy: RankingSort; items: RankingItem[] }> {
  const where = ["m.snapshot_id = :snapshotId"];
  const replacements: Record<string, unknown> = { snapshotId: query.snapshotId, environmentId: query.environmentId, limit: query.limit, offset: query.offset };
  if (query.team) {
    where.push("COALESCE(a.owner_team, m.team) = :team");
    replacements.team = query.team;
  }
  if (query.kind) {
    where.push("m.kind = :kind");
    replacements.kind = query.kind;
  }
  if (query.tier) {
    where.push("m.tier = :tier");
    replacements.tier = query.tier;
  }
  if (query.q) {
    where.push("(m.key ILIKE :q OR m.name ILIKE :q)");
    replacements.q = `%${query.q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
  }
  const rankBy = rankedMeasureOf(query.sort) ?? "betweenness";
  const [rankCol, tiedCol] = RANK_COLUMNS[rankBy];
  const from = `FROM component_metrics m
       LEFT JOIN component_annotations a ON a.environment_id = :environmentId AND a.key = m.key
      WHERE ${where.join(" AND ")}`;
  const { sequelize } = db();
  // The page and the count apart: a count window over the whole result would defeat the index walk.
  const [rows, [count]] = await Promise.all([
    sequelize.query<
      MetricColumns & { key: string; name: string; kind: ComponentKind; team: string | null; tier: number; rank: number; tied: number; pos_rank: number | null; pos_tied: number }
    >(
      `SELECT m.key, m.name, m.kind, COALESCE(a.owner_team, m.team) AS team, m.tier, m.rank, m.tied, ${rankCol} AS pos_rank, ${tiedCol} AS pos_tied,
              m.betweenness, m.pagerank, m.eigenvector, m.clustering, m.blast_down, m.blast_degraded, m.pinch_score, m.articulation,
              m.in_cycle, m.single_point, m.entries_dominated, m.dominated_all
         ${from}
        ORDER BY ${orderBy(query.sort, query.order)}
        LIMIT :limit OFFSET :offset`,
      { type: QueryTypes.SELECT, replacements },
    ),
    sequelize.query<{ total: string }>(`SELECT count(*) AS total ${from}`, { type: QueryTypes.SELECT, replacements }),
  ]);
  return {
    total: Number(count?.total ?? 0),
    rankBy: rankBy as RankingSort,
    items: rows.map((r) => ({
      key: r.key,
      name: r.name,
      kind: r.kind,
      team: r.team,
      tier: r.tier as Tier,
      rank: r.rank,
      tied: r.tied,
      position: { rank: r.pos_rank, tied: r.pos_tied },
      betweenness: r.betweenness,
      pagerank: r.pagerank,
      eigenvector: r.eigenvector,
      clustering: r.clustering,
      blastRadius: { down: r.blast_down, degraded: r.blast_degraded },
      pinchScore: r.pinch_score,
      articulation: r.articulation,
      inCycle: r.in_cycle,
      singlePoint: r.single_point,
      entriesDominated: r.entries_dominated,
      dominatedAll: r.dominated_all,
    })),
  };
}

/** Rank of given components over the last `count` analysed snapshots, oldest first (for sparklines). */
export async function getRankHistory({ environmentId, keys, count }: { environmentId: string; keys: string[]; count: number }): Promise<Record<string, Array<{ snapshot: number; rank: number | null }>>> {
  if (!keys.length) return {};
  const rows = await db().sequelize.query<{ number: number; key: string; rank: number }>(
    `WITH recent AS (
       SELECT s.id, s.number FROM snapshots s JOIN analysis_runs a ON a.snapshot_id = s.id AND a.status = 'done'
        WHERE s.environment_id = :environmentId ORDER BY s.number DESC LIMIT :count)
     SELECT r.number, m.key, m.rank FROM recent r JOIN component_metrics m ON m.snapshot_id = r.id AND m.key IN (:keys)
      ORDER BY r.number`,
    { type: QueryTypes.SELECT, replacements: { environmentId, keys, count } },
  );
  const numbers = [...new Set(rows.map((r) => r.number))].sort((a, b) => a - b);
  const out: Record<string, Array<{ snapshot: number; rank: number | null }>> = {};
  for (const key of keys) {
    const byNumber = new Map(rows.filter((r) => r.key === key).map((r) => [r.number, r.rank]));
    out[key] = numbers.map((n) => ({ snapshot: n, rank: byNumber.get(n) ?? null }));
  }
  return out;
}

export interface StoredCycle {
  members: string[];
  /** boot cycles: a suggested start order and the needs to break first */
  startOrder: string[] | null;
  breaks: Array<{ from: string; to: string; strength: Strength }> | null;
  breakCount: number | null;
}

/** Dependency cycles of a snapshot: among runtime needs, or (boot) among all needs of a cold start. */
export async function getCycles({ snapshotId, kind }: { snapshotId: string; kind: "runtime" | "boot" }): Promise<StoredCycle[]> {
  const rows = await db().sequelize.query<{ members: string[]; start_order: string[] | null; breaks: StoredCycle["breaks"]; break_count: number | null }>(
    "SELECT members, start_order, breaks, break_count FROM analysis_cycles WHERE snapshot_id = :snapshotId AND kind = :kind ORDER BY position",
    { type: QueryTypes.SELECT, replacements: { snapshotId, kind } },
  );
  return rows.map((r) => ({ members: r.members, startOrder: r.start_order, breaks: r.breaks, breakCount: r.break_count }));
}

export interface BootOrderView {
  stages: string[][];
  cycles: StoredCycle[];
  waitingOnCycle: string[];
  /** components in each stage with their name, kind, team and tier, for the runbook */
  components: Record<string, { name: string; kind: ComponentKind; team: string | null; tier: Tier }>;
}

/** Cold start from the stored stages and boot cycles (null stage: an analysis from before stages were stored). */
export async function getBootOrder({ snapshotId, environmentId, withComponents = false }: { snapshotId: string; environmentId: string; withComponents?: boolean }): Promise<BootOrderView> {
  const [rows, cycles] = await Promise.all([
    db().sequelize.query<{ key: string; name: string; kind: ComponentKind; team: string | null; tier: number; boot_stage: number | null; waits_on_cycle: boolean }>(
      `SELECT m.key, m.name, m.kind, COALESCE(a.owner_team, m.team) AS team, m.tier, m.boot_stage, m.waits_on_cycle
         FROM component_metrics m LEFT JOIN component_annotations a ON a.environment_id = :environmentId AND a.key = m.key
        WHERE m.snapshot_id = :snapshotId ORDER BY m.boot_stage, m.key`,
      { type: QueryTypes.SELECT, replacements: { snapshotId, environmentId } },
    ),
    getCycles({ snapshotId, kind: "boot" }),
  ]);
  const stages: string[][] = [];
  const components: BootOrderView["components"] = {};
  for (const r of rows) {
    if (r.boot_stage === null) continue;
    (stages[r.boot_stage] ??= []).push(r.key);
    if (withComponents) components[r.key] = { name: r.name, kind: r.kind, team: r.team, tier: r.tier as Tier };
  }
  return { stages: Array.from(stages, (s) => s ?? []), cycles, waitingOnCycle: rows.filter((r) => r.waits_on_cycle).map((r) => r.key), components };
}
