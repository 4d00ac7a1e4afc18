// The compact graph every measure runs on, built once per snapshot: keys indexed 0..n-1 and
// CSR (compressed sparse row) adjacency in typed arrays, so that the measures on 100k components
// stay within memory and allocate nothing per node. graphology is the convenient graph model
// elsewhere in the app, but its per-call allocation and multi-edge semantics make it the wrong
// base for these measures (graphology-metrics wraps 32-bit path counts and counts parallel edges as separate paths).
import type { AnalysisInput } from "./types";

/** Compressed sparse rows: the neighbours of v are targets[offsets[v] .. offsets[v+1]). */
export interface Csr {
  offsets: Int32Array;
  targets: Int32Array;
}

/**
 * Needs as the blast radius sees them. Every need is a group: a plain need is a group of one,
 * an any_of need a group of its distinct members. A group is unmet when every member is down.
 */
interface NeedIndex {
  count: number;
  owner: Int32Array;
  /** 1 = hard (owner goes down when unmet), 0 = soft (owner degraded). */
  hard: Uint8Array;
  /** Distinct members of each group. */
  size: Int32Array;
  /** group → members */
  members: Csr;
  /** node → groups it is a member of */
  memberOf: Csr;
  /**
   * Aligned with memberOf.targets: the group's owner, and flags (1 = hard, 2 = group of one).
   * Most needs are plain, and reading these sequentially spares the propagation two random
   * lookups per edge (it is memory-bound on 100k components).
   */
  memberOfOwner: Int32Array;
  memberOfFlags: Uint8Array;
  /** How many groups have two or more members (any_of with a real alternative). */
  anyOfCount: number;
}

export interface CompactGraph {
  n: number;
  keys: readonly string[];
  indexOf: ReadonlyMap<string, number>;
  tier: Uint8Array;
  replicas: Int32Array;
  zones: readonly (readonly string[])[];
  team: readonly (string | null)[];
  /**
   * Self-loops are kept out of every adjacency (the measures run on the simple graph, and a
   * self-loop would only inflate PageRank and mislead clustering) but flagged here, because a
   * component that needs itself is a dependency cycle.
   */
  selfLoop: Uint8Array;
  /**
   * Simple directed graph of runtime needs (hard and soft), dependent → need, no self-loops, each
   * pair once, rows sorted. Start-up-only needs are left out: a running component does not fail
   * with a one-shot job, so they are not paths failure travels along (DESIGN §10).
   */
  out: Csr;
  /** Every need, start-up-only ones included: what a cold start must order. `out` itself when there are none. */
  boot: Csr;
  /**
   * Aligned with boot.targets: the strongest need on that pair for a cold start, 3 = hard,
   * 2 = start-up only, 1 = soft (a soft need can be met later: the dependent starts degraded).
   */
  bootStrength: Uint8Array;
  /** The same edges reversed: need → dependents. */
  in: Csr;
  /** Undirected simple projection: u–v when u→v or v→u. */
  undirected: Csr;
  /** Directed edges in `out` (after de-duplication and without self-loops). */
  edgeCount: number;
  /** Keys named by an edge but absent from `nodes`; added with defaults so nothing is lost. */
  implicitKeys: readonly string[];
  needs: NeedIndex;
}

const STRENGTH_CODE = { hard: 3, startup: 2, soft: 1 } as const;

/** Counting-sort pairs into CSR, then sort and de-duplicate each row. */
export function toCsr(n: number, from: Int32Array, to: Int32Array, m: number): Csr {
  const counts = new Int32Array(n + 1);
  for (let e = 0; e < m; e++) counts[from[e]! + 1]!++;
  for (let v = 0; v < n; v++) counts[v + 1]! += counts[v]!;
  const fill = counts.slice(0, n);
  const raw = new Int32Array(m);
  for (let e = 0; e < m; e++) raw[fill[from[e]!]!++] = to[e]!;
  const offsets = new Int32Array(n + 1);
  let w = 0;
  for (let v = 0; v < n; v++) {
    const start = counts[v]!;
    const end = counts[v + 1]!;
    const row = raw.subarray(start, end);
    row.sort();
    offsets[v] = w;
    let last = -1;
    for (let i = 0; i < row.length; i++) {
      const t = row[i]!;
      if (t !== last) raw[w++] = t;
      last = t;
    }
  }
  offsets[n] = w;
  return { offsets, targets: raw.slice(0, w) };
}

