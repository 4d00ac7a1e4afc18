// Boot order: longest-path layering of the condensation's topological order (Tarjan 1972 SCCs,
// then stage(C) = 0 when C needs nothing outside itself, else 1 + max stage of what it needs).
// A dependency cycle cannot cold-start unaided: its members share one stage (they must be brought
// up together, by hand or by breaking the cycle) and are also listed as cycles; components that
// transitively need a cycle are flagged as waiting on it.
import type { CompactGraph } from "./graph";
import type { SccResult } from "./scc";

export interface BootOrderResult {
  /** Node indices per stage, ascending; stage 0 needs nothing. Every component is in one stage. */
  stages: number[][];
  stageOf: Int32Array;
  /** Dependency cycles (from the SCCs): cannot cold-start unaided. */
  cycles: number[][];
  /** 1 when the node is not in a cycle but needs (transitively) a component that is. */
  waitsOnCycle: Uint8Array;
}

/** `components` must be the SCCs of `graph.boot` (start-up-only needs order a cold start too). */
export function bootOrder(graph: CompactGraph, components: SccResult): BootOrderResult {
  const { n } = graph;
  const { offsets, targets } = graph.boot;
  const { comp, count, members } = components;
  const stageOfComp = new Int32Array(count);
  const cycleComp = new Uint8Array(count);
  const needsCycle = new Uint8Array(count);
  for (const cyc of components.cycles) cycleComp[comp[cyc[0]!]!] = 1;
  // Tarjan ids are reverse-topological (an edge between components goes from a higher id to a
  // lower one), so ascending id order sees every need before its dependents.
  for (let c = 0; c < count; c++) {
    let stage = 0;
    let waits = 0;
    for (let i = members.offsets[c]!; i < members.offsets[c + 1]!; i++) {
      const u = members.targets[i]!;
      for (let e = offsets[u]!; e < offsets[u + 1]!; e++) {
        const d = comp[targets[e]!]!;
        if (d === c) continue;
        if (stageOfComp[d]! + 1 > stage) stage = stageOfComp[d]! + 1;
        if (cycleComp[d] || needsCycle[d]) waits = 1;
      }
    }
    stageOfComp[c] = stage;
    needsCycle[c] = waits;
  }
  const stageOf = new Int32Array(n);
  const waitsOnCycle = new Uint8Array(n);
  let maxStage = -1;
  for (let v = 0; v < n; v++) {
    const c = comp[v]!;
    stageOf[v] = stageOfComp[c]!;
    if (stageOf[v]! > maxStage) maxStage = stageOf[v]!;
    if (needsCycle[c] && !cycleComp[c]) waitsOnCycle[v] = 1;
  }
  const stages: number[][] = Array.from({ length: maxStage + 1 }, () => []);
  for (let v = 0; v < n; v++) stages[stageOf[v]!]!.push(v);
  return { stages, stageOf, cycles: components.cycles, waitsOnCycle };
}
