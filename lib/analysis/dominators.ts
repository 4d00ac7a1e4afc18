// Dominators (Cooper, Harvey & Kennedy, "A Simple, Fast Dominance Algorithm", Rice
// University, 2001): d dominates v from entry r when every dependency path r ⇝ v passes
// through d; idom(v) is the closest strict dominator, found by iterating
// idom(b) = intersect(processed predecessors) in reverse postorder until nothing changes.
// Entries are the tier-1 components nothing depends on. Chosen over Lengauer–Tarjan because it is
// as fast on graphs of this shape and far simpler to get right.
import type { CompactGraph } from "./graph";

export interface DominatorTree {
  root: number;
  /** Nodes reachable from the root, in reverse postorder (root first). */
  nodes: Int32Array;
  /** idom[i] is the immediate dominator of nodes[i] (the root's is itself). */
  idom: Int32Array;
}

export interface DominatorSummary {
  /** Entry components used as roots. */
  roots: number[];
  /** Entries (other than the node itself) that reach the node. */
  reachedFrom: Int32Array;
  /** Entries (other than the node itself) from which the node strictly dominates at least one component. */
  dominatesFrom: Int32Array;
  /** Largest number of components the node strictly dominates from any one other entry. */
  maxDominated: Int32Array;
  /** Dominator trees, one per root, when kept (see `maxTreeEntries`). */
  trees: DominatorTree[] | null;
}

export interface DominatorOptions {
  /** Explicit entries; defaults to tier-1 components with no dependents. */
  roots?: number[];
  /** Keep the trees only while their total size stays within this many entries. */
  maxTreeEntries?: number;
}

/** Tier-1 components that no component depends on: where requests enter the estate. */
export function entryRoots(graph: CompactGraph): number[] {
  const roots: number[] = [];
  for (let v = 0; v < graph.n; v++) {
    if (graph.tier[v] === 1 && graph.in.offsets[v + 1] === graph.in.offsets[v]) roots.push(v);
  }
  return roots;
}

/** Scratch reused across roots; `stamp` marks nodes reached from the current root. */
interface Work {
  stamp: Int32Array;
  epoch: number;
  /** Position of a reached node in reverse postorder. */
  pos: Int32Array;
  cursor: Int32Array;
  stack: Int32Array;
  /** Reached nodes in reverse postorder. */
  order: Int32Array;
  /** Immediate dominator of order[i], as a position. */
  idom: Int32Array;
  predOff: Int32Array;
  preds: Int32Array;
  size: Int32Array;
}

function makeWork(n: number, m: number): Work {
  return {
    stamp: new Int32Array(n),
    epoch: 0,
    pos: new Int32Array(n),
    cursor: new Int32Array(n),
    stack: new Int32Array(n),
    order: new Int32Array(n),
    idom: new Int32Array(n),
    predOff: new Int32Array(n + 1),
    preds: new Int32Array(m),
    size: new Int32Array(n),
  };
}

/**
 * Immediate dominators from one root, in reverse-postorder positions; returns how many nodes
 * were reached. Predecessor lists are rebuilt from the edges the DFS walked, so a hub needed by
 * thousands of components costs only its predecessors that this root actually reaches.
 */