function reverseCsr(n: number, g: Csr): Csr {
  const m = g.targets.length;
  const from = new Int32Array(m);
  for (let v = 0; v < n; v++) for (let e = g.offsets[v]!; e < g.offsets[v + 1]!; e++) from[e] = v;
  return toCsr(n, g.targets, from, m);
}

export function buildGraph(input: AnalysisInput): CompactGraph {
  const keys: string[] = [];
  const indexOf = new Map<string, number>();
  for (const node of input.nodes) {
    if (indexOf.has(node.key)) throw new Error(`duplicate component key in analysis input: ${node.key}`);
    indexOf.set(node.key, keys.length);
    keys.push(node.key);
  }
  const implicitKeys: string[] = [];
  const idx = (key: string): number => {
    let i = indexOf.get(key);
    if (i === undefined) {
      i = keys.length;
      indexOf.set(key, i);
      keys.push(key);
      implicitKeys.push(key);
    }
    return i;
  };
  const edges = input.edges;
  const m0 = edges.length;
  const from = new Int32Array(m0);
  const to = new Int32Array(m0);
  for (let e = 0; e < m0; e++) {
    const edge = edges[e]!;
    from[e] = idx(edge.from);
    to[e] = idx(edge.to);
  }
  const n = keys.length;

  const tier = new Uint8Array(n).fill(3);
  const replicas = new Int32Array(n).fill(1);
  const zones: (readonly string[])[] = new Array<readonly string[]>(n).fill([]);
  const team: (string | null)[] = new Array<string | null>(n).fill(null);
  input.nodes.forEach((node, i) => {
    tier[i] = node.tier;
    replicas[i] = node.replicas;
    zones[i] = node.zones;
    team[i] = node.team;
  });

  const selfLoop = new Uint8Array(n);
  const f = new Int32Array(m0);
  const t = new Int32Array(m0);
  const bf = new Int32Array(m0);
  const bt = new Int32Array(m0);
  let m = 0;
  let mb = 0;
  for (let e = 0; e < m0; e++) {
    if (from[e] === to[e]) {
      selfLoop[from[e]!] = 1;
      continue;
    }
    bf[mb] = from[e]!;
    bt[mb++] = to[e]!;
    if (edges[e]!.strength === "startup") continue;
    f[m] = from[e]!;
    t[m] = to[e]!;
    m++;
  }
  const out = toCsr(n, f, t, m);
  const boot = mb === m ? out : toCsr(n, bf, bt, mb);
  const bootStrength = new Uint8Array(boot.targets.length);
  for (let e = 0; e < m0; e++) {
    const u = from[e]!;
    const v = to[e]!;
    if (u === v) continue;
    const code = STRENGTH_CODE[edges[e]!.strength];
    // Rows are sorted: binary search for the pair's slot.
    let lo = boot.offsets[u]!;
    let hi = boot.offsets[u + 1]! - 1;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if (boot.targets[mid]! < v) lo = mid + 1;
      else hi = mid;
    }
    if (code > bootStrength[lo]!) bootStrength[lo] = code;
  }
  const inn = reverseCsr(n, out);
  const um = out.targets.length;
  const uf = new Int32Array(2 * um);
  const ut = new Int32Array(2 * um);
  let k = 0;
  for (let v = 0; v < n; v++) {
    for (let e = out.offsets[v]!; e < out.offsets[v + 1]!; e++) {
      const w = out.targets[e]!;
      uf[k] = v;
      ut[k++] = w;
      uf[k] = w;
      ut[k++] = v;
    }
  }
  const undirected = toCsr(n, uf, ut, k);

  return {
    n,
    keys,
    indexOf,
    tier,
    replicas,
    zones,
    team,
    selfLoop,
    out,
    boot,
    bootStrength,
    in: inn,
    undirected,
    edgeCount: um,
    implicitKeys,
    needs: buildNeeds(input, n, from, to),
  };
}

