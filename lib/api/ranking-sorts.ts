// The columns a ranking sorts by and which way each reads first. Pure (no server imports), so the
// API, its schema and the pinch-points table share one list.
export const RANKING_SORT_KEYS = [
  "betweenness",
  "pagerank",
  "eigenvector",
  "clustering",
  "blastDown",
  "blastDegraded",
  "pinchScore",
  "tier",
  "key",
  "name",
  "team",
  "kind",
  "articulation",
  "inCycle",
  "rank",
] as const;
export type RankingSort = (typeof RANKING_SORT_KEYS)[number];

export const isRankingSort = (s: string | null): s is RankingSort => (RANKING_SORT_KEYS as readonly string[]).includes(s ?? "");

/** Text columns read naturally A→Z; measures read biggest first. */
const ASCENDING_FIRST: ReadonlySet<RankingSort> = new Set(["key", "name", "team", "kind", "tier", "rank"]);
export const defaultRankingOrder = (sort: RankingSort): "asc" | "desc" => (ASCENDING_FIRST.has(sort) ? "asc" : "desc");
