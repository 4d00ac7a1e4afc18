// Dominators: d dominates v from an entry r when every dependency path r ⇝ v passes through d;
// idom(v) is the closest strict dominator. Computed with the semi-NCA algorithm (Georgiadis,
// Tarjan & Werneck, "Finding dominators in practice", J. Graph Algorithms Appl. 10, 2006): the
// semidominators of Lengauer & Tarjan ("A fast algorithm for finding dominators in a flowgraph",
// ACM TOPLAS 1, 1979) with path compression, then each idom as the nearest common ancestor of the
// DFS parent and the semidominator. One DFS and one pass per entry, which matters when an estate
// has thousands of entries.
//
// Entries are the tier-1 components nothing depends on (where requests come in). Two readings:
//   • per entry: what every path from checkout-web passes through;
//   • all entries together, as a virtual root with an edge to each entry: what every path from
//     any entry passes through (networkx.immediate_dominators on the graph with that root added).
import type { CompactGraph } from "./graph";

export interface DominatorTree {
  root: number;
  /** Nodes reachable from the root, in DFS preorder (root first). */
  nodes: Int32Array;
  /** idom[i] is the immediate dominator of nodes[i] (the root's is itself). */
  idom: Int32Array;
}

interface EntryDominance {
  entry: number;
  /** Components this one strictly dominates from that entry. */
  dominated: number;
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
  /** The entries a node dominates the most from, largest first (at most `topEntries` each). */
  topEntries: EntryDominance[][];
  /** From the virtual root over all entries: the immediate dominator (−1 = the virtual root, or not reached). */
  allIdom: Int32Array;
  /** From the virtual root: components the node strictly dominates (0 when not reached). */
  allDominated: Int32Array;
  /** Whether every entry was analysed (false when the work limit stopped the per-entry trees). */
  complete: boolean;
  entriesAnalysed: number;
}

export interface DominatorOptions {
  /** Explicit entries; defaults to tier-1 components with no dependents. */
  roots?: number[];
  /** Entries kept per node in `topEntries` (default 20). */
  topEntries?: number;
  /** Most node and edge visits spent on per-entry trees before stopping (default 200 million, about 10 s). */
  workLimit?: number;
}

/** Tier-1 components that no component depends on: where requests enter the estate. */
export function entryRoots(graph: CompactGraph): number[] {
  const roots: number[] = [];
  for (let v = 0; v < graph.n; v++) {
    if (graph.tier[v] === 1 && graph.in.offsets[v + 1] === graph.in.offsets[v]) roots.push(v);
  }
  return roots;
}

/** Scratch reused across entries. Index n stands for the virtual root. */
interface Work {
  stamp: Int32Array;
  epoch: number;
  /** Preorder number (1-based) of a reached node. */
  pre: Int32Array;
  /** Node at each preorder number, and its DFS parent (as a preorder number). */
  vertex: Int32Array;
  parent: Int32Array;
  semi: Int32Array;
  label: Int32Array;
  ancestor: Int32Array;
  idom: Int32Array;
  stack: Int32Array;
  cursor: Int32Array;
  predOff: Int32Array;
  preds: Int32Array;
  size: Int32Array;
}

function makeWork(n: number, m: number, extra: number): Work {
  const k = n + 2;
  return {
    stamp: new Int32Array(n + 1),
    epoch: 0,
    pre: new Int32Array(n + 1),
    vertex: new Int32Array(k),
    parent: new Int32Array(k),
    semi: new Int32Array(k),
    label: new Int32Array(k),
    ancestor: new Int32Array(k),
    idom: new Int32Array(k),
    stack: new Int32Array(k),
    cursor: new Int32Array(n + 1),
    predOff: new Int32Array(k + 1),
    preds: new Int32Array(m + extra),
    size: new Int32Array(k),
  };
}

/** graph.out with one more row, n, holding `roots`: the virtual root as an ordinary node. */
function withVirtualRoot(graph: CompactGraph, roots: readonly number[]): { offsets: Int32Array; targets: Int32Array } {
  const { n } = graph;
  const { offsets, targets } = graph.out;
  const m = targets.length;
  const aOff = new Int32Array(n + 2);
  aOff.set(offsets);
  aOff[n + 1] = m + roots.length;
  const aT = new Int32Array(m + roots.length);
  aT.set(targets);
  aT.set(roots, m);
  return { offsets: aOff, targets: aT };
}

