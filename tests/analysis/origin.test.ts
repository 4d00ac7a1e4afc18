// Probable origin of an incident (lib/analysis/origin.ts). Hand-derived cases follow the blast-radius
// rules of DESIGN §3; the greedy cover is checked against brute force on small graphs and against
// the published bound H(d) ≤ ln d + 1 (Chvátal 1979); silent suspects and joint explanations
// against brute force over blastRadius (lib/analysis/blast-radius.ts, itself checked against
// hand-derived drills); personalised PageRank against networkx
// `pagerank(G, alpha=0.85, personalization=…)` computed in this run by Debian's python3-networkx.
import { execFileSync } from "node:child_process";
import { describe, expect, it } from "vitest";
import { blastRadius, failedByZones } from "@/lib/analysis/blast-radius";
import { buildGraph, type CompactGraph } from "@/lib/analysis/graph";
import { probableOrigin } from "@/lib/analysis/origin";
import { mulberry32 as seededRandom } from "@/lib/analysis/random";
import type { AnalysisEdge, AnalysisInput } from "@/lib/analysis/types";
import { directed, hard, node, soft } from "./helpers";

const PYTHON = process.env.PINCHPOINT_PYTHON ?? "/usr/bin/python3";

describe("probable origin: hand-derived cases", () => {
  // web → api → db ← worker; search → index (an unrelated chain)
  const g = buildGraph(directed([["web", "api"], ["api", "db"], ["worker", "db"], ["search", "index"]]));

  it("a single origin with its whole blast radius firing explains all of it", () => {
    const r = probableOrigin(g, ["web", "api", "db", "worker"]);
    expect(r.origins.map((o) => o.key)).toEqual(["db"]);
    expect(r.origins[0]!.explains).toEqual(["api", "db", "web", "worker"]);
    expect(r.origins[0]!.degraded).toEqual([]);
    expect(r.explainedCount).toBe(4);
    expect(r.unexplained).toEqual([]);
    expect(r.jointly).toEqual([]);
    expect(r.predicted).toEqual({ down: [], degraded: [] });
    // db's failure explains all four, api's two (web and itself), the leaves only themselves.
    expect(r.ranking.map((x) => [x.key, x.explains])).toEqual([["db", 4], ["api", 2], ["web", 1], ["worker", 1]]);
    // db's own needs: none, so nothing silent can explain more than db does.
    expect(r.silent).toEqual([]);
  });

  it("two independent origins are both found; what their failure reaches beyond the alerts is predicted", () => {
    const r = probableOrigin(g, ["api", "db", "index", "search"]);
    expect(r.origins.map((o) => o.key).sort()).toEqual(["db", "index"]);
    expect(r.explainedCount).toBe(4);
    // db takes down web (through api) and worker, which do not alert (yet).
    expect(r.predicted.down).toEqual(["web", "worker"]);
    expect(r.origins.find((o) => o.key === "db")!.predicted.down).toEqual(["web", "worker"]);
  });

  it("a firing component that nothing explains is listed as unexplained, and unknown keys are listed too", () => {
    const r = probableOrigin(g, ["db", "worker", "index", "not-in-graph"]);
    expect(r.origins.map((o) => o.key)).toEqual(["db"]);
    expect(r.unexplained).toEqual(["index"]);
    expect(r.unknown).toEqual(["not-in-graph"]);
    expect(r.firing).toEqual(["db", "index", "worker"]);
  });

  it("any_of redundancy: one failed replica explains nothing", () => {
    const input: AnalysisInput = {
      nodes: ["checkout", "replica-a", "replica-b"].map((k) => node(k)),
      edges: [hard("checkout", "replica-a", "g"), hard("checkout", "replica-b", "g")],
    };
    const r = probableOrigin(buildGraph(input), ["checkout", "replica-a"]);
    expect(r.origins).toEqual([]);
    expect(r.jointly).toEqual([]);
    expect(r.unexplained).toEqual(["checkout", "replica-a"]);
  });

  it("any_of redundancy: with both replicas firing, checkout is explained only jointly, by both", () => {
    const input: AnalysisInput = {
      nodes: ["checkout", "replica-a", "replica-b"].map((k) => node(k)),
      edges: [hard("checkout", "replica-a", "g"), hard("checkout", "replica-b", "g")],
    };
    const r = probableOrigin(buildGraph(input), ["checkout", "replica-a", "replica-b"]);
    expect(r.origins).toEqual([]);
    expect(r.jointly).toEqual([{ key: "checkout", by: ["replica-a", "replica-b"] }]);
    expect(r.unexplained).toEqual(["replica-a", "replica-b"]);
  });

  it("start-up-only needs explain nothing", () => {
    const input: AnalysisInput = {
      nodes: ["svc", "migrate"].map((k) => node(k)),
      edges: [{ from: "svc", to: "migrate", strength: "startup", group: null }],
    };
    expect(probableOrigin(buildGraph(input), ["svc", "migrate"]).origins).toEqual([]);
  });

  it("a soft need explains its dependent as degraded, and says so", () => {
    // storefront needs recommendations softly: it is degraded (not down) when recommendations fails.
    const input: AnalysisInput = { nodes: ["storefront", "recommendations"].map((k) => node(k)), edges: [soft("storefront", "recommendations")] };
    const r = probableOrigin(buildGraph(input), ["storefront", "recommendations"]);
    expect(r.origins.map((o) => [o.key, o.explains, o.degraded])).toEqual([["recommendations", ["recommendations", "storefront"], ["storefront"]]]);
  });

  it("a silent shared dependency: two apparent origins share a component that does not alert", () => {
    // web-1 → api-1 → db, web-2 → api-2 → db; db has no alert. Each api explains two firing
    // components; db alone explains all four, so it is named as a silent suspect.
    const s = buildGraph(directed([["web-1", "api-1"], ["api-1", "db"], ["web-2", "api-2"], ["api-2", "db"]]));
    const r = probableOrigin(s, ["web-1", "api-1", "web-2", "api-2"]);
    expect(r.origins.map((o) => o.key).sort()).toEqual(["api-1", "api-2"]);
    expect(r.silent).toEqual([{ kind: "component", key: "db", explains: ["api-1", "api-2", "web-1", "web-2"], degraded: [], predicted: { down: 1, degraded: 0 } }]);
    // The walk along needs collects on db: every firing component's paths end there.
    expect(r.pagerank[0]).toMatchObject({ key: "db", firing: false });
  });

  it("a zone nobody alerts on: three unrelated components that run only in zone-b", () => {
    const input: AnalysisInput = {
      nodes: [node("a", { zones: ["zone-b"] }), node("b", { zones: ["zone-b"] }), node("c", { zones: ["zone-a", "zone-b"] }), node("d", { zones: ["zone-b"] })],
      edges: [],
    };
    const r = probableOrigin(buildGraph(input), ["a", "b", "d"]);
    expect(r.origins).toEqual([]);
    // c also runs in zone-a, so zone-b's failure leaves it up (DESIGN §3 zone rule).
    expect(r.silent).toEqual([{ kind: "zone", key: "zone-b", explains: ["a", "b", "d"], degraded: [], predicted: { down: 0, degraded: 0 } }]);
  });

  it("predicted failures come most critical tier first", () => {
    const input: AnalysisInput = {
      nodes: [node("db"), node("zz-tier1", { tier: 1 }), node("aa-tier4", { tier: 4 }), node("mm-tier2", { tier: 2 })],
      edges: [hard("zz-tier1", "db"), hard("aa-tier4", "db"), hard("mm-tier2", "db")],
    };
    const r = probableOrigin(buildGraph(input), ["db", "aa-tier4"]);
    expect(r.predicted.down).toEqual(["zz-tier1", "mm-tier2"]);
  });
});

