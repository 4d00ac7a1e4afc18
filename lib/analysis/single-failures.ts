// The blast radius of every component failing alone (DESIGN §3), for the rankings: for each source
// s, how many components are down (itself excluded), their tier weight (the R term of the pinch
// score), and how many are degraded. Exactly the rule of blast-radius.ts — down is the least fixed
// point of "some hard need unmet", a need (plain, or an any_of group) unmet when every member is
// down; degraded when not down and a soft need is unmet — but for many sources at once.
//
// Running the propagation once per source costs Σ_s |down(s)| × degree, which is quadratic on
// deep estates (a 40,000-component chain took 17 s). Here sources are bit lanes: a block of 32·W
// lanes is propagated together, one machine word per 32 lanes, so each component's state is a row
// of W words ("down for these sources"):
//   row(v) = lane(v) | ⋁_{hard needs g of v} ⋀_{u ∈ g} row(u)
// A plain need is a group of one and an any_of group the AND of its members, which keeps the exact
// rule. Rows are evaluated along the condensation of the hard-need graph (Tarjan 1972), needs
// first, so one pass settles everything outside a cycle; inside a cycle that an any_of group is
// part of, rows are iterated with a worklist to the least fixed point (monotone, so it is reached
// from below).
//
// Where the work goes away:
//   • Bitsets over strongly connected parts: the members of a part held together by plain hard
//     needs take each other down, so they have one blast radius and share one lane and one row
//     (a 5,000-component dependency cycle is one lane, not 5,000).
//   • A component whose row is another's (one contributing need and no lane of its own: chains,
//     most of a deep estate) shares that row, and rows are counted once per distinct row, times
//     the number of components holding it (bit-sliced counters for dense words).
//   • Only components reached from the block's lanes are evaluated, and only the words a row uses
//     are touched. Blocks follow the topological order, so a block's sources sit close together.
// On a chain the whole run is linear in n per block; on estates with hubs it is bounded by
// n·m/32 word operations. The per-source propagation stays in blast-radius.ts as the reference the
// tests compare this with.
import { singleFailureBlastByPropagation, tierWeight } from "./blast-radius";
import { toCsr, type CompactGraph } from "./graph";
import { scc } from "./scc";

export interface SingleFailureBlast {
  /** Components down when this one alone fails, itself excluded. */
  down: Int32Array;
  /** Components degraded (and not down) when this one alone fails. */
  degraded: Int32Array;
  /** Σ tier weight over the down set, itself excluded (the R term of the pinch score). */
  downTierWeight: Float64Array;
}

export interface SingleFailureOptions {
  /** Words per row (32 lanes each); default 32, fewer on small graphs. */
  words?: number;
  /** Use the per-source propagation when a probe estimates it below this (default 150 ms). */
  propagationBudgetMs?: number;
  onProgress?: (fraction: number) => void;
}

/** Bit planes for counting many lanes at once: enough for counts below 2^PLANES. */
const PLANES = 40;

/**
 * Chooses between the two exact methods: the per-source propagation is the cheaper one on shallow
 * estates (few components behind each), the lanes on deep ones. A probe of evenly spread sources
 * estimates the propagation's total time; the answer is the same either way.
 */
export function singleFailureBlast(graph: CompactGraph, options: SingleFailureOptions | ((f: number) => void) = {}): SingleFailureBlast {
  const opts = typeof options === "function" ? { onProgress: options } : options;
  const { n } = graph;
  const probeCount = Math.min(n, 64);
  const probe = new Int32Array(probeCount);
  for (let i = 0; i < probeCount; i++) probe[i] = Math.floor((i * n) / probeCount);
  const t0 = performance.now();
  singleFailureBlastByPropagation(graph, { sources: probe });
  const estimateMs = ((performance.now() - t0) * n) / Math.max(1, probeCount);
  if (estimateMs <= (opts.propagationBudgetMs ?? 150)) return singleFailureBlastByPropagation(graph, { onProgress: opts.onProgress });
  return singleFailureBlastByLanes(graph, opts);
}

