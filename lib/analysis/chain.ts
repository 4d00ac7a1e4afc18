// "Why does A depend on B?": the shortest chain of needs from A to B, found with graphology's
// bidirectional breadth-first search (graphology-shortest-path) on the runtime graph the measures
// use — start-up-only needs are not in it, since they take nothing down. Built once per snapshot
// graph (callers cache it), because building a graphology graph of 20,000 components costs more
// than the search itself.
import { DirectedGraph } from "graphology";
import { bidirectional } from "graphology-shortest-path/unweighted";
import type { CompactGraph } from "./graph";

export function toGraphology(graph: CompactGraph): DirectedGraph {
  const g = new DirectedGraph();
  for (const key of graph.keys) g.addNode(key);
  const { offsets, targets } = graph.out;
  for (let v = 0; v < graph.n; v++) {
    for (let e = offsets[v]!; e < offsets[v + 1]!; e++) g.addDirectedEdge(graph.keys[v]!, graph.keys[targets[e]!]!);
  }
  return g;
}

/** Keys from `from` to `to` along needs, both included; null when `from` does not depend on `to` at all. */
export function needChain(g: DirectedGraph, from: string, to: string): string[] | null {
  if (!g.hasNode(from) || !g.hasNode(to)) return null;
  if (from === to) return [from];
  return bidirectional(g, from, to);
}
