// Pinch score (DESIGN §3): 100 × (w_B·B + w_R·R + w_S·S), B = betweenness ÷ the environment's
// maximum, R = Σ tier weight over the component's down set (itself excluded) ÷ Σ tier weight over
// all components (tier 1: 8, 2: 4, 3: 2, 4: 1), S = 1 when replicas ≤ 1 or fewer than two zones.
import type { CompactGraph } from "./graph";
import { tierWeight } from "./blast-radius";
import { DEFAULT_PINCH_WEIGHTS, type PinchWeights } from "./types";

/** S: a single instance, or everything in one failure domain (common practice). */
export function isSinglePoint(replicas: number, zones: readonly string[]): boolean {
  return replicas <= 1 || new Set(zones).size < 2;
}

export interface PinchTerms {
  b: Float64Array;
  r: Float64Array;
  s: Uint8Array;
  score: Float64Array;
}

export function pinchScores(
  graph: CompactGraph,
  betweenness: Float64Array,
  downTierWeight: Float64Array,
  weights: PinchWeights = DEFAULT_PINCH_WEIGHTS,
): PinchTerms {
  const { n } = graph;
  let maxB = 0;
  for (let v = 0; v < n; v++) if (betweenness[v]! > maxB) maxB = betweenness[v]!;
  let totalWeight = 0;
  for (let v = 0; v < n; v++) totalWeight += tierWeight(graph.tier[v]!);
  const b = new Float64Array(n);
  const r = new Float64Array(n);
  const s = new Uint8Array(n);
  const score = new Float64Array(n);
  for (let v = 0; v < n; v++) {
    b[v] = maxB > 0 ? betweenness[v]! / maxB : 0;
    r[v] = totalWeight > 0 ? downTierWeight[v]! / totalWeight : 0;
    s[v] = isSinglePoint(graph.replicas[v]!, graph.zones[v]!) ? 1 : 0;
    score[v] = 100 * (weights.betweenness * b[v]! + weights.reach * r[v]! + weights.single * s[v]!);
  }
  return { b, r, s, score };
}
