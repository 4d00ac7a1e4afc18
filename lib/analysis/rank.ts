// The order of the pinch-point list (DESIGN §3: "Rankings default to betweenness"): betweenness,
// then pinch score, then key. Stored ranks and the ranks of a change's impact come from this one
// function, so a proposed graph is ranked exactly as the worker would rank it.
import type { NodeMetrics } from "./types";

type Ranked = Pick<NodeMetrics, "key" | "betweenness" | "pinchScore">;

export function rankedByBetweenness<T extends Ranked>(nodes: readonly T[]): T[] {
  return [...nodes].sort((a, b) => b.betweenness - a.betweenness || b.pinchScore - a.pinchScore || a.key.localeCompare(b.key));
}

/** Rank (1 = first) of every key. */
export function ranksByKey(nodes: readonly Ranked[]): Map<string, number> {
  return new Map(rankedByBetweenness(nodes).map((n, i) => [n.key, i + 1]));
}
