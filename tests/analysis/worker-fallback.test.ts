// When worker threads cannot start, betweenness still completes on the calling thread.
import { describe, expect, it, vi } from "vitest";
import { betweenness, betweennessParallel } from "@/lib/analysis/betweenness";
import { buildGraph } from "@/lib/analysis/graph";
import { generateGraph } from "@/scripts/bench/generate";

vi.mock("node:worker_threads", () => ({
  Worker: class {
    constructor() {
      throw new Error("worker threads unavailable here");
    }
  },
}));

describe("betweennessParallel without workers", () => {
  it("falls back to one thread with the same values", async () => {
    const g = buildGraph(generateGraph({ n: 600, seed: 5 }));
    const r = await betweennessParallel(g, { threads: 2, parallelThreshold: 0, minParallelMs: 0 });
    expect(r.threadsUsed).toBe(1);
    const single = betweenness(g).values;
    for (let v = 0; v < g.n; v++) expect(Math.abs(r.values[v]! - single[v]!)).toBeLessThan(1e-15);
  });
});
