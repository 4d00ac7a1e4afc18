// The pinch score of DESIGN §3, worked by hand.
import { describe, expect, it } from "vitest";
import { singleFailureBlast } from "@/lib/analysis/single-failures";
import { buildGraph } from "@/lib/analysis/graph";
import { isSinglePoint, pinchScores } from "@/lib/analysis/pinch-score";
import { hard, node } from "./helpers";

describe("pinch score", () => {
  // web (t1) → api (t2) → db (t1, 2 replicas in 2 zones); batch (t4) → db.
  const g = buildGraph({
    nodes: [
      node("web", { tier: 1, replicas: 3, zones: ["zone-a", "zone-b"] }),
      node("api", { tier: 2, replicas: 1, zones: ["zone-a"] }),
      node("db", { tier: 1, replicas: 2, zones: ["zone-a", "zone-b"] }),
      node("batch", { tier: 4, replicas: 2, zones: ["zone-a"] }),
    ],
    edges: [hard("web", "api"), hard("api", "db"), hard("batch", "db")],
  });
  // Betweenness given by hand: only api lies between web and db.
  const bc = Float64Array.from([0, 1 / 6, 0, 0]);
  const blast = singleFailureBlast(g);
  const p = pinchScores(g, bc, blast.downTierWeight);

  it("worked example with the default weights 0.4 / 0.4 / 0.2", () => {
    // Σ tier weights = 8 + 4 + 8 + 1 = 21.
    // api: B = 1, R = web's 8 / 21, S = 1 (one replica) → 100(0.4 + 0.4·8/21 + 0.2) = 75.238…
    expect(p.score[1]).toBeCloseTo(100 * (0.4 + (0.4 * 8) / 21 + 0.2), 10);
    // db: B = 0, R = (api 4 + web 8 + batch 1)/21, S = 0 → 100·0.4·13/21 = 24.761…
    expect(p.score[2]).toBeCloseTo((100 * 0.4 * 13) / 21, 10);
    // batch: B = 0, R = 0, S = 1 (one zone) → 20; web: nothing needs it, 3 replicas in 2 zones → 0.
    expect(p.score[3]).toBeCloseTo(20, 10);
    expect(p.score[0]).toBe(0);
  });

  it("takes the environment's weights", () => {
    const q = pinchScores(g, bc, blast.downTierWeight, { betweenness: 1, reach: 0, single: 0 });
    expect(Array.from(q.score)).toEqual([0, 100, 0, 0]);
  });

  it("common practice: a single instance in a single zone is a single point of failure (S = 1)", () => {
    expect(isSinglePoint(1, ["zone-a"])).toBe(true);
    expect(isSinglePoint(3, ["zone-a"])).toBe(true);
    expect(isSinglePoint(1, ["zone-a", "zone-b"])).toBe(true);
    expect(isSinglePoint(3, [])).toBe(true);
    expect(isSinglePoint(2, ["zone-a", "zone-b"])).toBe(false);
  });
});