function dominatorsFrom(graph: CompactGraph, root: number, w: Work): number {
  const { n } = graph;
  const { offsets, targets } = graph.out;
  const epoch = ++w.epoch;
  const { stamp, pos, idom, cursor, stack, order, predOff, preds } = w;
  // Iterative DFS; nodes are written into `order` from the back as they finish, which leaves
  // reverse postorder without a pass over all n nodes (there may be thousands of roots).
  let top = 0;
  let post = 0;
  stack[0] = root;
  stamp[root] = epoch;
  cursor[root] = offsets[root]!;
  while (top >= 0) {
    const v = stack[top]!;
    if (cursor[v]! < offsets[v + 1]!) {
      const x = targets[cursor[v]!++]!;
      if (stamp[x] !== epoch) {
        stamp[x] = epoch;
        cursor[x] = offsets[x]!;
        stack[++top] = x;
      }
    } else {
      top--;
      post++;
      order[n - post] = v;
    }
  }
  const reached = post;
  order.copyWithin(0, n - reached, n);
  for (let i = 0; i < reached; i++) pos[order[i]!] = i;
  // Local predecessor CSR over positions, from the out-edges of reached nodes.
  predOff.fill(0, 0, reached + 1);
  for (let i = 0; i < reached; i++) {
    const v = order[i]!;
    for (let e = offsets[v]!; e < offsets[v + 1]!; e++) predOff[pos[targets[e]!]! + 1]!++;
  }
  for (let i = 0; i < reached; i++) predOff[i + 1]! += predOff[i]!;
  for (let i = 0; i < reached; i++) cursor[order[i]!] = predOff[i]!;
  for (let i = 0; i < reached; i++) {
    const v = order[i]!;
    for (let e = offsets[v]!; e < offsets[v + 1]!; e++) {
      const x = targets[e]!;
      preds[cursor[x]!++] = i;
    }
  }
  idom.fill(-1, 0, reached);
  idom[0] = 0;
  let changed = true;
  while (changed) {
    changed = false;
    for (let b = 1; b < reached; b++) {
      let newIdom = -1;
      for (let e = predOff[b]!; e < predOff[b + 1]!; e++) {
        const p = preds[e]!;
        if (idom[p] === -1) continue;
        if (newIdom === -1) {
          newIdom = p;
          continue;
        }
        // Cooper–Harvey–Kennedy "intersect": walk up from the later of the two in RPO.
        let f1 = p;
        let f2 = newIdom;
        while (f1 !== f2) {
          while (f1 > f2) f1 = idom[f1]!;
          while (f2 > f1) f2 = idom[f2]!;
        }
        newIdom = f1;
      }
      if (idom[b] !== newIdom) {
        idom[b] = newIdom;
        changed = true;
      }
    }
  }
  return reached;
}

export function dominatorTree(graph: CompactGraph, root: number): DominatorTree {
  const w = makeWork(graph.n, graph.edgeCount);
  const reached = dominatorsFrom(graph, root, w);
  const nodes = w.order.slice(0, reached);
  const idom = new Int32Array(reached);
  for (let i = 0; i < reached; i++) idom[i] = nodes[w.idom[i]!]!;
  return { root, nodes, idom };
}

export function dominators(graph: CompactGraph, options: DominatorOptions = {}): DominatorSummary {
  const { n } = graph;
  const roots = options.roots ?? entryRoots(graph);
  const maxEntries = options.maxTreeEntries ?? 500_000;
  const reachedFrom = new Int32Array(n);
  const dominatesFrom = new Int32Array(n);
  const maxDominated = new Int32Array(n);
  let trees: DominatorTree[] | null = [];
  let entries = 0;
  const w = makeWork(n, graph.edgeCount);
  for (const root of roots) {
    const reached = dominatorsFrom(graph, root, w);
    const { order, idom, size } = w;
    // Dominator-subtree sizes by position: a node comes after its idom in RPO, so sweep backwards.
    size.fill(1, 0, reached);
    for (let i = reached - 1; i >= 1; i--) size[idom[i]!]! += size[i]!;
    for (let i = 1; i < reached; i++) {
      const v = order[i]!;
      reachedFrom[v]!++;
      const dominated = size[i]! - 1;
      if (dominated > 0) {
        dominatesFrom[v]!++;
        if (dominated > maxDominated[v]!) maxDominated[v] = dominated;
      }
    }
    if (trees) {
      entries += reached;
      if (entries > maxEntries) trees = null;
      else {
        const nodes = order.slice(0, reached);
        const tIdom = new Int32Array(reached);
        for (let i = 0; i < reached; i++) tIdom[i] = nodes[idom[i]!]!;
        trees.push({ root, nodes, idom: tIdom });
      }
    }
  }
  return { roots, reachedFrom, dominatesFrom, maxDominated, trees };
}
