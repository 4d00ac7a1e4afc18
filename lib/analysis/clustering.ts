// Local clustering coefficient (Watts & Strogatz, "Collective dynamics of 'small-world' networks",
// Nature 393, 1998): C(v) = links among v's neighbours / (k(k−1)/2) on the undirected simple
// projection; 0 when k < 2.
import type { CompactGraph } from "./graph";

export function clustering(graph: CompactGraph): Float64Array {
  const { n } = graph;
  const { offsets, targets } = graph.undirected;
  const result = new Float64Array(n);
  // mark[w] === v + 1 while w is a neighbour of v: no clearing between nodes.
  const mark = new Int32Array(n);
  for (let v = 0; v < n; v++) {
    const start = offsets[v]!;
    const end = offsets[v + 1]!;
    const k = end - start;
    if (k < 2) continue;
    const stamp = v + 1;
    for (let e = start; e < end; e++) mark[targets[e]!] = stamp;
    let links = 0;
    for (let e = start; e < end; e++) {
      const u = targets[e]!;
      const uEnd = offsets[u + 1]!;
      for (let f = offsets[u]!; f < uEnd; f++) if (mark[targets[f]!] === stamp) links++;
    }
    // Each link among neighbours was seen from both of its ends.
    result[v] = links / (k * (k - 1));
  }
  return result;
}
