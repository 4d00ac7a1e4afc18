// Blast radius (DESIGN §3): the least fixed point of "down" over reverse dependencies. A component
// is down if it is in the failed set F, or one of its hard needs is unmet; a need (plain, or an
// any_of group) is unmet only when every member is down. It is degraded if not down and a soft
// need is unmet; degraded does not propagate. A zone fails every component whose declared zones
// are all failed; components that declare no zones are never failed by a zone.
//
// Only hard needs propagate "down". An any_of group is one need: hard if any of its edges is hard
// (graph.ts), unmet only once every distinct member is down, and then it takes its owner down
// (hard) or degrades it (soft). So a single failure never crosses an any_of group that still has
// another member up, which makes this more than reverse reachability over hard edges.
//
// Propagation is a worklist over typed arrays: each need group keeps a count of members still up
// and fires when the count reaches 0, so the work is linear in the edges touched.
import type { CompactGraph } from "./graph";
import type { SingleFailureBlast } from "./single-failures";

export interface FailedSet {
  components?: readonly number[];
  zones?: readonly string[];
}

export interface BlastRadius {
  /** Ascending node indices, including the failed components themselves. */
  down: number[];
  degraded: number[];
  /** Components failed directly (listed, or every declared zone failed). */
  failed: number[];
}

/** Components failed by a set of zones: all of their declared zones are in it. */
export function failedByZones(graph: CompactGraph, zones: readonly string[]): number[] {
  if (zones.length === 0) return [];
  const set = new Set(zones);
  const result: number[] = [];
  for (let v = 0; v < graph.n; v++) {
    const zs = graph.zones[v]!;
    if (zs.length > 0 && zs.every((z) => set.has(z))) result.push(v);
  }
  return result;
}

export function blastRadius(graph: CompactGraph, fail: FailedSet): BlastRadius {
  const { n, needs } = graph;
  const down = new Uint8Array(n);
  const softUnmet = new Uint8Array(n);
  const alive = Int32Array.from(needs.size);
  const queue = new Int32Array(n);
  let tail = 0;
  const start = (v: number): void => {
    if (!down[v]) {
      down[v] = 1;
      queue[tail++] = v;
    }
  };
  for (const v of fail.components ?? []) if (v >= 0 && v < n) start(v);
  for (const v of failedByZones(graph, fail.zones ?? [])) start(v);
  const failed: number[] = [];
  for (let i = 0; i < tail; i++) failed.push(queue[i]!);
  const { offsets, targets } = needs.memberOf;
  for (let head = 0; head < tail; head++) {
    const v = queue[head]!;
    for (let e = offsets[v]!; e < offsets[v + 1]!; e++) {
      const g = targets[e]!;
      if (--alive[g]! !== 0) continue;
      const owner = needs.owner[g]!;
      if (needs.hard[g]) start(owner);
      else softUnmet[owner] = 1;
    }
  }
  const downList: number[] = [];
  const degraded: number[] = [];
  for (let v = 0; v < n; v++) {
    if (down[v]) downList.push(v);
    else if (softUnmet[v]) degraded.push(v);
  }
  failed.sort((a, b) => a - b);
  return { down: downList, degraded, failed };
}

export const TIER_WEIGHTS: Readonly<Record<1 | 2 | 3 | 4, number>> = { 1: 8, 2: 4, 3: 2, 4: 1 };

export function tierWeight(tier: number): number {
  return tier === 1 ? 8 : tier === 2 ? 4 : tier === 3 ? 2 : 1;
}

/**
 * The blast radius of every component failing alone by running the propagation above once per
 * component, with epoch stamps instead of clearing arrays. Quadratic on deep estates: the analysis
 * uses single-failures.ts, and the tests hold it to this reference.
 */
export function singleFailureBlastByPropagation(
  graph: CompactGraph,
  options: { sources?: Int32Array; onProgress?: (fraction: number) => void } = {},
): SingleFailureBlast {
  const { n, needs } = graph;
  const onProgress = options.onProgress;
  const weight = new Float64Array(n);
  for (let v = 0; v < n; v++) weight[v] = tierWeight(graph.tier[v]!);
  const downStamp = new Int32Array(n);
  const softStamp = new Int32Array(n);
  const groupStamp = new Int32Array(needs.count);
  const alive = new Int32Array(needs.count);
  const queue = new Int32Array(n);
  const softList = new Int32Array(n);
  const downCount = new Int32Array(n);
  const degradedCount = new Int32Array(n);
  const downTierWeight = new Float64Array(n);
  const { offsets, targets } = needs.memberOf;
  const { memberOfOwner, memberOfFlags, size } = needs;
  const sources = options.sources;
  const count = sources ? sources.length : n;
  const step = Math.max(1, Math.floor(count / 50));
  for (let i = 0; i < count; i++) {
    const s = sources ? sources[i]! : i;
    const epoch = i + 1;
    downStamp[s] = epoch;
    queue[0] = s;
    let tail = 1;
    let soft = 0;
    let w = 0;
    for (let head = 0; head < tail; head++) {
      const v = queue[head]!;
      const eEnd = offsets[v + 1]!;
      for (let e = offsets[v]!; e < eEnd; e++) {
        const flags = memberOfFlags[e]!;
        if ((flags & 2) === 0) {
          // An any_of group: unmet only when its last member goes down.
          const g = targets[e]!;
          if (groupStamp[g] !== epoch) {
            groupStamp[g] = epoch;
            alive[g] = size[g]!;
          }
          if (--alive[g]! !== 0) continue;
        }
        const o = memberOfOwner[e]!;
        if (flags & 1) {
          if (downStamp[o] !== epoch) {
            downStamp[o] = epoch;
            queue[tail++] = o;
            w += weight[o]!;
          }
        } else if (softStamp[o] !== epoch) {
          softStamp[o] = epoch;
          softList[soft++] = o;
        }
      }
    }
    let degraded = 0;
    for (let i = 0; i < soft; i++) if (downStamp[softList[i]!] !== epoch) degraded++;
    downCount[s] = tail - 1;
    degradedCount[s] = degraded;
    downTierWeight[s] = w;
    if (onProgress && (i + 1) % step === 0) onProgress((i + 1) / count);
  }
  return { down: downCount, degraded: degradedCount, downTierWeight };
}
