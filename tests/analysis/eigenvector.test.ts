// Eigenvector centrality where plain power iteration stalls: long paths, cycles and trees up to
// 50,000 components, against NetworkX computed in this run (tests/analysis/reference/
// eigenvector_reference.py), and the reporting when no method reaches the tolerance.
import { beforeAll, describe, expect, it } from "vitest";
import { analyse } from "@/lib/analysis";
import { eigenvector } from "@/lib/analysis/eigenvector";
import { buildGraph, type CompactGraph } from "@/lib/analysis/graph";
import { mulberry32 } from "@/lib/analysis/random";
import { node } from "./helpers";
import { runReference } from "./python";

type Method = "power" | "numpy" | "shift-invert";
interface Case {
  id: number;
  name: string;
  n: number;
  edges: Array<[number, number]>;
  method: Method;
}

const pathEdges = (n: number): Array<[number, number]> => Array.from({ length: n - 1 }, (_, i) => [i, i + 1]);
const cycleEdges = (n: number): Array<[number, number]> => Array.from({ length: n }, (_, i) => [i, (i + 1) % n]);
/** Random recursive tree: node i hangs off a uniformly chosen earlier node (seeded). */
function randomTree(n: number, seed: number): Array<[number, number]> {
  const rand = mulberry32(seed);
  return Array.from({ length: n - 1 }, (_, i) => [Math.floor(rand() * (i + 1)), i + 1]);
}
/** A long spine with legs hung on random spine nodes: the top of its spectrum is tightly packed. */
function caterpillar(spine: number, legs: number, seed: number): Array<[number, number]> {
  const rand = mulberry32(seed);
  return [...pathEdges(spine), ...Array.from({ length: legs }, (_, i): [number, number] => [Math.floor(rand() * spine), spine + i])];
}
/** Complete b-ary tree of the given depth, numbered breadth first. */
function balancedTree(b: number, depth: number): Array<[number, number]> {
  let n = 1;
  for (let d = 0, w = 1; d < depth; d++) n += w *= b;
  return Array.from({ length: n - 1 }, (_, i) => [Math.floor(i / b), i + 1]);
}

const CASES: Case[] = [
  // The case that was served wrong: power iteration capped at 1,000 steps was 16–66 % off.
  { name: "path of 200 (networkx.eigenvector_centrality, tol 1e-12)", n: 200, edges: pathEdges(200), method: "power" },
  { name: "path of 2,000 (networkx.eigenvector_centrality_numpy)", n: 2000, edges: pathEdges(2000), method: "numpy" },
  { name: "path of 50,000 (ARPACK shift-invert on networkx's adjacency)", n: 50_000, edges: pathEdges(50_000), method: "shift-invert" },
  { name: "cycle of 50,000 (networkx.eigenvector_centrality)", n: 50_000, edges: cycleEdges(50_000), method: "power" },
  { name: "random tree of 300 (networkx.eigenvector_centrality)", n: 300, edges: randomTree(300, 1), method: "power" },
  { name: "random tree of 5,000 (networkx.eigenvector_centrality_numpy)", n: 5000, edges: randomTree(5000, 2), method: "numpy" },
  { name: "random tree of 50,000 (ARPACK shift-invert)", n: 50_000, edges: randomTree(50_000, 3), method: "shift-invert" },
  { name: "caterpillar of 50,000 (ARPACK shift-invert)", n: 50_000, edges: caterpillar(25_000, 25_000, 4), method: "shift-invert" },
  { name: "complete ternary tree of 29,524 (ARPACK shift-invert)", n: 29_524, edges: balancedTree(3, 9), method: "shift-invert" },
].map((c, id) => ({ ...c, id }) as Case);

function graphOf(c: Pick<Case, "n" | "edges">): CompactGraph {
  return buildGraph({
    nodes: Array.from({ length: c.n }, (_, i) => node(String(i))),
    edges: c.edges.map(([u, v]) => ({ from: String(u), to: String(v), strength: "hard", group: null })),
  });
}

const maxDiff = (a: ArrayLike<number>, keys: readonly string[], b: readonly number[]): number => {
  let d = 0;
  keys.forEach((k, i) => (d = Math.max(d, Math.abs(a[i]! - b[Number(k)]!))));
  return d;
};

