// DownSets (who goes down, many components in a row, scratch reused) against the one-shot
// blastRadius() of lib/analysis/blast-radius.ts, on seeded random graphs with soft needs and
// any_of groups: the two must give the same down set for every component.
import { describe, expect, it } from "vitest";
import { blastRadius } from "@/lib/analysis/blast-radius";
import { buildGraph } from "@/lib/analysis/graph";
import { mulberry32 } from "@/lib/analysis/random";
import type { AnalysisInput } from "@/lib/analysis/types";
import { DownSets } from "@/lib/impact/down-sets";

function randomInput(seed: number): AnalysisInput {
  const rand = mulberry32(seed);
  const n = 5 + Math.floor(rand() * 40);
  const key = (i: number) => `n${i}`;
  const edges: AnalysisInput["edges"] = [];
  for (let e = 0; e < n * 2; e++) {
    const u = Math.floor(rand() * n);
    const strength = rand() < 0.7 ? "hard" : "soft";
    if (rand() < 0.15) {
      const group = `g${e}`;
      for (let j = 0; j < 2 + Math.floor(rand() * 2); j++) edges.push({ from: key(u), to: key(Math.floor(rand() * n)), strength, group });
    } else edges.push({ from: key(u), to: key(Math.floor(rand() * n)), strength, group: null });
  }
  return { nodes: Array.from({ length: n }, (_, i) => ({ key: key(i), tier: 3, replicas: 1, zones: [], team: null })), edges };
}

describe("DownSets equals blastRadius() for every single failure", () => {
  it("on 200 seeded random graphs with soft needs, any_of groups and self-references", () => {
    let anyOf = 0;
    for (let seed = 1; seed <= 200; seed++) {
      const graph = buildGraph(randomInput(seed));
      anyOf += graph.needs.anyOfCount;
      const sets = new DownSets(graph);
      for (let v = 0; v < graph.n; v++) {
        const expected = blastRadius(graph, { components: [v] }).down.filter((u) => u !== v);
        expect([...sets.of(v)].sort((a, b) => a - b), `seed ${seed} node ${v}`).toEqual(expected);
      }
    }
    expect(anyOf).toBeGreaterThan(100);
  });
});
