// Betweenness beyond the closed forms: Float64 path counts, sampling (against networkx's own k/seed
// semantics and within a stated statistical bound of the exact values), the warm worker pool.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { betweenness, betweennessParallel, stopBetweennessPool, warmBetweennessPool } from "@/lib/analysis/betweenness";
import { buildGraph } from "@/lib/analysis/graph";
import { generateGraph } from "@/scripts/bench/generate";
import { graphOf, range, type Pair } from "./helpers";
import { runReference } from "./python";

describe("layered graph with more than 2^32 shortest paths", () => {
  // 40 layers of width 3, every node of a layer needing every node of the next. From a node in
  // layer 0 to one in layer 39 there are 3^38 ≈ 1.35·10^18 shortest paths, far beyond 2^32
  // (3^21 already is). Closed form: a node in layer j lies, with share 1/w by symmetry, on the
  // shortest paths of every pair (layer < j, layer > j): raw = w·j·w(L−1−j)/w = w·j·(L−1−j).
  const L = 40;
  const w = 3;
  const pairs: Pair[] = [];
  for (let j = 0; j + 1 < L; j++) for (const a of range(w)) for (const b of range(w)) pairs.push([`l${j}-${a}`, `l${j + 1}-${b}`]);
  const g = graphOf(pairs);
  const n = w * L;
  const expected = (j: number): number => (w * j * (L - 1 - j)) / ((n - 1) * (n - 2));

  it("matches the closed form on every node (Float64 path counts)", () => {
    expect(3 ** 38).toBeGreaterThan(2 ** 32);
    const values = betweenness(g).values;
    for (let j = 0; j < L; j++) {
      for (const a of range(w)) {
        const v = g.indexOf.get(`l${j}-${a}`)!;
        expect(Math.abs(values[v]! - expected(j)) / Math.max(expected(j), 1e-300)).toBeLessThan(1e-9);
      }
    }
  });

  it("equals networkx.betweenness_centrality on the same graph, computed in this run (its path counts are floats and do not wrap)", () => {
    const [ref] = runReference<{ results: Array<{ exact: number[] }> }>("betweenness_reference.py", {
      cases: [{ id: 0, n: g.n, edges: pairs.map(([a, b]) => [g.indexOf.get(a)!, g.indexOf.get(b)!]) }],
    }).results;
    const values = betweenness(g).values;
    for (let v = 0; v < g.n; v++) expect(Math.abs(values[v]! - ref!.exact[v]!) / Math.max(ref!.exact[v]!, 1e-300), g.keys[v]).toBeLessThan(1e-9);
  });
});

