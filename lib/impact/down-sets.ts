// Who is down when one component fails, for many components in a row: the shared propagation of
// lib/analysis/blast-radius.ts (BlastPropagation, scratch kept between runs), by index or by key.
// tests/impact/down-sets.test.ts holds this to blastRadius() on random graphs.
import { BlastPropagation } from "@/lib/analysis/blast-radius";
import type { CompactGraph } from "@/lib/analysis/graph";

export class DownSets {
  private readonly propagation: BlastPropagation;

  constructor(private readonly graph: CompactGraph) {
    this.propagation = new BlastPropagation(graph);
  }

  /** Node indices down when `v` alone fails, `v` itself excluded, in the order they went down. */
  of(v: number): Int32Array {
    return this.propagation.run([v]).down.slice(1);
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
