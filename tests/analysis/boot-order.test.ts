// Boot order: stages of the condensation's topological order (DESIGN §1).
import { describe, expect, it } from "vitest";
import { bootOrder } from "@/lib/analysis/boot-order";
import { buildGraph } from "@/lib/analysis/graph";
import { scc } from "@/lib/analysis/scc";
import type { AnalysisEdge } from "@/lib/analysis/types";
import { graphOf, hard, node, soft, type Pair } from "./helpers";

const startupNeed = (from: string, to: string): AnalysisEdge => ({ from, to, strength: "startup", group: null });

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

describe("which needs to break first in a cycle (Eades, Lin & Smyth 1993 order; expected values by hand)", () => {
  const plan = (edges: AnalysisEdge[]) => {
    const g = buildGraph({ nodes: [...new Set(edges.flatMap((e) => [e.from, e.to]))].map((k) => node(k)), edges });
    const b = bootOrder(g, scc(g, g.boot));
    return b.plans.map((p) => ({
      order: p.order.map((v) => g.keys[v]!),
      breaks: p.breaks.map((x) => `${g.keys[x.from]}→${g.keys[x.to]} ${x.strength}`),
      count: p.breakCount,
    }));
  };

  it("a soft need closing the cycle is the one to break: that dependent starts degraded", () => {
    // orders hard-needs payments; payments only soft-needs orders (for receipts).
    expect(plan([hard("orders", "payments"), soft("payments", "orders")])).toEqual([
      { order: ["payments", "orders"], breaks: ["payments→orders 1"], count: 1 },
    ]);
  });

  it("two hard needs: one of them must be broken by hand", () => {
    const [p] = plan([hard("a", "b"), hard("b", "a")]);
    expect(p!.count).toBe(1);
    expect(p!.breaks[0]).toMatch(/ 3$/);
  });

  it("a three-cycle with a start-up-only need and a chord breaks one need, not two", () => {
    // x→y→z→x (z→x start-up only) plus the chord x→z: starting z, then y, then x breaks only z→x.
    expect(plan([hard("x", "y"), hard("y", "z"), startupNeed("z", "x"), hard("x", "z")])).toEqual([
      { order: ["z", "y", "x"], breaks: ["z→x 2"], count: 1 },
    ]);
  });

  it("a component that needs itself: the need on itself is what to break", () => {
    expect(plan([hard("x", "x"), hard("x", "y")])[0]!.breaks).toEqual(["x→x 3"]);
  });
});
