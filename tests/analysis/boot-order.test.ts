// Boot order: stages of the condensation's topological order (DESIGN §1).
import { describe, expect, it } from "vitest";
import { bootOrder } from "@/lib/analysis/boot-order";
import { scc } from "@/lib/analysis/scc";
import { graphOf, type Pair } from "./helpers";

describe("boot order", () => {
  it("stage 0 needs nothing; each stage needs only earlier ones (longest path)", () => {
    const pairs: Pair[] = [["web", "api"], ["api", "db"], ["api", "cache"], ["cache", "dns"], ["db", "dns"], ["web", "dns"]];
    const g = graphOf(pairs);
    const b = bootOrder(g, scc(g));
    expect(b.stages.map((s) => s.map((v) => g.keys[v]!).sort())).toEqual([["dns"], ["cache", "db"], ["api"], ["web"]]);
    expect(b.cycles).toEqual([]);
  });

  it("a dependency cycle is reported, shares one stage, and flags what waits on it", () => {
    const pairs: Pair[] = [["front", "a"], ["a", "b"], ["b", "a"], ["b", "dns"], ["other", "dns"]];
    const g = graphOf(pairs);
    const b = bootOrder(g, scc(g));
    const stage = (k: string): number => b.stageOf[g.indexOf.get(k)!]!;
    expect(b.cycles.map((c) => c.map((v) => g.keys[v]!).sort())).toEqual([["a", "b"]]);
    expect(stage("dns")).toBe(0);
    expect(stage("a")).toBe(1);
    expect(stage("b")).toBe(1);
    expect(stage("front")).toBe(2);
    expect(g.keys.filter((_, v) => b.waitsOnCycle[v])).toEqual(["front"]);
  });

  it("a component that needs itself is a cycle of one", () => {
    const g = graphOf([["x", "x"], ["x", "y"]]);
    expect(bootOrder(g, scc(g)).cycles.map((c) => c.map((v) => g.keys[v]!))).toEqual([["x"]]);
  });
});
