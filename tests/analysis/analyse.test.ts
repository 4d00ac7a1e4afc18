// analyse(): every measure together, serialisable, with progress and timings.
import { describe, expect, it } from "vitest";
import { analyse } from "@/lib/analysis";
import { generateGraph } from "@/scripts/bench/generate";
import { hard, node, soft } from "./helpers";

describe("analyse", () => {
  it("returns plain JSON-safe results per node and for the graph", async () => {
    const phases = new Set<string>();
    let last = 0;
    let monotone = true;
    const r = await analyse(
      {
        nodes: [
          node("web", { tier: 1, replicas: 2, zones: ["zone-a", "zone-b"] }),
          node("api", { tier: 2 }),
          node("db", { tier: 1 }),
          node("a"),
          node("b"),
        ],
        edges: [hard("web", "api"), hard("api", "db"), soft("web", "a"), hard("a", "b"), hard("b", "a"), hard("web", "api")],
      },
      {},
      (f, p) => {
        phases.add(p);
        if (f < last) monotone = false;
        last = f;
      },
    );
    expect(JSON.parse(JSON.stringify(r))).toEqual(r);
    expect(monotone).toBe(true);
    expect(last).toBe(1);
    expect(phases).toContain("betweenness");
    expect(phases).toContain("done");
    const api = r.nodes.find((n) => n.key === "api")!;
    expect(api.betweenness).toBeCloseTo(1 / 12, 12); // web→db through api, over (5−1)(5−2)
    expect(api.blastDown).toBe(1);
    expect(api.articulation).toBe(true);
    expect(api.dominator).toEqual({ reachedFrom: 1, dominatesFrom: 1, maxDominated: 1, allDominated: 1, allIdom: "web", topEntries: [{ entry: "web", dominated: 1 }] });
    expect(r.nodes.find((n) => n.key === "web")!.dominator.allDominated).toBe(4);
    expect(r.nodes.find((n) => n.key === "web")!.entry).toBe(true);
    expect(r.nodes.find((n) => n.key === "web")!.blastDegraded).toBe(0);
    expect(r.nodes.find((n) => n.key === "a")!.inCycle).toBe(true);
    expect(r.graph.cycles).toEqual([["a", "b"]]);
    expect(r.graph.exact).toBe(true);
    expect(r.graph.sampleSize).toBe(5);
    expect(r.graph.edgeCount).toBe(5);
    expect(r.graph.dominators).toEqual({ roots: ["web"], complete: true, entriesAnalysed: 1 });
    expect(Object.fromEntries(r.nodes.map((x) => [x.key, x.dominator.allIdom]))).toEqual({ web: null, api: "web", db: "api", a: "web", b: "a" });
    expect(r.graph.bootOrder.stages).toEqual([["db", "a", "b"], ["api"], ["web"]]);
    expect(Object.keys(r.timings)).toContain("blast-radius");
  });

  it("samples betweenness beyond the exact limit and says so", async () => {
    const r = await analyse(generateGraph({ n: 400, seed: 2 }), { exactLimit: 100, sampleSize: 50 });
    expect(r.graph.exact).toBe(false);
    expect(r.graph.sampleSize).toBe(50);
    expect(r.nodes).toHaveLength(400);
  });

  it("rejects invalid weights at the boundary", async () => {
    await expect(analyse({ nodes: [], edges: [] }, { weights: { betweenness: -1, reach: 0, single: 0 } })).rejects.toThrow();
  });
});
