// Probable origin of an incident (lib/analysis/origin.ts). Hand-derived cases follow the blast-radius
// rules of DESIGN §3; the greedy cover is checked against brute force on small graphs and against
// the published bound H(d) ≤ ln d + 1 (Chvátal 1979); personalised PageRank against networkx
// `pagerank(G, alpha=0.85, personalization=…)` computed in this run by Debian's python3-networkx.
import { execFileSync } from "node:child_process";
import { describe, expect, it } from "vitest";
import { blastRadius } from "@/lib/analysis/blast-radius";
import { buildGraph } from "@/lib/analysis/graph";
import { probableOrigin } from "@/lib/analysis/origin";
import { mulberry32 as seededRandom } from "@/lib/analysis/random";
import type { AnalysisInput } from "@/lib/analysis/types";
import { directed, hard, node } from "./helpers";

const PYTHON = process.env.PINCHPOINT_PYTHON ?? "/usr/bin/python3";

describe("probable origin: hand-derived cases", () => {
  // web → api → db ← worker; search → index (an unrelated chain)
  const g = buildGraph(directed([["web", "api"], ["api", "db"], ["worker", "db"], ["search", "index"]]));

  it("a single origin with its whole blast radius firing explains all of it", () => {
    const r = probableOrigin(g, ["web", "api", "db", "worker"]);
    expect(r.origins.map((o) => o.key)).toEqual(["db"]);
    expect(r.origins[0]!.explains).toEqual(["api", "db", "web", "worker"]);
    expect(r.explainedCount).toBe(4);
    expect(r.unexplained).toEqual([]);
    expect(r.predicted).toEqual({ down: [], degraded: [] });
  });

  it("two independent origins are both found; what their failure reaches beyond the alerts is predicted", () => {
    const r = probableOrigin(g, ["api", "db", "index", "search"]);
    expect(r.origins.map((o) => o.key).sort()).toEqual(["db", "index"]);
    expect(r.explainedCount).toBe(4);
    expect(r.predicted.down).toEqual(["web", "worker"]);
  });

  it("a firing component that nothing explains is listed as unexplained, and unknown keys are listed too", () => {
    const r = probableOrigin(g, ["db", "worker", "index", "not-in-graph"]);
    expect(r.origins.map((o) => o.key)).toEqual(["db"]);
    expect(r.unexplained).toEqual(["index"]);
    expect(r.unknown).toEqual(["not-in-graph"]);
  });

  it("any_of redundancy: one failed replica explains nothing", () => {
    const input: AnalysisInput = {
      nodes: ["checkout", "replica-a", "replica-b"].map((k) => node(k)),
      edges: [hard("checkout", "replica-a", "g"), hard("checkout", "replica-b", "g")],
    };
    const r = probableOrigin(buildGraph(input), ["checkout", "replica-a"]);
    expect(r.origins).toEqual([]);
    expect(r.unexplained).toEqual(["checkout", "replica-a"]);
  });

  it("start-up-only needs explain nothing", () => {
    const input: AnalysisInput = {
      nodes: ["svc", "migrate"].map((k) => node(k)),
      edges: [{ from: "svc", to: "migrate", strength: "startup", group: null }],
    };
    expect(probableOrigin(buildGraph(input), ["svc", "migrate"]).origins).toEqual([]);
  });
});

describe("probable origin: greedy cover against brute force", () => {
  const harmonic = (d: number) => Array.from({ length: d }, (_, i) => 1 / (i + 1)).reduce((a, b) => a + b, 0);

  it("covers as much as the best cover, with at most H(d) times as many picks, on 200 small random graphs", () => {
    const rand = seededRandom(20261202);
    for (let t = 0; t < 200; t++) {
      const n = 4 + Math.floor(rand() * 7);
      const pairs: Array<[string, string]> = [];
      for (let u = 0; u < n; u++) for (let v = 0; v < n; v++) if (u !== v && rand() < 0.2) pairs.push([`c${u}`, `c${v}`]);
      const g = buildGraph(directed(pairs, Array.from({ length: n }, (_, i) => `c${i}`)));
      const firing = g.keys.filter(() => rand() < 0.6);
      const r = probableOrigin(g, firing);
      // Brute force: every subset of firing components; a pick counts only if it explains another one.
      const idx = firing.map((k) => g.indexOf.get(k)!);
      const covers = idx.map((c) => new Set(blastRadius(g, { components: [c] }).down.filter((v) => idx.includes(v))));
      let bestCovered = 0;
      let bestSize = 0;
      for (let mask = 0; mask < 1 << idx.length; mask++) {
        const covered = new Set<number>();
        let size = 0;
        for (let i = 0; i < idx.length; i++) {
          if (!(mask & (1 << i))) continue;
          size++;
          for (const v of covers[i]!) covered.add(v);
        }
        if (covered.size > bestCovered || (covered.size === bestCovered && size < bestSize)) {
          bestCovered = covered.size;
          bestSize = size;
        }
      }
      // Firing components no pick explains count as covered by themselves in the brute force.
      expect(r.explainedCount + r.unexplained.length).toBe(firing.length);
      expect(bestCovered).toBe(firing.length);
      const d = Math.max(1, ...covers.map((s) => s.size));
      const optimalPicks = bestSize;
      expect(r.origins.length + r.unexplained.length).toBeLessThanOrEqual(Math.ceil(harmonic(d) * optimalPicks));
    }
  });
});

describe("probable origin: personalised PageRank against networkx", () => {
  it("equals pagerank(G, alpha=0.85, personalization=firing) on a seeded random graph", () => {
    const rand = seededRandom(7);
    const n = 60;
    const pairs: Array<[string, string]> = [];
    for (let u = 0; u < n; u++) for (let k = 0; k < 3; k++) {
      const v = Math.floor(rand() * n);
      if (v !== u) pairs.push([String(u), String(v)]);
    }
    const g = buildGraph(directed(pairs, Array.from({ length: n }, (_, i) => String(i))));
    const firing = ["3", "7", "11", "19", "42"];
    const r = probableOrigin(g, firing, { pagerankTop: n });
    const script = `
import json, sys, networkx as nx
d = json.loads(sys.argv[1])
G = nx.DiGraph(); G.add_nodes_from(range(d["n"])); G.add_edges_from(tuple(map(int, e)) for e in d["pairs"])
p = {int(k): 1 for k in d["firing"]}
pr = nx.pagerank(G, alpha=0.85, personalization=p, tol=1e-13, max_iter=100000)
print(json.dumps({str(k): v for k, v in pr.items()}))`;
    const ref = JSON.parse(execFileSync(PYTHON, ["-c", script, JSON.stringify({ n, pairs, firing })], { encoding: "utf8" })) as Record<string, number>;
    expect(r.pagerank).toHaveLength(n);
    for (const { key, score } of r.pagerank) expect(Math.abs(score - ref[key]!)).toBeLessThan(1e-9);
  });
});
