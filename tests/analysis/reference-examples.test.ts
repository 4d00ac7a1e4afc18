// Published worked examples and open data, each checked against the source named beside it.
import { UndirectedGraph, DirectedGraph } from "graphology";
import betweennessCentrality from "graphology-metrics/centrality/betweenness";
import pagerankGraphology from "graphology-metrics/centrality/pagerank";
import { describe, expect, it } from "vitest";
import { articulation } from "@/lib/analysis/articulation";
import { betweenness } from "@/lib/analysis/betweenness";
import { clustering } from "@/lib/analysis/clustering";
import { dominatorTree } from "@/lib/analysis/dominators";
import { eigenvector } from "@/lib/analysis/eigenvector";
import { pagerank } from "@/lib/analysis/pagerank";
import { scc } from "@/lib/analysis/scc";
import {
  FLORENTINE_ARTICULATION,
  FLORENTINE_BRIDGES,
  FLORENTINE_EXPECTED,
  FLORENTINE_MARRIAGES,
} from "./fixtures/florentine";
import { byKey, graphOf, type Pair } from "./helpers";

describe("Padgett's Florentine families (open data; networkx 2.8.8 and igraph 0.10.2 values)", () => {
  // Betweenness is directed in Pinchpoint; on the symmetric digraph, normalising by (n−1)(n−2)
  // gives exactly the undirected normalised value, so the published numbers apply directly.
  const g = graphOf(FLORENTINE_MARRIAGES, true);
  const families = Object.keys(FLORENTINE_EXPECTED);
  const bc = byKey(g, betweenness(g).values);
  const pr = byKey(g, pagerank(g).values);
  const ev = byKey(g, eigenvector(g).values);
  const cc = byKey(g, clustering(g));

  it("has 15 families and 20 marriages", () => {
    expect(g.n).toBe(15);
    expect(g.undirected.targets.length / 2).toBe(20);
    expect(families).toHaveLength(15);
  });

  it("Medici betweenness is 0.522 (Padgett & Ansell's broker; NetworkX 0.521978…)", () => {
    expect(bc.Medici!).toBeCloseTo(0.522, 3);
  });

  it.each(families)("%s: betweenness, PageRank, eigenvector, clustering equal NetworkX and igraph", (f) => {
    const [nxB, igB, nxPr, igPr, nxEv, igEv, nxC] = FLORENTINE_EXPECTED[f]!;
    expect(Math.abs(bc[f]! - nxB)).toBeLessThan(1e-11);
    expect(Math.abs(bc[f]! - igB)).toBeLessThan(1e-11);
    expect(Math.abs(pr[f]! - nxPr)).toBeLessThan(1e-9);
    expect(Math.abs(pr[f]! - igPr)).toBeLessThan(1e-9);
    expect(Math.abs(ev[f]! - nxEv)).toBeLessThan(1e-9);
    expect(Math.abs(ev[f]! - igEv)).toBeLessThan(1e-9);
    expect(Math.abs(cc[f]! - nxC)).toBeLessThan(1e-11);
  });

  it("articulation points and bridges equal networkx articulation_points / bridges", () => {
    const ap = articulation(g);
    expect(g.keys.filter((_, i) => ap.articulation[i]).sort()).toEqual(FLORENTINE_ARTICULATION);
    const bridges = ap.bridges.map(([a, b]) => [g.keys[a]!, g.keys[b]!].sort()).sort();
    expect(bridges).toEqual(FLORENTINE_BRIDGES.map((p) => [...p]));
  });

  it("graphology-metrics (npm) agrees on this simple graph: betweenness and PageRank", () => {
    const ug = new UndirectedGraph();
    for (const [a, b] of FLORENTINE_MARRIAGES) ug.mergeEdge(a, b);
    const gb = betweennessCentrality(ug, { normalized: true, getEdgeWeight: null });
    for (const f of families) expect(Math.abs(gb[f]! - bc[f]!)).toBeLessThan(1e-12);
    const dg = new DirectedGraph();
    for (const [a, b] of FLORENTINE_MARRIAGES) {
      dg.mergeEdge(a, b);
      dg.mergeEdge(b, a);
    }
    // graphology stops at its default tolerance (1e-6), hence the looser bound.
    const gp = pagerankGraphology(dg, { alpha: 0.85, getEdgeWeight: null });
    for (const f of families) expect(Math.abs(gp[f]! - pr[f]!)).toBeLessThan(1e-5);
  });
});