/** A random graph with hard, soft and any_of needs, and zones. */
function randomGraph(rand: () => number, n: number): CompactGraph {
  const keys = Array.from({ length: n }, (_, i) => `c${i}`);
  const zones = ["z1", "z2"];
  const edges: AnalysisEdge[] = [];
  for (let u = 0; u < n; u++) {
    for (let v = 0; v < n; v++) if (u !== v && rand() < 0.18) edges.push(rand() < 0.25 ? soft(keys[u]!, keys[v]!) : hard(keys[u]!, keys[v]!));
    if (rand() < 0.2) {
      const a = Math.floor(rand() * n);
      const b = Math.floor(rand() * n);
      if (a !== u && b !== u && a !== b) for (const m of [a, b]) edges.push(hard(keys[u]!, keys[m]!, `any-${u}`));
    }
  }
  return buildGraph({ nodes: keys.map((k) => node(k, { zones: zones.filter(() => rand() < 0.5) })), edges });
}

const harmonic = (d: number) => Array.from({ length: d }, (_, i) => 1 / (i + 1)).reduce((a, b) => a + b, 0);

describe("probable origin: against brute force", () => {
  it("covers as much as the best cover, with at most H(d) times as many picks, on 300 small random graphs", () => {
    const rand = seededRandom(20261202);
    for (let t = 0; t < 300; t++) {
      const g = randomGraph(rand, 4 + Math.floor(rand() * 7));
      const firing = g.keys.filter(() => rand() < 0.6);
      const r = probableOrigin(g, firing);
      const idx = firing.map((k) => g.indexOf.get(k)!);
      const fire = new Set(idx);
      // What each firing component's failure alone explains: down or degraded (DESIGN §3).
      const covers = idx.map((c) => {
        const b = blastRadius(g, { components: [c] });
        return new Set([...b.down, ...b.degraded].filter((v) => fire.has(v)));
      });
      // Every firing component explained by another firing one must be explained by the cover.
      const byAnother = new Set(idx.filter((f) => covers.some((s, i) => idx[i] !== f && s.has(f))).map((v) => g.keys[v]!));
      const explainedKeys = new Set(r.origins.flatMap((o) => o.newlyExplained));
      for (const k of byAnother) expect(explainedKeys.has(k)).toBe(true);
      expect(r.explainedCount).toBe(explainedKeys.size);
      expect(r.explainedCount + r.jointly.length + r.unexplained.length).toBe(firing.length);
      // The optimum: fewest firing components whose blast radii cover every firing component.
      let optimum = Infinity;
      for (let mask = 1; mask < 1 << idx.length; mask++) {
        const covered = new Set<number>();
        let size = 0;
        for (let i = 0; i < idx.length; i++) {
          if (!(mask & (1 << i))) continue;
          size++;
          for (const v of covers[i]!) covered.add(v);
        }
        if (covered.size === idx.length) optimum = Math.min(optimum, size);
      }
      if (idx.length === 0) optimum = 0;
      // Greedy picks plus the firing components left to cover themselves, within H(d) of the optimum.
      const d = Math.max(1, ...covers.map((s) => s.size));
      expect(r.origins.length + r.jointly.length + r.unexplained.length).toBeLessThanOrEqual(Math.ceil(harmonic(d) * optimum - 1e-9));
    }
  });

  it("names exactly the silent suspects and joint explanations brute force finds, on 300 small random graphs", () => {
    const rand = seededRandom(99);
    for (let t = 0; t < 300; t++) {
      const g = randomGraph(rand, 4 + Math.floor(rand() * 8));
      const firing = g.keys.filter(() => rand() < 0.45);
      const r = probableOrigin(g, firing);
      const fire = new Set(firing.map((k) => g.indexOf.get(k)!));
      const explains = (b: { down: number[]; degraded: number[] }) => [...b.down, ...b.degraded].filter((v) => fire.has(v)).length;
      const best = Math.max(0, ...[...fire].map((c) => explains(blastRadius(g, { components: [c] }))));
      const expected: Array<{ kind: string; key: string; count: number; down: number }> = [];
      if (fire.size >= 2) {
        for (let v = 0; v < g.n; v++) {
          if (fire.has(v)) continue;
          const b = blastRadius(g, { components: [v] });
          if (explains(b) > best) expected.push({ kind: "component", key: g.keys[v]!, count: explains(b), down: b.down.filter((x) => !fire.has(x)).length });
        }
        for (const z of ["z1", "z2"]) {
          if (failedByZones(g, [z]).length === 0) continue;
          const b = blastRadius(g, { zones: [z] });
          if (explains(b) > best) expected.push({ kind: "zone", key: z, count: explains(b), down: b.down.filter((x) => !fire.has(x)).length });
        }
      }
      expected.sort((a, b) => b.count - a.count || b.down - a.down || (a.key < b.key ? -1 : 1));
      expect(r.silent.map((s) => ({ kind: s.kind, key: s.key, count: s.explains.length, down: s.predicted.down }))).toEqual(expected.slice(0, 5));

      // Joint: left over by the cover, and down or degraded once every other firing component fails.
      const explained = new Set(r.origins.flatMap((o) => o.newlyExplained));
      const joint: string[] = [];
      const alone: string[] = [];
      for (const f of fire) {
        const k = g.keys[f]!;
        if (explained.has(k)) continue;
        const b = blastRadius(g, { components: [...fire].filter((v) => v !== f) });
        (b.down.includes(f) || b.degraded.includes(f) ? joint : alone).push(k);
      }
      expect(r.jointly.map((j) => j.key)).toEqual(joint.sort());
      expect(r.unexplained).toEqual(alone.sort());
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
usual = nx.pagerank(G, alpha=0.85, tol=1e-13, max_iter=100000)
print(json.dumps({"pr": {str(k): v for k, v in pr.items()}, "usual": {str(k): v for k, v in usual.items()}}))`;
    const ref = JSON.parse(execFileSync(PYTHON, ["-c", script, JSON.stringify({ n, pairs, firing })], { encoding: "utf8" })) as { pr: Record<string, number>; usual: Record<string, number> };
    expect(r.pagerank).toHaveLength(n);
    for (const { key, score, usual } of r.pagerank) {
      expect(Math.abs(score - ref.pr[key]!)).toBeLessThan(1e-9);
      // The usual share: networkx.pagerank(G, alpha=0.85) with its uniform teleport.
      expect(Math.abs(usual - ref.usual[key]!)).toBeLessThan(1e-9);
    }
    // Highest first; the top 5 alone are the same entries.
    for (let i = 1; i < n; i++) expect(r.pagerank[i - 1]!.score).toBeGreaterThanOrEqual(r.pagerank[i]!.score);
    expect(probableOrigin(g, firing, { pagerankTop: 5 }).pagerank).toEqual(r.pagerank.slice(0, 5));
  });
});
