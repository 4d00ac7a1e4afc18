// A strict order of components (DESIGN §3: "Rankings default to betweenness"): betweenness, then
// pinch score, then key — the positions a change's impact compares. The ranks the worker stores
// and the API serves are competition ranks in which equal values share a rank (DESIGN §10,
// lib/analysis/ranks.ts); both compare values at the same 12 significant digits.
import { significant } from "./ranks";
import type { NodeMetrics } from "./types";

type Ranked = Pick<NodeMetrics, "key" | "betweenness" | "pinchScore">;

/**
 * Values compared at 12 significant digits: two components with the same betweenness can come out
 * of Brandes' accumulation a unit in the last place apart (sums taken in another order), and the
 * ranking must not turn on that noise.
 */
const settle = significant;

function rankedByBetweenness<T extends Ranked>(nodes: readonly T[]): T[] {
  return nodes
    .map((n) => ({ n, b: settle(n.betweenness), p: settle(n.pinchScore) }))
    .sort((x, y) => y.b - x.b || y.p - x.p || x.n.key.localeCompare(y.n.key))
    .map((x) => x.n);
}

/** Rank (1 = first) of every key. */
export function ranksByKey(nodes: readonly Ranked[]): Map<string, number> {
  return new Map(rankedByBetweenness(nodes).map((n, i) => [n.key, i + 1]));
}