export function singleFailureBlastByLanes(graph: CompactGraph, options: SingleFailureOptions = {}): SingleFailureBlast {
  const opts = options;
  const { n, needs } = graph;
  const down = new Int32Array(n);
  const degraded = new Int32Array(n);
  const downTierWeight = new Float64Array(n);
  if (n === 0) return { down, degraded, downTierWeight };
  const weight = new Int32Array(n);
  for (let v = 0; v < n; v++) weight[v] = tierWeight(graph.tier[v]!);

  const byOwner = toCsr(n, needs.owner, Int32Array.from({ length: needs.count }, (_, g) => g), needs.count);
  const { members, size, hard, memberOf, memberOfOwner, memberOfFlags } = needs;
  // The hard-need graph owner → member (every hard group), and its plain part (groups of one).
  const hardEdges = (plainOnly: boolean) => {
    const from: number[] = [];
    const to: number[] = [];
    for (let g = 0; g < needs.count; g++) {
      if (!hard[g] || (plainOnly && size[g]! > 1)) continue;
      for (let e = members.offsets[g]!; e < members.offsets[g + 1]!; e++) {
        from.push(needs.owner[g]!);
        to.push(members.targets[e]!);
      }
    }
    return toCsr(n, Int32Array.from(from), Int32Array.from(to), from.length);
  };
  // Tarjan ids ascend from needs to dependents: the evaluation order.
  const hc = scc(graph, hardEdges(false));
  const pc = scc(graph, hardEdges(true));
  // Units (lanes) are the parts of the plain hard graph; each lies inside one part of the whole
  // hard graph. Sorted by that part, then by their own id.
  const unitIds = Array.from({ length: pc.count }, (_, p) => p);
  const hOfP = new Int32Array(pc.count);
  for (let p = 0; p < pc.count; p++) hOfP[p] = hc.comp[pc.members.targets[pc.members.offsets[p]!]!]!;
  unitIds.sort((a, b) => hOfP[a]! - hOfP[b]! || a - b);
  const units = pc.count;
  const unitOfP = new Int32Array(pc.count);
  unitIds.forEach((p, u) => (unitOfP[p] = u));
  const unitOf = new Int32Array(n);
  for (let v = 0; v < n; v++) unitOf[v] = unitOfP[pc.comp[v]!]!;
  const unitMembers = (u: number): Int32Array => {
    const p = unitIds[u]!;
    return pc.members.targets.subarray(pc.members.offsets[p]!, pc.members.offsets[p + 1]!);
  };
  const hOfUnit = (u: number): number => hOfP[unitIds[u]!]!;
  // Units of each hard part: a contiguous range.
  const hUnits = new Int32Array(hc.count + 1);
  for (let u = 0; u < units; u++) hUnits[hOfUnit(u) + 1]!++;
  for (let h = 0; h < hc.count; h++) hUnits[h + 1]! += hUnits[h]!;
  // A hard part needs the fixed-point iteration when an any_of group lies inside it (owner and a
  // member both in it); otherwise it is one unit, settled in one pass.
  const iterate = new Uint8Array(hc.count);
  for (let g = 0; g < needs.count; g++) {
    if (!hard[g] || size[g]! < 2) continue;
    const h = hc.comp[needs.owner[g]!]!;
    for (let e = members.offsets[g]!; e < members.offsets[g + 1]!; e++) if (hc.comp[members.targets[e]!] === h) iterate[h] = 1;
  }

  const W = Math.max(1, Math.min(opts.words ?? 32, Math.ceil(units / 32)));
  const K = 32 * W;

  // Row pool, reset per block. A row is W words of which only [rowLo, rowHi) are meaningful (the
  // rest is zero by definition): rows of later blocks are mostly a few bits. rowOf[v] = −1 means
  // "down for no source in the block".
  let capacity = Math.min(n, 4096) + 64;
  let pool = new Int32Array(capacity * W);
  let rowLo = new Int32Array(capacity);
  let rowHi = new Int32Array(capacity);
  let multiplicity = new Int32Array(capacity);
  let weightOf = new Int32Array(capacity);
  let used = 0;
  const rowOf = new Int32Array(n).fill(-1);
  const holders = new Int32Array(n);
  let held = 0;
  const pending = new Uint8Array(hc.count);
  const softPending = new Uint8Array(n);
  const softList = new Int32Array(n);
  let softCount = 0;
  const tmp = new Int32Array(W);
  let tmpLo = 0;
  let tmpHi = 0;
  const soft = new Int32Array(W);
  // Per lane: sparse words are added bit by bit, dense ones into bit planes (carry-save counters).
  const laneDown = new Float64Array(K);
  const laneWeight = new Float64Array(K);
  const laneDegraded = new Float64Array(K);
  const planesDown = new Int32Array(PLANES * W);
  const planesWeight = new Int32Array(PLANES * W);

  const grow = <T extends Int32Array>(a: T, length: number): T => {
    const b = new Int32Array(length) as T;
    b.set(a);
    return b;
  };
  const newRow = (): number => {
    if (used === capacity) {
      capacity *= 2;
      pool = grow(pool, capacity * W);
      rowLo = grow(rowLo, capacity);
      rowHi = grow(rowHi, capacity);
      multiplicity = grow(multiplicity, capacity);
      weightOf = grow(weightOf, capacity);
    }
    rowLo[used] = W;
    rowHi[used] = 0;
    return used++;
  };
  /** Widens row r's range to cover [lo, hi), zeroing the words it newly covers. */
  const widen = (r: number, lo: number, hi: number): void => {
    const base = r * W;
    const a = rowLo[r]!;
    const b = rowHi[r]!;
    if (a >= b) {
      pool.fill(0, base + lo, base + hi);
      rowLo[r] = lo;
      rowHi[r] = hi;
      return;
    }
    if (lo < a) {
      pool.fill(0, base + lo, base + a);
      rowLo[r] = lo;
    }
    if (hi > b) {
      pool.fill(0, base + b, base + hi);
      rowHi[r] = hi;
    }
  };
  /** row r |= row s; whether r changed. */
  const orRow = (r: number, s: number): boolean => {
    const lo = rowLo[s]!;
    const hi = rowHi[s]!;
    if (lo >= hi) return false;
    widen(r, lo, hi);
    const rb = r * W;
    const sb = s * W;
    let changed = false;
    for (let w = lo; w < hi; w++) {
      const x = pool[rb + w]!;
      const y = x | pool[sb + w]!;
      if (y !== x) {
        pool[rb + w] = y;
        changed = true;
      }
    }
    return changed;
  };
  const orTmp = (r: number): boolean => {
    widen(r, tmpLo, tmpHi);
    const rb = r * W;
    let changed = false;
    for (let w = tmpLo; w < tmpHi; w++) {
      const x = pool[rb + w]!;
      const y = x | tmp[w]!;
      if (y !== x) {
        pool[rb + w] = y;
        changed = true;
      }
    }
    return changed;
  };
  const copyOf = (s: number): number => {
    const r = newRow();
    orRow(r, s);
    return r;
  };
  const setLane = (r: number, lane: number): boolean => {
    const w = lane >>> 5;
    const empty = rowLo[r]! >= rowHi[r]!;
    widen(r, empty ? w : Math.min(w, rowLo[r]!), empty ? w + 1 : Math.max(w + 1, rowHi[r]!));
    const bit = 1 << (lane & 31);
    const x = pool[r * W + w]!;
    pool[r * W + w] = x | bit;
    return (x & bit) === 0;
  };

  /** AND over the members of group g into tmp; false when empty (a member down for no lane empties it). */
  const groupRow = (g: number): boolean => {
    const start = members.offsets[g]!;
    const end = members.offsets[g + 1]!;
    let lo = 0;
    let hi = W;
    for (let e = start; e < end; e++) {
      const r = rowOf[members.targets[e]!]!;
      if (r < 0) return false;
      if (rowLo[r]! > lo) lo = rowLo[r]!;
      if (rowHi[r]! < hi) hi = rowHi[r]!;
      if (lo >= hi) return false;
    }
    const first = rowOf[members.targets[start]!]! * W;
    for (let w = lo; w < hi; w++) tmp[w] = pool[first + w]!;
    for (let e = start + 1; e < end; e++) {
      const r = rowOf[members.targets[e]!]! * W;
      for (let w = lo; w < hi; w++) tmp[w]! &= pool[r + w]!;
    }
    while (lo < hi && tmp[lo] === 0) lo++;
    while (hi > lo && tmp[hi - 1] === 0) hi--;
    tmpLo = lo;
    tmpHi = hi;
    return lo < hi;
  };

  /**
   * What v's hard groups make of it, ORed into `into` when given (returning whether it grew);
   * otherwise a row of its own: a shared one when a single plain need decides, a new one, or −1.
   */
  const evaluate = (v: number, into: number): number => {
    let single = -1;
    let row = into;
    let grew = false;
    for (let e = byOwner.offsets[v]!; e < byOwner.offsets[v + 1]!; e++) {
      const g = byOwner.targets[e]!;
      if (!hard[g]) continue;
      if (size[g] === 1) {
        const src = rowOf[members.targets[members.offsets[g]!]!]!;
        if (src < 0 || src === single || src === row) continue;
        if (row < 0 && single < 0) {
          single = src;
          continue;
        }
        if (row < 0) row = copyOf(single);
        if (orRow(row, src)) grew = true;
      } else {
        if (!groupRow(g)) continue;
        if (row < 0) row = single >= 0 ? copyOf(single) : newRow();
        if (orTmp(row)) grew = true;
      }
    }
    if (into >= 0) return grew ? 1 : 0;
    return row >= 0 ? row : single;
  };

  /** v now holds row r (or none): remember it and wake the parts that need v. */
  const assign = (v: number, r: number): void => {
    rowOf[v] = r;
    if (r < 0) return;
    holders[held++] = v;
    for (let e = memberOf.offsets[v]!; e < memberOf.offsets[v + 1]!; e++) {
      const o = memberOfOwner[e]!;
      if (memberOfFlags[e]! & 1) pending[hc.comp[o]!] = 1;
      else if (!softPending[o]) {
        softPending[o] = 1;
        softList[softCount++] = o;
      }
    }
  };

  /** Adds `value` × the words of a row to bit-plane counters (ripple carry, plane by plane). */
  const addPlanes = (planes: Int32Array, base: number, lo: number, hi: number, value: number): void => {
    for (let j = 0; value > 0; j++, value = Math.floor(value / 2)) {
      if (value % 2 === 0) continue;
      for (let w = lo; w < hi; w++) {
        let carry = pool[base + w]!;
        for (let p = j; carry !== 0; p++) {
          const i = p * W + w;
          const t = planes[i]! & carry;
          planes[i]! ^= carry;
          carry = t;
        }
      }
    }
  };

  const queue: number[] = [];
  const inQueue = new Uint8Array(units);
  const blocks = Math.ceil(units / K);
  for (let b = 0; b < blocks; b++) {
    const lo = b * K;
    const hi = Math.min(units, lo + K);
    for (let u = lo; u < hi; u++) pending[hOfUnit(u)] = 1;
    // Parts before the block's first one only need things before it: none can be down.
    for (let h = hOfUnit(lo); h < hc.count; h++) {
      if (!pending[h]) continue;
      const u0 = hUnits[h]!;
      const u1 = hUnits[h + 1]!;
      if (!iterate[h]) {
        // One unit: a single component, or a part held together by plain hard needs (every member
        // down when any is).
        const mem = unitMembers(u0);
        const lane = u0 >= lo && u0 < hi ? u0 - lo : -1;
        if (mem.length === 1 && lane < 0) assign(mem[0]!, evaluate(mem[0]!, -1));
        else {
          const row = newRow();
          for (const v of mem) evaluate(v, row);
          if (lane >= 0) setLane(row, lane);
          const shared = rowLo[row]! < rowHi[row]! ? row : -1;
          for (const v of mem) assign(v, shared);
        }
        pending[h] = 0; // its members woke it again through the needs inside it
        continue;
      }
      // An any_of group inside the part: each unit keeps a row of its own, and a unit whose row
      // grew wakes the units that need it, until nothing grows (the least fixed point).
      for (let u = u0; u < u1; u++) {
        const row = newRow();
        if (u >= lo && u < hi) setLane(row, u - lo);
        for (const v of unitMembers(u)) rowOf[v] = row;
        queue.push(u);
        inQueue[u] = 1;
      }
      while (queue.length) {
        const u = queue.pop()!;
        inQueue[u] = 0;
        const mem = unitMembers(u);
        const row = rowOf[mem[0]!]!;
        let grew = false;
        for (const v of mem) {
          const mark = used;
          if (evaluate(v, row) === 1) grew = true;
          used = mark; // scratch rows of the evaluation are not kept
        }
        if (!grew) continue;
        for (const v of mem) {
          for (let e = memberOf.offsets[v]!; e < memberOf.offsets[v + 1]!; e++) {
            if (!(memberOfFlags[e]! & 1)) continue;
            const o = memberOfOwner[e]!;
            const ou = unitOf[o]!;
            if (hc.comp[o] === h && !inQueue[ou]) {
              inQueue[ou] = 1;
              queue.push(ou);
            }
          }
        }
      }
      for (let u = u0; u < u1; u++) {
        const mem = unitMembers(u);
        const row = rowOf[mem[0]!]!;
        const r = rowLo[row]! < rowHi[row]! ? row : -1;
        for (const v of mem) {
          rowOf[v] = -1;
          assign(v, r);
        }
      }
      pending[h] = 0;
    }

    // Count: each distinct row once, with how many components hold it and their tier weight.
    multiplicity.fill(0, 0, used);
    weightOf.fill(0, 0, used);
    for (let i = 0; i < held; i++) {
      const v = holders[i]!;
      const r = rowOf[v]!;
      multiplicity[r]! += 1;
      weightOf[r]! += weight[v]!;
    }
    laneDown.fill(0);
    laneWeight.fill(0);
    laneDegraded.fill(0);
    planesDown.fill(0);
    planesWeight.fill(0);
    for (let r = 0; r < used; r++) {
      const m = multiplicity[r]!;
      if (m === 0) continue;
      const wt = weightOf[r]!;
      const base = r * W;
      const rLo = rowLo[r]!;
      const rHi = rowHi[r]!;
      // A row with words of many bits goes to the planes (a few word operations per word);
      // a sparse one bit by bit.
      let dense = 0;
      for (let w = rLo; w < rHi && dense < 8; w++) {
        const x = pool[base + w]!;
        if (x !== 0 && (x & (x - 1)) !== 0 && ((x & (x - 1)) & ((x & (x - 1)) - 1)) !== 0) dense++;
      }
      if (dense >= 2) {
        addPlanes(planesDown, base, rLo, rHi, m);
        addPlanes(planesWeight, base, rLo, rHi, wt);
        continue;
      }
      for (let w = rLo; w < rHi; w++) {
        let x = pool[base + w]!;
        while (x !== 0) {
          const lane = (w << 5) | (31 - Math.clz32(x & -x));
          x &= x - 1;
          laneDown[lane]! += m;
          laneWeight[lane]! += wt;
        }
      }
    }
    for (let p = 0; p < PLANES; p++) {
      const scale = 2 ** p;
      for (let w = 0; w < W; w++) {
        let x = planesDown[p * W + w]!;
        while (x !== 0) {
          laneDown[(w << 5) | (31 - Math.clz32(x & -x))]! += scale;
          x &= x - 1;
        }
        x = planesWeight[p * W + w]!;
        while (x !== 0) {
          laneWeight[(w << 5) | (31 - Math.clz32(x & -x))]! += scale;
          x &= x - 1;
        }
      }
    }
    // Degraded: not down, and some soft need (plain or group) unmet.
    for (let i = 0; i < softCount; i++) {
      const v = softList[i]!;
      softPending[v] = 0;
      let sLo = W;
      let sHi = 0;
      for (let e = byOwner.offsets[v]!; e < byOwner.offsets[v + 1]!; e++) {
        const g = byOwner.targets[e]!;
        if (hard[g] || !groupRow(g)) continue;
        if (sLo >= sHi) {
          for (let w = tmpLo; w < tmpHi; w++) soft[w] = tmp[w]!;
          sLo = tmpLo;
          sHi = tmpHi;
          continue;
        }
        for (let w = tmpLo; w < sLo; w++) soft[w] = 0;
        for (let w = sHi; w < tmpHi; w++) soft[w] = 0;
        if (tmpLo < sLo) sLo = tmpLo;
        if (tmpHi > sHi) sHi = tmpHi;
        for (let w = tmpLo; w < tmpHi; w++) soft[w]! |= tmp[w]!;
      }
      if (sLo >= sHi) continue;
      const r = rowOf[v]!;
      const rb = r * W;
      const dLo = r >= 0 ? rowLo[r]! : W;
      const dHi = r >= 0 ? rowHi[r]! : 0;
      for (let w = sLo; w < sHi; w++) {
        let x = w >= dLo && w < dHi ? soft[w]! & ~pool[rb + w]! : soft[w]!;
        while (x !== 0) {
          laneDegraded[(w << 5) | (31 - Math.clz32(x & -x))]! += 1;
          x &= x - 1;
        }
      }
    }
    softCount = 0;
    for (let i = 0; i < held; i++) rowOf[holders[i]!] = -1;
    held = 0;
    used = 0;
    // Every member of a unit has the unit's blast radius; each excludes only itself.
    for (let u = lo; u < hi; u++) {
      const lane = u - lo;
      for (const s of unitMembers(u)) {
        down[s] = laneDown[lane]! - 1;
        downTierWeight[s] = laneWeight[lane]! - weight[s]!;
        degraded[s] = laneDegraded[lane]!;
      }
    }
    opts.onProgress?.(hi / units);
  }
  return { down, degraded, downTierWeight };
}