/**
 * Immediate dominators from `root` over the adjacency (offsets, targets), in preorder numbers:
 * w.idom[i] for i = 1..count, w.vertex[i] the node. Returns count and the work done.
 */
function dominatorsFrom(offsets: Int32Array, targets: Int32Array, root: number, w: Work): { count: number; work: number } {
  const epoch = ++w.epoch;
  const { stamp, pre, vertex, parent, semi, label, ancestor, idom, stack, cursor, predOff, preds } = w;
  // Iterative DFS in preorder.
  let count = 0;
  let top = 0;
  stack[0] = root;
  stamp[root] = epoch;
  pre[root] = ++count;
  vertex[count] = root;
  parent[count] = 0;
  cursor[root] = offsets[root]!;
  let edges = 0;
  while (top >= 0) {
    const v = stack[top]!;
    const c = cursor[v]!;
    if (c < offsets[v + 1]!) {
      const x = targets[c]!;
      cursor[v] = c + 1;
      if (stamp[x] !== epoch) {
        stamp[x] = epoch;
        pre[x] = ++count;
        vertex[count] = x;
        parent[count] = pre[v]!;
        cursor[x] = offsets[x]!;
        stack[++top] = x;
      }
    } else top--;
  }
  // Predecessors among reached nodes, over preorder numbers, from the out-edges of reached nodes
  // (so a hub with thousands of dependents costs only those this entry reaches).
  predOff.fill(0, 0, count + 2);
  for (let i = 1; i <= count; i++) {
    const v = vertex[i]!;
    const end = offsets[v + 1]!;
    for (let e = offsets[v]!; e < end; e++) predOff[pre[targets[e]!]! + 1]!++;
    edges += end - offsets[v]!;
  }
  for (let i = 1; i <= count + 1; i++) predOff[i]! += predOff[i - 1]!;
  const fill = w.size;
  for (let i = 1; i <= count; i++) fill[i] = predOff[i]!;
  for (let i = 1; i <= count; i++) {
    const v = vertex[i]!;
    const end = offsets[v + 1]!;
    for (let e = offsets[v]!; e < end; e++) preds[fill[pre[targets[e]!]!]!++] = i;
  }
  for (let i = 1; i <= count; i++) {
    semi[i] = i;
    label[i] = i;
    ancestor[i] = 0;
  }
  // Semidominators in reverse preorder, with path compression over the linked forest.
  for (let i = count; i >= 2; i--) {
    let s = semi[i]!;
    const end = predOff[i + 1]!;
    for (let e = predOff[i]!; e < end; e++) {
      const j = preds[e]!;
      let x = j;
      if (ancestor[j] !== 0) {
        // compress(j): walk to just below the forest root, then relabel on the way back.
        let sp = 0;
        for (let a = j; ancestor[ancestor[a]!] !== 0; a = ancestor[a]!) stack[sp++] = a;
        while (sp > 0) {
          const a = stack[--sp]!;
          const anc = ancestor[a]!;
          if (semi[label[anc]!]! < semi[label[a]!]!) label[a] = label[anc]!;
          ancestor[a] = ancestor[anc]!;
        }
        x = label[j]!;
      }
      if (semi[x]! < s) s = semi[x]!;
    }
    semi[i] = s;
    ancestor[i] = parent[i]!;
  }
  // NCA: walk up from the DFS parent until at or above the semidominator.
  idom[1] = 1;
  for (let i = 2; i <= count; i++) {
    let d = parent[i]!;
    const s = semi[i]!;
    while (d > s) d = idom[d]!;
    idom[i] = d;
  }
  return { count, work: count + 2 * edges };
}

/** The dominator tree from one entry (for tests and on-demand views). */
export function dominatorTree(graph: CompactGraph, root: number): DominatorTree {
  const w = makeWork(graph.n, graph.edgeCount, 0);
  const { count } = dominatorsFrom(graph.out.offsets, graph.out.targets, root, w);
  const nodes = new Int32Array(count);
  const idom = new Int32Array(count);
  for (let i = 1; i <= count; i++) {
    nodes[i - 1] = w.vertex[i]!;
    idom[i - 1] = w.vertex[w.idom[i]!]!;
  }
  return { root, nodes, idom };
}

