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
  const seeds: number[] = [];
  for (const v of fail.components ?? []) if (v >= 0 && v < graph.n) seeds.push(v);
  seeds.push(...failedByZones(graph, fail.zones ?? []));
  const run = new BlastPropagation(graph).run(seeds);
  const failed = [...new Set(seeds)].sort((a, b) => a - b);
  return { down: Array.from(run.down).sort((a, b) => a - b), degraded: run.degraded.sort((a, b) => a - b), failed };
}

/**
 * The propagation above for many failed sets in a row (an incident's hundreds of candidates, an
 * impact's tier-1 components, every component of a shallow estate): scratch arrays kept between
 * runs and reset by epoch stamps, so each run costs what it touches, never a pass over the estate.
 */
export class BlastPropagation {
  private epoch = 0;
  private readonly downStamp: Int32Array;
  private readonly softStamp: Int32Array;
  private readonly groupStamp: Int32Array;
  private readonly alive: Int32Array;
  private readonly queue: Int32Array;
  private readonly softList: Int32Array;

  constructor(private readonly graph: CompactGraph) {
    const { n, needs } = graph;
    this.downStamp = new Int32Array(n);
    this.softStamp = new Int32Array(n);
    this.groupStamp = new Int32Array(needs.count);
    this.alive = new Int32Array(needs.count);
    this.queue = new Int32Array(n);
    this.softList = new Int32Array(n);
  }

  /** Fail `seeds`; returns what is down (seeds included) and degraded. Valid until the next run. */
  run(seeds: Iterable<number>): { down: Int32Array; degraded: number[] } {
    const epoch = ++this.epoch;
    const { downStamp, softStamp, groupStamp, alive, queue, softList } = this;
    const { offsets, targets } = this.graph.needs.memberOf;
    const { memberOfOwner, memberOfFlags, size } = this.graph.needs;
    let tail = 0;
    let soft = 0;
    for (const s of seeds) {
      if (downStamp[s] !== epoch) {
        downStamp[s] = epoch;
        queue[tail++] = s;
      }
    }
    for (let head = 0; head < tail; head++) {
      const v = queue[head]!;
      const end = offsets[v + 1]!;
      for (let e = offsets[v]!; e < end; e++) {
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
          }
        } else if (softStamp[o] !== epoch) {
          softStamp[o] = epoch;
          softList[soft++] = o;
        }
      }
    }
    const degraded: number[] = [];
    for (let i = 0; i < soft; i++) if (downStamp[softList[i]!] !== epoch) degraded.push(softList[i]!);
    return { down: queue.slice(0, tail), degraded };
  }

  isDown(v: number): boolean {
    return this.downStamp[v] === this.epoch;
  }
}


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
  const { n } = graph;
  const onProgress = options.onProgress;
  const weight = new Float64Array(n);
  for (let v = 0; v < n; v++) weight[v] = tierWeight(graph.tier[v]!);
  const downCount = new Int32Array(n);
  const degradedCount = new Int32Array(n);
  const downTierWeight = new Float64Array(n);
  const propagation = new BlastPropagation(graph);
  const sources = options.sources;
  const count = sources ? sources.length : n;
  const step = Math.max(1, Math.floor(count / 50));
  for (let i = 0; i < count; i++) {
    const s = sources ? sources[i]! : i;
    const { down, degraded } = propagation.run([s]);
    let w = 0;
    // down[0] is s itself, which its own reach leaves out.
    for (let k = 1; k < down.length; k++) w += weight[down[k]!]!;
    downCount[s] = down.length - 1;
    degradedCount[s] = degraded.length;
    downTierWeight[s] = w;
    if (onProgress && (i + 1) % step === 0) onProgress((i + 1) / count);
  }
  return { down: downCount, degraded: degradedCount, downTierWeight };
}