function buildNeeds(input: AnalysisInput, n: number, from: Int32Array, to: Int32Array): NeedIndex {
  // A repeated plain need on the same pair is one need; hard wins over soft because the
  // stronger declaration is the one an outage would honour.
  const plain = new Map<number, number>();
  const grouped = new Map<string, { owner: number; hard: boolean; members: Set<number>; self: boolean }>();
  const owner: number[] = [];
  const hard: number[] = [];
  const members: number[][] = [];
  input.edges.forEach((edge, e) => {
    // Blast radius and drills ignore start-up-only needs (DESIGN §10).
    if (edge.strength === "startup") return;
    const u = from[e]!;
    const v = to[e]!;
    const isHard = edge.strength === "hard";
    if (edge.group === null) {
      // A component's need on itself can never be what brings it down (it is up until something
      // else takes it down), so it does not enter the propagation.
      if (u === v) return;
      const code = u * n + v;
      const g = plain.get(code);
      if (g === undefined) {
        plain.set(code, owner.length);
        owner.push(u);
        hard.push(isHard ? 1 : 0);
        members.push([v]);
      } else if (isHard) hard[g] = 1;
      return;
    }
    const gk = `${u}\u0000${edge.group}`;
    let grp = grouped.get(gk);
    if (!grp) {
      grp = { owner: u, hard: false, members: new Set(), self: false };
      grouped.set(gk, grp);
    }
    if (isHard) grp.hard = true;
    if (u === v) grp.self = true;
    else grp.members.add(v);
  });
  let anyOfCount = 0;
  for (const grp of grouped.values()) {
    // A group naming its own owner is met while the owner is up, so it can never be unmet.
    if (grp.self || grp.members.size === 0) continue;
    owner.push(grp.owner);
    hard.push(grp.hard ? 1 : 0);
    members.push([...grp.members].sort((a, b) => a - b));
    if (grp.members.size > 1) anyOfCount++;
  }
  const count = owner.length;
  const size = new Int32Array(count);
  let total = 0;
  for (let g = 0; g < count; g++) total += members[g]!.length;
  const gFrom = new Int32Array(total);
  const gTo = new Int32Array(total);
  let k = 0;
  for (let g = 0; g < count; g++) {
    const ms = members[g]!;
    size[g] = ms.length;
    for (const v of ms) {
      gFrom[k] = g;
      gTo[k++] = v;
    }
  }
  const memberCsr = toCsr(count, gFrom, gTo, total);
  const memberOf = reverseCsrSized(count, n, memberCsr);
  const memberOfOwner = new Int32Array(memberOf.targets.length);
  const memberOfFlags = new Uint8Array(memberOf.targets.length);
  for (let e = 0; e < memberOf.targets.length; e++) {
    const grp = memberOf.targets[e]!;
    memberOfOwner[e] = owner[grp]!;
    memberOfFlags[e] = (hard[grp] ? 1 : 0) | (size[grp] === 1 ? 2 : 0);
  }
  return {
    count,
    owner: Int32Array.from(owner),
    hard: Uint8Array.from(hard),
    size,
    members: memberCsr,
    memberOf,
    memberOfOwner,
    memberOfFlags,
    anyOfCount,
  };
}

/** Reverse of a CSR whose rows (count) and targets (n) index different sets. */
function reverseCsrSized(rows: number, n: number, g: Csr): Csr {
  const m = g.targets.length;
  const src = new Int32Array(m);
  for (let r = 0; r < rows; r++) for (let e = g.offsets[r]!; e < g.offsets[r + 1]!; e++) src[e] = r;
  return toCsr(n, g.targets, src, m);
}