export function dominators(graph: CompactGraph, options: DominatorOptions = {}): DominatorSummary {
  const { n } = graph;
  const roots = options.roots ?? entryRoots(graph);
  const keep = Math.max(0, options.topEntries ?? 20);
  const limit = options.workLimit ?? 200_000_000;
  const reachedFrom = new Int32Array(n);
  const dominatesFrom = new Int32Array(n);
  const maxDominated = new Int32Array(n);
  // The short lists, flat: node v's entries are topEntry[v*keep .. v*keep + topCount[v]), largest first.
  const topEntry = new Int32Array(n * keep);
  const topDom = new Int32Array(n * keep);
  const topCount = new Uint8Array(n);
  const w = makeWork(n, graph.edgeCount, roots.length);
  const aug = withVirtualRoot(graph, roots);
  const { size, vertex, idom } = w;
  let spent = 0;
  let analysed = 0;
  for (const root of roots) {
    if (spent > limit) break;
    const { count, work } = dominatorsFrom(aug.offsets, aug.targets, root, w);
    spent += work;
    analysed++;
    // Strictly dominated counts: an idom precedes its children in preorder, so sweep backwards.
    size.fill(1, 1, count + 1);
    for (let i = count; i >= 2; i--) size[idom[i]!]! += size[i]!;
    for (let i = 2; i <= count; i++) {
      const v = vertex[i]!;
      reachedFrom[v]!++;
      const dominated = size[i]! - 1;
      if (dominated === 0) continue;
      dominatesFrom[v]!++;
      if (dominated > maxDominated[v]!) maxDominated[v] = dominated;
      if (keep === 0) continue;
      const base = v * keep;
      let k = topCount[v]!;
      if (k < keep) topCount[v] = k + 1;
      else if (dominated > topDom[base + k - 1]!) k--;
      else continue;
      // Insert in order (the list is at most `keep` long).
      while (k > 0 && topDom[base + k - 1]! < dominated) {
        topDom[base + k] = topDom[base + k - 1]!;
        topEntry[base + k] = topEntry[base + k - 1]!;
        k--;
      }
      topDom[base + k] = dominated;
      topEntry[base + k] = root;
    }
  }
  const allIdom = new Int32Array(n).fill(-1);
  const allDominated = new Int32Array(n);
  if (roots.length > 0) {
    const { count } = dominatorsFrom(aug.offsets, aug.targets, n, w);
    size.fill(1, 1, count + 1);
    for (let i = count; i >= 2; i--) size[idom[i]!]! += size[i]!;
    for (let i = 2; i <= count; i++) {
      const v = vertex[i]!;
      const d = vertex[idom[i]!]!;
      allIdom[v] = d === n ? -1 : d;
      allDominated[v] = size[i]! - 1;
    }
  }
  const topEntries: EntryDominance[][] = Array.from({ length: n }, (_, v) =>
    Array.from({ length: topCount[v]! }, (_, i) => ({ entry: topEntry[v * keep + i]!, dominated: topDom[v * keep + i]! })),
  );
  return { roots, reachedFrom, dominatesFrom, maxDominated, topEntries, allIdom, allDominated, complete: analysed === roots.length, entriesAnalysed: analysed };
}

/**
 * What every path from `root` passes through: the components that strictly dominate at least one
 * other from it, with how many each dominates, most first; and how many components the root reaches.
 */
export function passesThrough(graph: CompactGraph, root: number): { reached: number; through: EntryDominanceOf[] } {
  const t = dominatorTree(graph, root);
  const pos = new Map<number, number>();
  t.nodes.forEach((v, i) => pos.set(v, i));
  const size = new Int32Array(t.nodes.length).fill(1);
  // Preorder: an idom comes before the nodes it dominates.
  for (let i = t.nodes.length - 1; i >= 1; i--) size[pos.get(t.idom[i]!)!]! += size[i]!;
  const through: EntryDominanceOf[] = [];
  for (let i = 1; i < t.nodes.length; i++) if (size[i]! > 1) through.push({ node: t.nodes[i]!, dominated: size[i]! - 1 });
  through.sort((a, b) => b.dominated - a.dominated || a.node - b.node);
  return { reached: t.nodes.length - 1, through };
}

export interface EntryDominanceOf {
  node: number;
  dominated: number;
}