describe("eigenvector centrality against networkx on paths, cycles and trees up to 50,000 components", () => {
  let refs = new Map<number, number[]>();
  beforeAll(() => {
    const out = runReference<{ results: Array<{ id: number; values: number[] }> }>("eigenvector_reference.py", { cases: CASES });
    refs = new Map(out.results.map((r) => [r.id, r.values]));
  }, 120_000);

  it.each(CASES.map((c) => [c.name, c] as const))("%s: within 1e-6", (_, c) => {
    const g = graphOf(c);
    const r = eigenvector(g);
    expect(r.converged, r.reason ?? "").toBe(true);
    expect(maxDiff(r.values, g.keys, refs.get(c.id)!)).toBeLessThan(1e-6);
  });

  it("path of 50,000 also equals the textbook closed form x_i ∝ sin(πi/(n+1)) (Brouwer & Haemers, Spectra of Graphs, §1.4.4)", () => {
    const n = 50_000;
    const g = graphOf({ n, edges: pathEdges(n) });
    const r = eigenvector(g);
    const norm = Math.sqrt((n + 1) / 2);
    let d = 0;
    g.keys.forEach((k, i) => (d = Math.max(d, Math.abs(r.values[i]! - Math.sin((Math.PI * (Number(k) + 1)) / (n + 1)) / norm))));
    expect(d).toBeLessThan(1e-9);
    expect(r.eigenvalue).toBeCloseTo(2 * Math.cos(Math.PI / (n + 1)), 12);
  });
});

describe("eigenvector centrality that does not converge is reported, never served as a value", () => {
  // A ladder (two rails with rungs) has a packed top spectrum like a path, but is not a tree: with
  // one Lanczos cycle and no fill-in allowed for the factorisation, neither method finishes.
  const rails = 400;
  const edges: Array<[number, number]> = [...pathEdges(rails), ...pathEdges(rails).map(([a, b]): [number, number] => [a + rails, b + rails]), ...Array.from({ length: rails }, (_, i): [number, number] => [i, i + rails])];
  const g = graphOf({ n: 2 * rails, edges });

  it("the measure says so, with a reason", () => {
    const r = eigenvector(g, { lanczosCycles: 1, fillLimit: 0 });
    expect(r.converged).toBe(false);
    expect(r.reason).toMatch(/^did not converge/);
    // With the defaults the same ladder converges (the fill of a ladder is small).
    expect(eigenvector(g).converged).toBe(true);
  });

  it("the analysis result carries null for every component and the reason", async () => {
    const r = await analyse(g, { eigenvector: { lanczosCycles: 1, fillLimit: 0 } });
    expect(r.graph.eigenvector.converged).toBe(false);
    expect(r.graph.eigenvector.reason).toMatch(/^did not converge/);
    expect(r.nodes.every((x) => x.eigenvector === null)).toBe(true);
  });
});

describe("disconnected projections: the limit of NetworkX's iteration from the all-ones vector", () => {
  it("only the component with the largest eigenvalue is non-zero; an edgeless graph gives 1/√n", () => {
    // A star K1,4 (λ = 2) beside a path of 3 (λ = √2): the path decays to 0.
    const g = buildGraph({
      nodes: ["h", "a", "b", "c", "d", "x", "y", "z"].map((k) => node(k)),
      edges: [..."abcd"].map((l) => ({ from: "h", to: l, strength: "hard" as const, group: null })).concat([
        { from: "x", to: "y", strength: "hard", group: null },
        { from: "y", to: "z", strength: "hard", group: null },
      ]),
    });
    const r = eigenvector(g);
    expect(r.converged).toBe(true);
    expect(r.values[g.indexOf.get("h")!]).toBeCloseTo(1 / Math.SQRT2, 12);
    expect(r.values[g.indexOf.get("y")!]).toBe(0);
    const empty = buildGraph({ nodes: ["a", "b", "c", "d"].map((k) => node(k)), edges: [] });
    expect(Array.from(eigenvector(empty).values)).toEqual([0.5, 0.5, 0.5, 0.5]);
  });
});
