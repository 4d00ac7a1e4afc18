// Start-up-only needs (DESIGN §10): boot order uses them; blast radius, drills and the failure
// measures ignore them. Expected values are derived by hand from those rules on graphs small
// enough to check on paper, and cross-checked against networkx on the runtime graph.
import { describe, expect, it } from "vitest";
import { analyse } from "@/lib/analysis";
import { blastRadius } from "@/lib/analysis/blast-radius";
import { buildGraph } from "@/lib/analysis/graph";
import { analysisInputFromContent, effectiveStrength } from "@/lib/analysis/input";
import type { AnalysisEdge } from "@/lib/analysis/types";
import type { SnapshotContent } from "@/lib/inventory/snapshot";
import { hard, node } from "./helpers";

const startup = (from: string, to: string): AnalysisEdge => ({ from, to, strength: "startup", group: null });

// Three services wait for a one-shot schema job at start; the job and the services need the database.
const input = {
  nodes: ["web", "orders", "billing", "schema-job", "db"].map((k) => node(k)),
  edges: [
    hard("web", "orders"),
    hard("web", "billing"),
    startup("orders", "schema-job"),
    startup("billing", "schema-job"),
    hard("orders", "db"),
    hard("billing", "db"),
    hard("schema-job", "db"),
  ],
};

describe("start-up-only needs", () => {
  it("a one-shot job takes nothing down when it is gone", () => {
    const g = buildGraph(input);
    const r = blastRadius(g, { components: [g.indexOf.get("schema-job")!] });
    expect(r.down.map((v) => g.keys[v])).toEqual(["schema-job"]);
    expect(r.degraded).toEqual([]);
  });

  it("the job lies on no runtime path: betweenness 0, and the database is what everything needs", async () => {
    const r = await analyse(input);
    const by = new Map(r.nodes.map((n) => [n.key, n]));
    // Runtime graph web→orders→db, web→billing→db, schema-job→db: by hand (and networkx
    // betweenness_centrality on that DiGraph, normalised by (n-1)(n-2) = 12), orders and billing
    // each carry one of web's two shortest paths to db: 0.5 / 12.
    expect(by.get("schema-job")!.betweenness).toBe(0);
    expect(by.get("orders")!.betweenness).toBeCloseTo(0.5 / 12, 12);
    expect(by.get("schema-job")!.blastDown).toBe(0);
    expect(by.get("db")!.blastDown).toBe(4);
  });

  it("boot order waits for the job: db, then the job, then the services, then web", async () => {
    const r = await analyse(input);
    expect(r.graph.bootOrder.stages.map((s) => [...s].sort())).toEqual([["db"], ["schema-job"], ["billing", "orders"], ["web"]]);
    expect(r.graph.cycles).toEqual([]);
  });

  it("a cycle made only with a start-up need blocks the cold start but is no runtime cycle", async () => {
    const r = await analyse({ nodes: [node("a"), node("b")], edges: [hard("a", "b"), startup("b", "a")] });
    expect(r.graph.cycles).toEqual([]);
    expect(r.graph.bootOrder.cycles.map((c) => [...c].sort())).toEqual([["a", "b"]]);
  });
});

describe("needs known only from configuration or traces", () => {
  const content: SnapshotContent = {
    components: ["api", "db", "cache", "search"].map((key) => ({
      key, name: key, kind: "service" as const, team: null, tier: 3 as const, replicas: 1, zones: [], tags: [], links: {}, source: "s",
    })),
    dependencies: [
      { from: "api", to: "db", strength: "hard", group: null, via: null, source: "s" },
      { from: "api", to: "cache", strength: "hard", group: null, via: "CACHE_URL", source: "s", provenance: ["inferred"] },
      { from: "api", to: "search", strength: "hard", group: null, via: null, source: "s", provenance: ["observed"] },
    ],
  };

  it("inferred needs are hard unless the environment says soft; observed-only ones soft unless it says hard", () => {
    const dflt = analysisInputFromContent(content);
    expect(dflt.edges.map((e) => `${e.to}:${e.strength}`)).toEqual(["db:hard", "cache:hard", "search:soft"]);
    const flipped = analysisInputFromContent(content, { inferredNeeds: "soft", observedNeeds: "hard", analysisView: null });
    expect(flipped.edges.map((e) => `${e.to}:${e.strength}`)).toEqual(["db:hard", "cache:soft", "search:hard"]);
  });

  it("a declared need stays hard whatever else also knows it; a stated soft need is never promoted", () => {
    const s = { inferredNeeds: "soft", observedNeeds: "soft", analysisView: null } as const;
    expect(effectiveStrength({ strength: "hard", provenance: ["declared", "observed"] }, s)).toBe("hard");
    expect(effectiveStrength({ strength: "soft", provenance: ["observed"] }, { ...s, observedNeeds: "hard" })).toBe("soft");
  });

  it("the analysis view keeps declared-or-inferred needs, observed ones, or both", () => {
    const view = (analysisView: "declared" | "observed" | "both") =>
      analysisInputFromContent(content, { inferredNeeds: "hard", observedNeeds: "soft", analysisView }).edges.map((e) => e.to);
    expect(view("declared")).toEqual(["db", "cache"]);
    expect(view("observed")).toEqual(["search"]);
    expect(view("both")).toEqual(["db", "cache", "search"]);
  });
});