function idomOf(pairs: readonly Pair[], root: string): Record<string, string> {
  const g = graphOf(pairs);
  const t = dominatorTree(g, g.indexOf.get(root)!);
  const out: Record<string, string> = {};
  t.nodes.forEach((v, i) => (out[g.keys[v]!] = g.keys[t.idom[i]!]!));
  return out;
}

const adjacency = (adj: Record<string, string>): Pair[] =>
  Object.entries(adj).flatMap(([u, vs]) => [...vs].map((v) => [u, v] as const));

describe("dominators", () => {
  it("Lengauer & Tarjan 1979, the 13-node flowgraph R..L (Fig. 1; edges from memory, cross-checked with networkx.immediate_dominators 2.8.8)", () => {
    const pairs = adjacency({
      R: "ABC", A: "D", B: "ADE", C: "FG", D: "L", E: "H", F: "I", G: "IJ", H: "EK", I: "K", J: "I", K: "IR", L: "H",
    });
    // The dominator tree printed in the paper, identical to networkx's output on these edges.
    expect(idomOf(pairs, "R")).toEqual({
      R: "R", A: "R", B: "R", C: "R", D: "R", E: "R", F: "C", G: "C", H: "R", I: "R", J: "G", K: "R", L: "D",
    });
  });

  it("Cooper, Harvey & Kennedy 2001, the irreducible example with nodes numbered in postorder (from memory; networkx agrees): every node's idom is the entry 6", () => {
    const pairs: Pair[] = [["6", "5"], ["6", "4"], ["5", "1"], ["4", "2"], ["4", "3"], ["1", "2"], ["2", "1"], ["2", "3"], ["3", "2"]];
    expect(idomOf(pairs, "6")).toEqual({ "6": "6", "5": "6", "4": "6", "1": "6", "2": "6", "3": "6" });
  });

  it("a diamond dominated by its neck; the unreachable part is left out", () => {
    const pairs: Pair[] = [["r", "neck"], ["neck", "a"], ["neck", "b"], ["a", "db"], ["b", "db"], ["x", "db"]];
    expect(idomOf(pairs, "r")).toEqual({ r: "r", neck: "r", a: "neck", b: "neck", db: "neck" });
  });
});

describe("strongly connected components", () => {
  it("CLRS 3rd ed. Figure 22.9, vertices a..h (edges from memory; networkx strongly_connected_components agrees)", () => {
    const g = graphOf(adjacency({ a: "b", b: "cef", c: "dg", d: "ch", e: "af", f: "g", g: "fh", h: "h" }));
    const r = scc(g);
    const comps = new Map<number, string[]>();
    g.keys.forEach((k, i) => comps.set(r.comp[i]!, [...(comps.get(r.comp[i]!) ?? []), k]));
    expect([...comps.values()].map((c) => c.sort()).sort()).toEqual([["a", "b", "e"], ["c", "d"], ["f", "g"], ["h"]]);
    // h needs itself: a cycle of one, per DESIGN §3.
    expect(r.cycles.map((c) => c.map((v) => g.keys[v]!).sort()).sort()).toEqual([["a", "b", "e"], ["c", "d"], ["f", "g"], ["h"]]);
    // Tarjan emits components in reverse topological order: {h} needs nothing and comes first.
    expect(r.comp[g.indexOf.get("h")!]).toBe(0);
    expect(r.comp[g.indexOf.get("a")!]).toBe(r.count - 1);
  });
});
