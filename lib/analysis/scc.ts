// Strongly connected components (Tarjan, "Depth-first search and linear graph algorithms",
// SIAM J. Comput. 1, 1972), iterative. A component of size > 1, or a component that needs itself,
// is a dependency cycle.
import type { CompactGraph, Csr } from "./graph";

export interface SccResult {
  /** Component id of each node. Ids are in Tarjan's emission order, a reverse topological order
   * of the condensation: every edge u→v between components has comp[u] > comp[v], so component 0
   * needs nothing outside itself. */
  comp: Int32Array;
  count: number;
  /** Members of each component: members.targets[members.offsets[c] .. offsets[c+1]), ascending. */
  members: { offsets: Int32Array; targets: Int32Array };
  /** 1 when the node is in a dependency cycle (SCC size > 1 or a self-loop). */
  inCycle: Uint8Array;
  /** Cycles as lists of node indices, ascending, ordered by their smallest member. */
  cycles: number[][];
}

/** Over the runtime needs by default; boot order passes `graph.boot` to include start-up-only ones. */
export function scc(graph: CompactGraph, adjacency: Csr = graph.out): SccResult {
  const { n } = graph;
  const { offsets, targets } = adjacency;
  const index = new Int32Array(n).fill(-1);
  const low = new Int32Array(n);
  const onStack = new Uint8Array(n);
  const stack = new Int32Array(n);
  const call = new Int32Array(n);
  const cursor = new Int32Array(n);
  const comp = new Int32Array(n).fill(-1);
  let sp = 0;
  let counter = 0;
  let count = 0;
  for (let s = 0; s < n; s++) {
    if (index[s] !== -1) continue;
    let cp = 0;
    call[0] = s;
    index[s] = low[s] = counter++;
    stack[sp++] = s;
    onStack[s] = 1;
    cursor[s] = offsets[s]!;
    while (cp >= 0) {
      const v = call[cp]!;
      if (cursor[v]! < offsets[v + 1]!) {
        const w = targets[cursor[v]!++]!;
        if (index[w] === -1) {
          index[w] = low[w] = counter++;
          stack[sp++] = w;
          onStack[w] = 1;
          cursor[w] = offsets[w]!;
          call[++cp] = w;
        } else if (onStack[w] && index[w]! < low[v]!) low[v] = index[w]!;
      } else {
        cp--;
        if (low[v] === index[v]) {
          let w: number;
          do {
            w = stack[--sp]!;
            onStack[w] = 0;
            comp[w] = count;
          } while (w !== v);
          count++;
        }
        if (cp >= 0) {
          const u = call[cp]!;
          if (low[v]! < low[u]!) low[u] = low[v]!;
        }
      }
    }
  }
  const mOff = new Int32Array(count + 1);
  for (let v = 0; v < n; v++) mOff[comp[v]! + 1]!++;
  for (let c = 0; c < count; c++) mOff[c + 1]! += mOff[c]!;
  const fill = mOff.slice(0, count);
  const mT = new Int32Array(n);
  for (let v = 0; v < n; v++) mT[fill[comp[v]!]!++] = v;
  const inCycle = new Uint8Array(n);
  const cycles: number[][] = [];
  for (let c = 0; c < count; c++) {
    const start = mOff[c]!;
    const end = mOff[c + 1]!;
    if (end - start > 1 || graph.selfLoop[mT[start]!] === 1) {
      const cyc = Array.from(mT.subarray(start, end));
      for (const v of cyc) inCycle[v] = 1;
      cycles.push(cyc);
    }
  }
  cycles.sort((a, b) => a[0]! - b[0]!);
  return { comp, count, members: { offsets: mOff, targets: mT }, inCycle, cycles };
}