describe("source sampling (Brandes & Pich 2007)", () => {
  const g = buildGraph(generateGraph({ n: 800, seed: 7 }));

  it("is exact up to the limit and sampled beyond it, reporting the sample size", () => {
    const exact = betweenness(g);
    expect(exact.exact).toBe(true);
    expect(exact.sampleSize).toBe(800);
    const sampled = betweenness(g, { exactLimit: 500, sampleSize: 200 });
    expect(sampled.exact).toBe(false);
    expect(sampled.sampleSize).toBe(200);
  });

  it("is deterministic for a seed and differs between seeds", () => {
    const a = betweenness(g, { exactLimit: 0, sampleSize: 100, seed: 3 }).values;
    const b = betweenness(g, { exactLimit: 0, sampleSize: 100, seed: 3 }).values;
    const c = betweenness(g, { exactLimit: 0, sampleSize: 100, seed: 4 }).values;
    expect(Array.from(a)).toEqual(Array.from(b));
    expect(Array.from(a)).not.toEqual(Array.from(c));
  });

  describe("against networkx, computed in this run", () => {
    // The same 800-component estate as a directed graph over node indices.
    const edges: Array<[number, number]> = [];
    for (let v = 0; v < g.n; v++) for (let e = g.out.offsets[v]!; e < g.out.offsets[v + 1]!; e++) edges.push([v, g.out.targets[e]!]);
    const cases = [200, 400].map((k, id) => ({ id, n: g.n, edges, k, seed: 17 + id, exact: id === 0 }));
    let refs: Array<{ exact: number[] | null; sampled: number[]; sources: number[] }> = [];
    beforeAll(() => {
      refs = runReference<{ results: typeof refs }>("betweenness_reference.py", { cases }).results;
    }, 60_000);

    it("equals networkx.betweenness_centrality(G, k, seed) over the sources networkx draws (estimator and its n/k scaling)", () => {
      for (const [i, c] of cases.entries()) {
        const r = refs[i]!;
        expect(r.sources).toHaveLength(c.k);
        const ours = betweenness(g, { sources: Int32Array.from(r.sources) });
        expect(ours.exact).toBe(false);
        let d = 0;
        for (let v = 0; v < g.n; v++) d = Math.max(d, Math.abs(ours.values[v]! - r.sampled[v]!));
        expect(d, `k = ${c.k}`).toBeLessThan(1e-12);
      }
    });

    it("our own seeded sample stays within Hoeffding's bound of networkx's exact values", () => {
      // Each sampled source s adds X_s = n·δ_s(v)/((n−1)(n−2)) ∈ [0, n/(n−1)] and the estimate is
      // their mean, so by Hoeffding's inequality (J. Am. Stat. Assoc. 58, 1963, Theorem 1, which §6
      // extends to sampling without replacement) P(|estimate − exact| ≥ t) ≤ 2·exp(−2kt²/(n/(n−1))²).
      // With k = 400 and t = 0.15 that is below 3e-8 per component, below 3e-5 over all 800.
      const k = 400;
      const t = 0.15;
      const bound = 2 * Math.exp((-2 * k * t * t) / (g.n / (g.n - 1)) ** 2) * g.n;
      expect(bound).toBeLessThan(3e-5);
      const exact = refs[0]!.exact!;
      const ours = betweenness(g, { exactLimit: 0, sampleSize: k, seed: 99 }).values;
      for (let v = 0; v < g.n; v++) expect(Math.abs(ours[v]! - exact[v]!), g.keys[v]).toBeLessThan(t);
      // And the exact path equals networkx outright.
      const full = betweenness(g).values;
      for (let v = 0; v < g.n; v++) expect(Math.abs(full[v]! - exact[v]!)).toBeLessThan(1e-12);
    });
  });

  it("finds the same top component as the exact ranking on a preferential-attachment graph", () => {
    const top = (v: Float64Array): number => v.indexOf(Math.max(...v));
    expect(top(betweenness(g, { exactLimit: 0, sampleSize: 400 }).values)).toBe(top(betweenness(g).values));
  });
});

describe("worker threads (the warm pool)", () => {
  afterAll(() => stopBetweennessPool());

  const g = buildGraph(generateGraph({ n: 1500, seed: 11 }));
  const single = betweenness(g).values;

  it("two threads give the single-thread result (also under vitest)", async () => {
    const r = await betweennessParallel(g, { threads: 2, parallelThreshold: 0, minParallelMs: 0 });
    expect(r.threadsUsed).toBe(2);
    let d = 0;
    for (let v = 0; v < g.n; v++) d = Math.max(d, Math.abs(r.values[v]! - single[v]!));
    expect(d).toBeLessThan(1e-15);
  });

  it("keeps its workers between calls: the second call starts none", async () => {
    await betweennessParallel(g, { threads: 2, parallelThreshold: 0, minParallelMs: 0 });
    expect(await warmBetweennessPool(1)).toBe(1);
    const r = await betweennessParallel(g, { threads: 2, parallelThreshold: 0, minParallelMs: 0 });
    expect(r.threadsUsed).toBe(2);
  });

  it("stays on one thread for small graphs and reports progress up to 1", async () => {
    const seen: number[] = [];
    const r = await betweennessParallel(g, { onProgress: (f) => seen.push(f) });
    expect(r.threadsUsed).toBe(1);
    expect(seen.at(-1)).toBe(1);
  });
});
