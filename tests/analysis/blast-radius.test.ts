// Blast radius and drills, by the rules of DESIGN §3: hard needs propagate "down", soft needs
// give "degraded" (which does not propagate), an any_of group is unmet only when every member is
// down, and a zone fails the components whose declared zones have all failed.
import { describe, expect, it } from "vitest";
import { blastRadius } from "@/lib/analysis/blast-radius";
import { singleFailureBlast } from "@/lib/analysis/single-failures";
import { drill } from "@/lib/analysis/drill";
import { buildGraph, type CompactGraph } from "@/lib/analysis/graph";
import type { AnalysisInput } from "@/lib/analysis/types";
import { hard, node, soft } from "./helpers";

// An invented slice of the Harbor Pantry estate (DESIGN §8).
const estate: AnalysisInput = {
  nodes: [
    node("web", { tier: 1, team: "storefront", zones: ["zone-a", "zone-b"], replicas: 3 }),
    node("checkout", { tier: 1, team: "payments", zones: ["zone-a", "zone-b"], replicas: 2 }),
    node("sessions", { tier: 2, team: "identity", zones: ["zone-a"] }),
    node("search-primary", { tier: 2, team: "discovery", zones: ["zone-a"] }),
    node("search-fallback", { tier: 3, team: "discovery", zones: ["zone-b"] }),
    node("recommendations", { tier: 3, team: "discovery", zones: ["zone-b"] }),
    node("orders-db", { tier: 1, team: "payments", zones: ["zone-a", "zone-b"], replicas: 2 }),
    node("bus", { tier: 2, team: "platform", zones: ["zone-a"] }),
    node("dns", { tier: 1, team: "platform" }),
  ],
  edges: [
    hard("web", "sessions"),
    hard("web", "search-primary", "search"),
    hard("web", "search-fallback", "search"),
    soft("web", "recommendations"),
    hard("web", "checkout"),
    hard("checkout", "sessions"),
    hard("checkout", "orders-db"),
    soft("checkout", "bus"),
    hard("recommendations", "bus"),
    hard("search-primary", "dns"),
    hard("search-fallback", "dns"),
    hard("sessions", "dns"),
  ],
};
const g = buildGraph(estate);
const keys = (graph: CompactGraph, vs: number[]): string[] => vs.map((v) => graph.keys[v]!).sort();
const fail = (components: string[], zones: string[] = []) =>
  blastRadius(g, { components: components.map((k) => g.indexOf.get(k)!), zones });

describe("blast radius", () => {
  it("hard needs propagate down transitively", () => {
    const r = fail(["sessions"]);
    expect(keys(g, r.down)).toEqual(["checkout", "sessions", "web"]);
  });

  it("soft needs give degraded, and degraded does not propagate", () => {
    const r = fail(["bus"]);
    expect(keys(g, r.down)).toEqual(["bus", "recommendations"]);
    // checkout needs bus softly → degraded; web needs recommendations (down) softly → degraded;
    // nothing needs checkout's degradation.
    expect(keys(g, r.degraded)).toEqual(["checkout", "web"]);
  });

  it("an any_of group is met while any one member is up", () => {
    expect(keys(g, fail(["search-primary"]).down)).toEqual(["search-primary"]);
    expect(keys(g, fail(["search-primary", "search-fallback"]).down)).toEqual(["search-fallback", "search-primary", "web"]);
  });

  it("a down component is not also degraded", () => {
    const r = fail(["bus", "sessions"]);
    expect(keys(g, r.degraded)).toEqual([]);
    expect(keys(g, r.down)).toEqual(["bus", "checkout", "recommendations", "sessions", "web"]);
  });

  it("a zone fails components whose declared zones all failed; no zones means never failed by a zone", () => {
    const r = fail([], ["zone-a"]);
    expect(keys(g, r.failed)).toEqual(["bus", "search-primary", "sessions"]);
    expect(keys(g, r.down)).toEqual(["bus", "checkout", "recommendations", "search-primary", "sessions", "web"]);
    const both = fail([], ["zone-a", "zone-b"]);
    expect(keys(g, both.failed)).not.toContain("dns");
    expect(keys(g, both.failed)).toContain("orders-db");
  });

  it("everything that reaches the DNS resolver goes down with it", () => {
    expect(keys(g, fail(["dns"]).down)).toEqual(["checkout", "dns", "search-fallback", "search-primary", "sessions", "web"]);
  });

  it("a dependency cycle goes down together", () => {
    const c = buildGraph({ nodes: [node("a"), node("b"), node("c")], edges: [hard("a", "b"), hard("b", "a"), hard("c", "a")] });
    expect(keys(c, blastRadius(c, { components: [0] }).down)).toEqual(["a", "b", "c"]);
  });
});

describe("single-failure blast radius for every component", () => {
  it("equals the drill of each component alone (itself excluded)", () => {
    const all = singleFailureBlast(g);
    for (let v = 0; v < g.n; v++) {
      const r = blastRadius(g, { components: [v] });
      expect(all.down[v], g.keys[v]).toBe(r.down.length - 1);
      expect(all.degraded[v], g.keys[v]).toBe(r.degraded.length);
    }
    // dns takes down checkout (t1), search-fallback (t3), search-primary (t2), sessions (t2), web (t1).
    expect(all.downTierWeight[g.indexOf.get("dns")!]).toBe(8 + 2 + 4 + 4 + 8);
  });

  it("uses only hard propagation: any_of alternatives keep a single failure contained", () => {
    const all = singleFailureBlast(g);
    expect(all.down[g.indexOf.get("search-primary")!]).toBe(0);
    expect(all.down[g.indexOf.get("search-fallback")!]).toBe(0);
  });
});

describe("drill (API shape)", () => {
  it("lists keys, groups by team, counts by tier and reports unknown keys", () => {
    const r = drill(g, { components: ["sessions", "nope"], zones: [] });
    expect(r.down).toEqual(["web", "checkout", "sessions"].sort((a, b) => g.indexOf.get(a)! - g.indexOf.get(b)!));
    expect(r.unknown).toEqual(["nope"]);
    expect(r.byTier).toEqual({ "1": 2, "2": 1, "3": 0, "4": 0 });
    expect(r.teams.map((t) => t.team).sort()).toEqual(["identity", "payments", "storefront"]);
  });

  it("pages by the owner the caller knows, unowned first (nobody is paged for those)", () => {
    // The caller's owners override the graph's: checkout has no owner now, web moved to payments.
    const owners: Record<string, string | null> = { checkout: null, web: "payments" };
    const teamOf = (v: number) => {
      const k = g.keys[v]!;
      return k in owners ? (owners[k] ?? null) : (g.team[v] ?? null);
    };
    const r = drill(g, { components: ["sessions"] }, teamOf);
    expect(r.teams[0]).toMatchObject({ team: null, down: ["checkout"] });
    expect(r.teams.find((t) => t.team === "payments")?.down).toContain("web");
  });
});
