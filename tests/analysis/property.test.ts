// Property tests against Debian's python3-networkx: seeded random directed graphs (with
// self-loops and repeated edges in the input), one Python process for the whole batch.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { articulation } from "@/lib/analysis/articulation";
import { betweenness } from "@/lib/analysis/betweenness";
import { clustering } from "@/lib/analysis/clustering";
import { dominatorTree } from "@/lib/analysis/dominators";
import { eigenvector } from "@/lib/analysis/eigenvector";
import { buildGraph, type CompactGraph } from "@/lib/analysis/graph";
import { pagerank } from "@/lib/analysis/pagerank";
import { mulberry32 } from "@/lib/analysis/random";
import { scc } from "@/lib/analysis/scc";
import type { AnalysisInput } from "@/lib/analysis/types";
import { node } from "./helpers";
import { runReference } from "./python";

const GRAPHS = 300;

// Tolerances: betweenness and clustering are exact rational arithmetic in both (float rounding
// only); PageRank and eigenvector are iterative, ours to Σ|Δ| < n·1e-10, networkx to n·1e-13.
const TOL = { betweenness: 1e-9, pagerank: 1e-8, clustering: 1e-12, eigenvector: 1e-6 };

interface Case {
  id: number;
  n: number;
  edges: Array<[number, number]>;
  roots: number[];
  sources: number[] | null;
}

interface Reference {
  id: number;
  selfLoops: number[];
  betweenness: number[];
  pagerank: number[];
  clustering: number[];
  articulation: number[];
  bridges: Array<[number, number]>;
  scc: number[][];
  idom: Record<string, Record<string, number>>;
  eigenvector: number[] | null;
  sampled: number[] | null;
}

function randomCase(id: number): Case {
  const rand = mulberry32(1000 + id);
  const n = 5 + Math.floor(rand() * 56);
  const density = 0.5 + rand() * 2.5;
  const m = Math.floor(n * density);
  const edges: Array<[number, number]> = [];
  for (let e = 0; e < m; e++) {
    const u = Math.floor(rand() * n);
    // Every twentieth edge, about, is a self-loop; every tenth is repeated.
    const v = rand() < 0.05 ? u : Math.floor(rand() * n);
    edges.push([u, v]);
    if (rand() < 0.1) edges.push([u, v]);
  }
  const roots = [0, Math.floor(rand() * n)].filter((r, i, a) => a.indexOf(r) === i);
  const sources = id % 10 === 0 ? Array.from(new Set(Array.from({ length: Math.ceil(n / 3) }, () => Math.floor(rand() * n)))).sort((a, b) => a - b) : null;
  return { id, n, edges, roots, sources };
}

function inputOf(c: Case): AnalysisInput {
  // Keys are the decimal ids so that networkx's node ids map straight back.
  return {
    nodes: Array.from({ length: c.n }, (_, i) => node(String(i))),
    edges: c.edges.map(([u, v]) => ({ from: String(u), to: String(v), strength: "hard", group: null })),
  };
}

const maxDiff = (a: ArrayLike<number>, b: readonly number[]): number => {
  let d = 0;
  for (let i = 0; i < b.length; i++) d = Math.max(d, Math.abs(a[i]! - b[i]!));
  return d;
};

