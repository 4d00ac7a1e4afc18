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
  "entriesDominated",
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

/** Text columns read naturally A→Z; measures read biggest first. */
const ASCENDING_FIRST: ReadonlySet<RankingSort> = new Set(["key", "name", "team", "kind", "tier", "rank"]);
export const defaultRankingOrder = (sort: RankingSort): "asc" | "desc" => (ASCENDING_FIRST.has(sort) ? "asc" : "desc");

/** Sorts by a measure that has stored competition ranks; the betweenness rank (`rank`) is one. */
const RANKED: Partial<Record<RankingSort, "betweenness" | "pagerank" | "eigenvector" | "pinchScore" | "blastDown">> = {
  betweenness: "betweenness",
  rank: "betweenness",
  pagerank: "pagerank",
  eigenvector: "eigenvector",
  pinchScore: "pinchScore",
  blastDown: "blastDown",
};
export const rankedMeasureOf = (sort: RankingSort) => RANKED[sort] ?? null;
