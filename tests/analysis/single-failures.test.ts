// The word-parallel single-failure blast radius (lib/analysis/single-failures.ts) against the
// per-source propagation that states the rule (lib/analysis/blast-radius.ts, DESIGN §3), on seeded
// random estates with any_of groups (inside and outside cycles), soft needs, start-up-only needs,
// hard and mixed cycles, and on block sizes small enough that every graph spans several blocks.
import { describe, expect, it } from "vitest";
import { singleFailureBlastByPropagation } from "@/lib/analysis/blast-radius";
import { buildGraph } from "@/lib/analysis/graph";
import { mulberry32 } from "@/lib/analysis/random";
import { scc } from "@/lib/analysis/scc";
import { singleFailureBlast, singleFailureBlastByLanes } from "@/lib/analysis/single-failures";
import type { AnalysisEdge, AnalysisInput } from "@/lib/analysis/types";
import type { Tier } from "@/lib/inventory/types";
import { generateGraph } from "@/scripts/bench/generate";
import { node } from "./helpers";

function randomEstate(seed: number): AnalysisInput {
  const rand = mulberry32(seed);
  const n = 3 + Math.floor(rand() * 70);
  const pick = (): number => Math.floor(rand() * n);
  const edges: AnalysisEdge[] = [];
  const m = Math.floor(n * (0.5 + rand() * 2));
  // Mostly "needs something older" (a DAG), with a share of back edges that close cycles.
  const cyclic = rand() * 0.3;
  for (let e = 0; e < m; e++) {
    let u = pick();
    let v = pick();
    if (rand() > cyclic && u < v) [u, v] = [v, u];
    const r = rand();
    const strength = r < 0.65 ? "hard" : r < 0.9 ? "soft" : "startup";
    if (rand() < 0.15) {
      // an any_of group of 2–4 members (sometimes naming its own owner, or repeating a member)
      const group = `g${e}`;
      const size = 2 + Math.floor(rand() * 3);
      for (let i = 0; i < size; i++) edges.push({ from: `c${u}`, to: `c${rand() < 0.05 ? u : pick()}`, strength, group });
    } else edges.push({ from: `c${u}`, to: `c${v}`, strength, group: null });
  }
  return {
    nodes: Array.from({ length: n }, (_, i) => node(`c${i}`, { tier: (1 + Math.floor(rand() * 4)) as Tier })),
    edges,
  };
}

function expectSame(input: AnalysisInput, words: number, label: string): void {
  const g = buildGraph(input);
  const fast = singleFailureBlastByLanes(g, { words });
  const ref = singleFailureBlastByPropagation(g);
  expect(Array.from(fast.down), `${label} down`).toEqual(Array.from(ref.down));
  expect(Array.from(fast.degraded), `${label} degraded`).toEqual(Array.from(ref.degraded));
  expect(Array.from(fast.downTierWeight), `${label} tier weight`).toEqual(Array.from(ref.downTierWeight));
}

describe("single-failure blast radius: word-parallel lanes equal the per-source propagation", () => {
  it("on 400 seeded random estates with any_of groups, soft and start-up needs and cycles (one-word blocks)", () => {
    let anyOfInCycles = 0;
    for (let seed = 1; seed <= 400; seed++) {
      const input = randomEstate(seed);
      expectSame(input, 1, `estate ${seed}`);
      // Count the estates where an any_of group's owner and one of its members share a cycle.
      const g = buildGraph(input);
      const { comp } = scc(g);
      const { needs } = g;
      let inside = false;
      for (let k = 0; k < needs.count && !inside; k++) {
        if (needs.size[k]! < 2) continue;
        for (let e = needs.members.offsets[k]!; e < needs.members.offsets[k + 1]!; e++) if (comp[needs.members.targets[e]!] === comp[needs.owner[k]!]) inside = true;
      }
      if (inside) anyOfInCycles++;
    }
    expect(anyOfInCycles).toBeGreaterThan(40);
  });

  it("on the same estates with wider blocks (every source in one block)", () => {
    for (let seed = 1; seed <= 100; seed++) expectSame(randomEstate(seed), 4, `estate ${seed}`);
  });

  it("on a 3,000-component generated estate with 5 % any_of components and a 300-component cycle", () => {
    expectSame(generateGraph({ n: 3000, seed: 5, anyOfShare: 0.05, ring: 300 }), 8, "generated");
  });

  it("on a chain: component i takes down the i components upstream of it", () => {
    const n = 5000;
    const input: AnalysisInput = {
      nodes: Array.from({ length: n }, (_, i) => node(`c${i}`)),
      edges: Array.from({ length: n - 1 }, (_, i) => ({ from: `c${i + 1}`, to: `c${i}`, strength: "hard" as const, group: null })),
    };
    const g = buildGraph(input);
    const r = singleFailureBlastByLanes(g, { words: 4 });
    for (let i = 0; i < n; i++) expect(r.down[g.indexOf.get(`c${i}`)!]).toBe(n - 1 - i);
    // The chooser takes the lanes here (a probe shows the propagation would be quadratic) and agrees.
    expect(Array.from(singleFailureBlast(g, { propagationBudgetMs: 0 }).down)).toEqual(Array.from(r.down));
  });
});
