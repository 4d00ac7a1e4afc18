// Boot order: longest-path layering of the condensation's topological order (Tarjan 1972 SCCs,
// then stage(C) = 0 when C needs nothing outside itself, else 1 + max stage of what it needs).
// A dependency cycle cannot cold-start unaided: its members share one stage (they must be brought
// up together, by hand or by breaking the cycle) and are also listed as cycles; components that
// transitively need a cycle are flagged as waiting on it.
//
// For each cycle we also say which needs to break first: an order of its members from the
// Eades–Lin–Smyth heuristic for the minimum feedback arc set ("A fast and effective heuristic for
// the feedback arc set problem", Inf. Process. Lett. 47, 1993) on the needs that block a start
// (hard and start-up-only; a soft need can be met later, the dependent starting degraded), and the
// needs that point the wrong way in that order — each is a dependent that must start before what
// it needs. The heuristic is not always minimal (the problem is NP-hard); it is linear and exact
// when the blocking needs alone have no cycle, in which case only soft needs are listed.
import type { CompactGraph } from "./graph";
import type { SccResult } from "./scc";

interface BootBreak {
  /** The dependent that must start first … */
  from: number;
  /** … without this need. */
  to: number;
  /** 3 = hard, 2 = start-up only, 1 = soft (starts degraded until the need is up). */
  strength: number;
}

interface BootCyclePlan {
  /** Members in a suggested start order. */
  order: number[];
  /** Needs inside the cycle that this order breaks, blocking ones first; at most `maxBreaks`. */
  breaks: BootBreak[];
  /** How many needs the order breaks in all (breaks may be cut short on very large cycles). */
  breakCount: number;
}

export interface BootOrderResult {
  /** Node indices per stage, ascending; stage 0 needs nothing. Every component is in one stage. */
  stages: number[][];
  stageOf: Int32Array;
  /** Dependency cycles (from the SCCs): cannot cold-start unaided. */
  cycles: number[][];
  /** 1 when the node is not in a cycle but needs (transitively) a component that is. */
  waitsOnCycle: Uint8Array;
  /** Aligned with `cycles`: how to break each one. */
  plans: BootCyclePlan[];
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
  const plans = components.cycles.map((members) => breakCycle(graph, members, comp));
  return { stages, stageOf, cycles: components.cycles, waitsOnCycle, plans };
}

const MAX_BREAKS = 200;

/** Eades–Lin–Smyth order over the cycle's blocking needs, read as "need starts before dependent". */
function breakCycle(graph: CompactGraph, members: readonly number[], comp: Int32Array): BootCyclePlan {
  const { offsets, targets } = graph.boot;
  const strength = graph.bootStrength;
  const k = members.length;
  const local = new Map<number, number>();
  members.forEach((v, i) => local.set(v, i));
  const c = comp[members[0]!]!;
  // Arcs need → dependent among members, blocking ones only, as adjacency in both directions.
  const succ: number[][] = Array.from({ length: k }, () => []);
  const pred: number[][] = Array.from({ length: k }, () => []);
  members.forEach((u, i) => {
    for (let e = offsets[u]!; e < offsets[u + 1]!; e++) {
      const v = targets[e]!;
      if (comp[v] !== c || strength[e]! < 2) continue;
      const j = local.get(v)!;
      succ[j]!.push(i);
      pred[i]!.push(j);
    }
  });
  const outDeg = succ.map((x) => x.length);
  const inDeg = pred.map((x) => x.length);
  const alive = new Uint8Array(k).fill(1);
  const front: number[] = [];
  const back: number[] = [];
  const sinks: number[] = [];
  const sources: number[] = [];
  // Max-heap of (δ = out − in, node) with lazy deletion.
  const heap: Array<[number, number]> = [];
  const push = (d: number, i: number): void => {
    heap.push([d, i]);
    for (let x = heap.length - 1; x > 0; ) {
      const p = (x - 1) >> 1;
      if (heap[p]![0] > heap[x]![0] || (heap[p]![0] === heap[x]![0] && heap[p]![1] <= heap[x]![1])) break;
      [heap[p], heap[x]] = [heap[x]!, heap[p]!];
      x = p;
    }
  };
  const pop = (): [number, number] | undefined => {
    const top = heap[0];
    const last = heap.pop();
    if (heap.length && last) {
      heap[0] = last;
      for (let x = 0; ; ) {
        const l = 2 * x + 1;
        const r = l + 1;
        let b = x;
        const better = (a: number, q: number): boolean => heap[a]![0] > heap[q]![0] || (heap[a]![0] === heap[q]![0] && heap[a]![1] < heap[q]![1]);
        if (l < heap.length && better(l, b)) b = l;
        if (r < heap.length && better(r, b)) b = r;
        if (b === x) break;
        [heap[b], heap[x]] = [heap[x]!, heap[b]!];
        x = b;
      }
    }
    return top;
  };
  const note = (i: number): void => {
    if (!alive[i]) return;
    if (outDeg[i] === 0) sinks.push(i);
    else if (inDeg[i] === 0) sources.push(i);
    else push(outDeg[i]! - inDeg[i]!, i);
  };
  const remove = (i: number): void => {
    alive[i] = 0;
    for (const j of succ[i]!) if (alive[j]) {
      inDeg[j]!--;
      note(j);
    }
    for (const j of pred[i]!) if (alive[j]) {
      outDeg[j]!--;
      note(j);
    }
  };
  for (let i = 0; i < k; i++) note(i);
  let left = k;
  while (left > 0) {
    let i: number | undefined;
    if ((i = sinks.pop()) !== undefined) {
      if (!alive[i]) continue;
      back.push(i);
    } else if ((i = sources.pop()) !== undefined) {
      if (!alive[i]) continue;
      front.push(i);
    } else {
      const top = pop();
      if (!top) break;
      i = top[1];
      if (!alive[i] || top[0] !== outDeg[i]! - inDeg[i]!) continue;
      front.push(i);
    }
    remove(i);
    left--;
  }
  const order = [...front, ...back.reverse()].map((i) => members[i]!);
  const pos = new Map<number, number>();
  order.forEach((v, i) => pos.set(v, i));
  const all: BootBreak[] = [];
  for (const u of members) {
    for (let e = offsets[u]!; e < offsets[u + 1]!; e++) {
      const v = targets[e]!;
      if (comp[v] !== c) continue;
      if (pos.get(v)! > pos.get(u)!) all.push({ from: u, to: v, strength: strength[e]! });
    }
  }
  // A component that needs itself can only start once that need is broken.
  if (k === 1 && graph.selfLoop[members[0]!]) all.push({ from: members[0]!, to: members[0]!, strength: 3 });
  all.sort((a, b) => b.strength - a.strength || pos.get(a.from)! - pos.get(b.from)!);
  return { order, breaks: all.slice(0, MAX_BREAKS), breakCount: all.length };
}