describe(`${GRAPHS} seeded random directed graphs against networkx`, () => {
  const cases = Array.from({ length: GRAPHS }, (_, i) => randomCase(i));
  const graphs = new Map<number, CompactGraph>();
  let refs: Reference[] = [];

  beforeAll(() => {
    for (const c of cases) graphs.set(c.id, buildGraph(inputOf(c)));
    refs = runReference<{ results: Reference[] }>("networkx_reference.py", { cases }).results;
  }, 60_000);
  afterAll(() => graphs.clear());

  const each = (check: (c: Case, g: CompactGraph, r: Reference) => void): void => {
    expect(refs).toHaveLength(cases.length);
    for (const r of refs) check(cases[r.id]!, graphs.get(r.id)!, r);
  };

  it("the batch covers self-loops, repeated edges and disconnected graphs", () => {
    expect(cases.filter((c) => c.edges.some(([u, v]) => u === v)).length).toBeGreaterThan(50);
    expect(cases.filter((c) => new Set(c.edges.map((e) => e.join())).size < c.edges.length).length).toBeGreaterThan(50);
    expect(refs.filter((r) => r.eigenvector === null).length).toBeGreaterThan(10);
  });

  it(`betweenness_centrality(normalized=True) within ${TOL.betweenness}`, () => {
    each((c, g, r) => expect(maxDiff(betweenness(g).values, r.betweenness), `graph ${c.id}`).toBeLessThan(TOL.betweenness));
  });

  it("source-sampled betweenness equals networkx's estimator over the same sources (Brandes & Pich 2007)", () => {
    let checked = 0;
    each((c, g, r) => {
      if (!c.sources || !r.sampled || c.sources.length >= c.n) return;
      const ours = betweenness(g, { exactLimit: 0, sampleSize: c.sources.length, seed: 1 });
      expect(ours.exact).toBe(false);
      // Our seeded sample differs from the case's; recompute ours over the case's sources.
      const fixed = betweennessOver(g, c.sources);
      expect(maxDiff(fixed, r.sampled), `graph ${c.id}`).toBeLessThan(TOL.betweenness);
      checked++;
    });
    expect(checked).toBeGreaterThan(20);
  });

  it(`pagerank(alpha=0.85) within ${TOL.pagerank}`, () => {
    each((c, g, r) => expect(maxDiff(pagerank(g).values, r.pagerank), `graph ${c.id}`).toBeLessThan(TOL.pagerank));
  });

  it(`clustering on the undirected simple projection within ${TOL.clustering}`, () => {
    each((c, g, r) => expect(maxDiff(clustering(g), r.clustering), `graph ${c.id}`).toBeLessThan(TOL.clustering));
  });

  it(`eigenvector_centrality on connected projections within ${TOL.eigenvector}`, () => {
    let checked = 0;
    each((c, g, r) => {
      if (!r.eigenvector) return;
      const e = eigenvector(g);
      expect(e.converged).toBe(true);
      expect(maxDiff(e.values, r.eigenvector), `graph ${c.id}`).toBeLessThan(TOL.eigenvector);
      checked++;
    });
    expect(checked).toBeGreaterThan(100);
  });

  it("articulation_points and bridges: identical sets", () => {
    each((c, g, r) => {
      const ap = articulation(g);
      const ours = Array.from(ap.articulation.keys()).filter((v) => ap.articulation[v]).map((v) => Number(g.keys[v]));
      expect(ours.sort((a, b) => a - b), `graph ${c.id}`).toEqual(r.articulation);
      const bridges = ap.bridges.map(([a, b]) => [Number(g.keys[a]), Number(g.keys[b])].sort((x, y) => x - y));
      bridges.sort((x, y) => x[0]! - y[0]! || x[1]! - y[1]!);
      expect(bridges, `graph ${c.id}`).toEqual(r.bridges);
    });
  });

  it("strongly_connected_components: identical partition; cycles = size > 1 or self-loop", () => {
    each((c, g, r) => {
      const s = scc(g);
      const parts = new Map<number, number[]>();
      g.keys.forEach((k, i) => parts.set(s.comp[i]!, [...(parts.get(s.comp[i]!) ?? []), Number(k)]));
      const ours = [...parts.values()].map((p) => p.sort((a, b) => a - b)).sort((a, b) => a[0]! - b[0]!);
      expect(ours, `graph ${c.id}`).toEqual([...r.scc].sort((a, b) => a[0]! - b[0]!));
      const loops = new Set(r.selfLoops);
      const expected = r.scc.filter((p) => p.length > 1 || loops.has(p[0]!)).map((p) => p.join()).sort();
      expect(s.cycles.map((cy) => cy.map((v) => Number(g.keys[v])).sort((a, b) => a - b).join()).sort()).toEqual(expected);
    });
  });

  it("immediate_dominators from each root: identical maps", () => {
    each((c, g, r) => {
      for (const root of c.roots) {
        const t = dominatorTree(g, g.indexOf.get(String(root))!);
        const ours: Record<string, number> = {};
        t.nodes.forEach((v, i) => (ours[g.keys[v]!] = Number(g.keys[t.idom[i]!])));
        expect(ours, `graph ${c.id} root ${root}`).toEqual(r.idom[String(root)]);
      }
    });
  });
});

/** Sampled betweenness over explicit sources, through the same kernel the sampler uses. */
function betweennessOver(g: CompactGraph, sources: number[]): Float64Array {
  const idx = Int32Array.from(sources.map((s) => g.indexOf.get(String(s))!));
  return betweenness(g, { exactLimit: 0, sampleSize: idx.length, sources: idx }).values;
}
