// Small builders shared by the analysis tests.
import { buildGraph, type CompactGraph } from "@/lib/analysis/graph";
import type { AnalysisEdge, AnalysisInput, AnalysisNode } from "@/lib/analysis/types";

export type Pair = readonly [string, string];

export function node(key: string, extra: Partial<AnalysisNode> = {}): AnalysisNode {
  return { key, tier: 3, replicas: 1, zones: [], team: null, ...extra };
}

export function hard(from: string, to: string, group: string | null = null): AnalysisEdge {
  return { from, to, strength: "hard", group };
}

export function soft(from: string, to: string, group: string | null = null): AnalysisEdge {
  return { from, to, strength: "soft", group };
}

/** Directed input; nodes are every key named, in order of first appearance, plus `extra`. */
export function directed(pairs: readonly Pair[], extra: readonly string[] = []): AnalysisInput {
  const keys = new Set<string>();
  for (const [a, b] of pairs) {
    keys.add(a);
    keys.add(b);
  }
  for (const k of extra) keys.add(k);
  return { nodes: [...keys].map((k) => node(k)), edges: pairs.map(([a, b]) => hard(a, b)) };
}

/** An undirected graph as the directed graph with both directions of every edge. */
function symmetric(pairs: readonly Pair[]): AnalysisInput {
  return directed(pairs.flatMap(([a, b]) => [[a, b] as const, [b, a] as const]));
}

export function graphOf(pairs: readonly Pair[], undirected = false): CompactGraph {
  return buildGraph(undirected ? symmetric(pairs) : directed(pairs));
}

export function byKey(graph: CompactGraph, values: ArrayLike<number>): Record<string, number> {
  const out: Record<string, number> = {};
  graph.keys.forEach((k, i) => (out[k] = values[i]!));
  return out;
}

export const range = (n: number): number[] => Array.from({ length: n }, (_, i) => i);

export const star = (leaves: number): Pair[] => range(leaves).map((i) => ["hub", `leaf${i}`] as const);
export const path = (n: number): Pair[] => range(n - 1).map((i) => [`p${i}`, `p${i + 1}`] as const);
export const cycle = (n: number): Pair[] => range(n).map((i) => [`c${i}`, `c${(i + 1) % n}`] as const);
export const complete = (n: number): Pair[] =>
  range(n).flatMap((i) => range(n).filter((j) => j > i).map((j) => [`k${i}`, `k${j}`] as const));
