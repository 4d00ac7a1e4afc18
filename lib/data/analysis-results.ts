// Reading stored analysis: which snapshot the rankings come from, its status, and the rankings.
import { QueryTypes } from "sequelize";
import { db } from "@/models";
import type { ComponentKind, Tier } from "@/lib/inventory/types";
import type { RankingSort } from "@/lib/api/ranking-sorts";

export interface AnalysisStatusInfo {
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
  /** graph-level results of the served analysis (cycles, bridges, boot order, …) */
  graph: ServedGraph | null;
}

export interface ServedGraph {
  cycles: string[][];
  bridges: Array<[string, string]>;
  bootOrder: { stages: string[][]; cycles: string[][]; waitingOnCycle: string[] };
  dominatorRoots: string[];
  perNode: Record<string, { bootStage: number; dominator: { reachedFrom: number; dominatesFrom: number; maxDominated: number } }>;
  weights: { betweenness: number; reach: number; single: number };
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

export async function getAnalysisView({ environmentId, withGraph = false }: { environmentId: string; withGraph?: boolean }): Promise<AnalysisView> {
  const { sequelize } = db();
  const [latest] = await sequelize.query<RunRow>(`${RUN_SELECT} WHERE s.environment_id = :environmentId ORDER BY s.number DESC LIMIT 1`, {
    type: QueryTypes.SELECT,
    replacements: { environmentId },
  });
  const [served] = await sequelize.query<RunRow & { graph?: ServedGraph }>(
    `${RUN_SELECT.replace("a.error", withGraph ? "a.error, a.graph" : "a.error")} WHERE s.environment_id = :environmentId AND a.status = 'done' ORDER BY s.number DESC LIMIT 1`,
    { type: QueryTypes.SELECT, replacements: { environmentId } },
  );
  return {
    latest: latest ? toRef(latest) : null,
    latestAnalysis: latest ? toStatus(latest) : { status: "none", progress: 0, phase: null, computedAt: null, exact: null, sampleSize: null, error: null },
    served: served ? toRef(served) : null,
    servedAnalysis: served ? toStatus(served) : null,
    graph: served?.graph ?? null,
  };
}

/** The measure columns of component_metrics, as rows come back from SQL. */
export interface MetricColumns {
  betweenness: number;
  pagerank: number;
  eigenvector: number;
  clustering: number;
  blast_down: number;
  blast_degraded: number;
  pinch_score: number;
  articulation: boolean;
  in_cycle: boolean;
  single_point: boolean;
}
export const METRIC_COLUMNS = "betweenness, pagerank, eigenvector, clustering, blast_down, blast_degraded, pinch_score, articulation, in_cycle, single_point";

/** Sort key → the SQL column it orders by (the keys are lib/api/ranking-sorts.ts). */
export const RANKING_SORTS: Record<RankingSort, string> = {
  betweenness: "m.betweenness",
  pagerank: "m.pagerank",
  eigenvector: "m.eigenvector",
  clustering: "m.clustering",
  blastDown: "m.blast_down",
  blastDegraded: "m.blast_degraded",
  pinchScore: "m.pinch_score",
  tier: "m.tier",
  key: "m.key",
  name: "m.name",
  team: "team",
  kind: "m.kind",
  articulation: "m.articulation",
  inCycle: "m.in_cycle",
  rank: "m.rank",
};

export interface RankingItem {
  key: string;
  name: string;
  kind: ComponentKind;
  team: string | null;
  tier: Tier;
  rank: number;
  betweenness: number;
  pagerank: number;
  eigenvector: number;
  clustering: number;
  blastRadius: { down: number; degraded: number };
  pinchScore: number;
  articulation: boolean;
  inCycle: boolean;
  /** one replica or fewer than two zones: the S of the pinch score, as the analysis saw it */
  singlePoint: boolean;
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

export async function getRankings(query: RankingQuery): Promise<{ total: number; items: RankingItem[] }> {
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
  const column = RANKING_SORTS[query.sort];
  const direction = query.order === "asc" ? "ASC" : "DESC";
  const rows = await db().sequelize.query<
    MetricColumns & {
      key: string;
      name: string;
      kind: ComponentKind;
      team: string | null;
      tier: number;
      rank: number;
      total: string;
    }
  >(
    `SELECT m.key, m.name, m.kind, COALESCE(a.owner_team, m.team) AS team, m.tier, m.rank, m.betweenness, m.pagerank,
            m.eigenvector, m.clustering, m.blast_down, m.blast_degraded, m.pinch_score, m.articulation, m.in_cycle, m.single_point,
            count(*) OVER () AS total
       FROM component_metrics m
       LEFT JOIN component_annotations a ON a.environment_id = :environmentId AND a.key = m.key
      WHERE ${where.join(" AND ")}
      ORDER BY ${column} ${direction} NULLS LAST, m.rank ASC
      LIMIT :limit OFFSET :offset`,
    { type: QueryTypes.SELECT, replacements },
  );
  return {
    total: Number(rows[0]?.total ?? 0),
    items: rows.map((r) => ({
      key: r.key,
      name: r.name,
      kind: r.kind,
      team: r.team,
      tier: r.tier as Tier,
      rank: r.rank,
      betweenness: r.betweenness,
      pagerank: r.pagerank,
      eigenvector: r.eigenvector,
      clustering: r.clustering,
      blastRadius: { down: r.blast_down, degraded: r.blast_degraded },
      pinchScore: r.pinch_score,
      articulation: r.articulation,
      inCycle: r.in_cycle,
      singlePoint: r.single_point,
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
