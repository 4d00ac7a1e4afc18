// Who is down when one component fails, for many components in a row: the propagation of
// lib/analysis/blast-radius.ts (a hard need unmet takes its owner down; an any_of group is unmet
// only when every member is down), with its scratch arrays kept between calls and reset by epoch
// stamps. blastRadius() allocates five arrays the size of the graph per call, which for a few
// thousand tier-1 components of a 20,000-component estate is hundreds of megabytes of garbage.
// tests/impact/down-sets.test.ts holds this to blastRadius() on random graphs.
import type { CompactGraph } from "@/lib/analysis/graph";

export class DownSets {
  private readonly downStamp: Int32Array;
  private readonly groupStamp: Int32Array;
  private readonly alive: Int32Array;
  private readonly queue: Int32Array;
  private epoch = 0;

  constructor(private readonly graph: CompactGraph) {
    this.downStamp = new Int32Array(graph.n);
    this.groupStamp = new Int32Array(graph.needs.count);
    this.alive = new Int32Array(graph.needs.count);
    this.queue = new Int32Array(graph.n);
  }

  /** Node indices down when `v` alone fails, `v` itself excluded, in the order they went down. */
  of(v: number): Int32Array {
    const { needs } = this.graph;
    const { offsets, targets } = needs.memberOf;
    const { memberOfOwner, memberOfFlags, size } = needs;
    const { downStamp, groupStamp, alive, queue } = this;
    const epoch = ++this.epoch;
    downStamp[v] = epoch;
    queue[0] = v;
    let tail = 1;
    for (let head = 0; head < tail; head++) {
      const u = queue[head]!;
      for (let e = offsets[u]!; e < offsets[u + 1]!; e++) {
        const flags = memberOfFlags[e]!;
        if ((flags & 1) === 0) continue; // soft: degrades, never takes down
        if ((flags & 2) === 0) {
          const g = targets[e]!;
          if (groupStamp[g] !== epoch) {
            groupStamp[g] = epoch;
            alive[g] = size[g]!;
          }
          if (--alive[g]! !== 0) continue;
        }
        const o = memberOfOwner[e]!;
        if (downStamp[o] !== epoch) {
          downStamp[o] = epoch;
          queue[tail++] = o;
        }
      }
    }
    return queue.slice(1, tail);
  }

  /** Keys down when `key` alone fails (itself excluded); empty when the key is not in the graph. */
  keysOf(key: string): Set<string> {
    const v = this.graph.indexOf.get(key);
    if (v === undefined) return new Set();
    const out = new Set<string>();
    for (const u of this.of(v)) out.add(this.graph.keys[u]!);
    return out;
  }
}
