// The compact graph: DESIGN §3 "the simple directed graph of all dependencies".
import { describe, expect, it } from "vitest";
import { buildGraph } from "@/lib/analysis/graph";
import { hard, node, soft } from "./helpers";

const row = (csr: { offsets: Int32Array; targets: Int32Array }, v: number): number[] =>
  Array.from(csr.targets.subarray(csr.offsets[v]!, csr.offsets[v + 1]!));

describe("buildGraph", () => {
  const g = buildGraph({
    nodes: ["a", "b", "c"].map((k) => node(k)),
    edges: [hard("a", "b"), soft("a", "b"), hard("a", "b"), hard("b", "b"), hard("b", "c"), hard("c", "a"), hard("a", "d")],
  });

  it("indexes keys 0..n−1 and adds keys named only by edges", () => {
    expect(g.keys).toEqual(["a", "b", "c", "d"]);
    expect(g.implicitKeys).toEqual(["d"]);
    expect(g.indexOf.get("c")).toBe(2);
  });

  it("counts repeated edges between the same pair once (DESIGN §3)", () => {
    expect(row(g.out, 0)).toEqual([1, 3]);
    expect(g.edgeCount).toBe(4);
  });

  it("keeps self-loops out of the adjacency but flags them", () => {
    expect(row(g.out, 1)).toEqual([2]);
    expect(Array.from(g.selfLoop)).toEqual([0, 1, 0, 0]);
  });

  it("builds the reverse and the undirected simple projection", () => {
    expect(row(g.in, 0)).toEqual([2]);
    expect(row(g.in, 1)).toEqual([0]);
    expect(row(g.undirected, 0)).toEqual([1, 2, 3]);
    expect(g.undirected.targets.length).toBe(8);
  });

  it("merges repeated plain needs with hard winning, and keeps any_of groups", () => {
    const h = buildGraph({
      nodes: ["x", "p", "q"].map((k) => node(k)),
      edges: [soft("x", "p"), hard("x", "p"), hard("x", "p", "g1"), hard("x", "q", "g1"), hard("x", "q", "g1")],
    });
    expect(h.needs.count).toBe(2);
    expect(Array.from(h.needs.hard)).toEqual([1, 1]);
    expect(Array.from(h.needs.size)).toEqual([1, 2]);
    expect(h.needs.anyOfCount).toBe(1);
  });

  it("rejects duplicate component keys", () => {
    expect(() => buildGraph({ nodes: [node("a"), node("a")], edges: [] })).toThrow(/duplicate/);
  });
});
