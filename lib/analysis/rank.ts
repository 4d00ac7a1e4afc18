// The order of the pinch-point list (DESIGN §3: "Rankings default to betweenness"): betweenness,
// then pinch score, then key. Stored ranks and the ranks of a change's impact come from this one
// function, so a proposed graph is ranked exactly as the worker would rank it.
import type { NodeMetrics } from "./types";

type Ranked = Pick<NodeMetrics, "key" | "betweenness" | "pinchScore">;

/**
 * Values compared at 12 significant digits: two components with the same betweenness can come out
 * of Brandes' accumulation a unit in the last place apart (sums taken in another order), and the
 * ranking must not turn on that noise.
 */
const settle = (x: number): number => (x === 0 ? 0 : Number(x.toPrecision(12)));

export function rankedByBetweenness<T extends Ranked>(nodes: readonly T[]): T[] {
  return nodes
    .map((n) => ({ n, b: settle(n.betweenness), p: settle(n.pinchScore) }))
    .sort((x, y) => y.b - x.b || y.p - x.p || x.n.key.localeCompare(y.n.key))
    .map((x) => x.n);
}

/** Rank (1 = first) of every key. */
export function ranksByKey(nodes: readonly Ranked[]): Map<string, number> {
  return new Map(rankedByBetweenness(nodes).map((n, i) => [n.key, i + 1]));
}
