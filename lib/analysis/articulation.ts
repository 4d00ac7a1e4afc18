// Articulation points and bridges (Hopcroft & Tarjan, "Algorithm 447: efficient algorithms for
// graph manipulation", CACM 16, 1973): depth-first search with low-links on the undirected
// projection; v is a cut vertex when a DFS child c has low(c) ≥ disc(v) (a root: two or more
// children); tree edge (v, c) is a bridge when low(c) > disc(v). Iterative with an explicit stack:
// recursion would overflow the call stack on 100k-component chains.
import type { CompactGraph } from "./graph";

export interface ArticulationResult {
  articulation: Uint8Array;
  /** Bridges as pairs of node indices, smaller index first, sorted. */
  bridges: Array<[number, number]>;
}

export function articulation(graph: CompactGraph): ArticulationResult {
  const { n } = graph;
  const { offsets, targets } = graph.undirected;
  const disc = new Int32Array(n).fill(-1);
  const low = new Int32Array(n);
  const parent = new Int32Array(n).fill(-1);
  const cursor = new Int32Array(n);
  const stack = new Int32Array(n);
  const isCut = new Uint8Array(n);
  const bridges: Array<[number, number]> = [];
  let time = 0;
  for (let root = 0; root < n; root++) {
    if (disc[root] !== -1) continue;
    let top = 0;
    stack[0] = root;
    disc[root] = low[root] = time++;
    cursor[root] = offsets[root]!;
    let rootChildren = 0;
    while (top >= 0) {
      const v = stack[top]!;
      if (cursor[v]! < offsets[v + 1]!) {
        const w = targets[cursor[v]!++]!;
        if (disc[w] === -1) {
          parent[w] = v;
          disc[w] = low[w] = time++;
          cursor[w] = offsets[w]!;
          stack[++top] = w;
          if (v === root) rootChildren++;
        } else if (w !== parent[v] && disc[w]! < low[v]!) {
          // The projection is simple, so skipping the parent vertex skips exactly the tree edge.
          low[v] = disc[w]!;
        }
      } else {
        top--;
        const p = parent[v]!;
        if (p >= 0) {
          if (low[v]! < low[p]!) low[p] = low[v]!;
          if (low[v]! >= disc[p]! && p !== root) isCut[p] = 1;
          if (low[v]! > disc[p]!) bridges.push(p < v ? [p, v] : [v, p]);
        }
      }
    }
    if (rootChildren >= 2) isCut[root] = 1;
  }
  bridges.sort((a, b) => a[0] - b[0] || a[1] - b[1]);
  return { articulation: isCut, bridges };
}
