// Dominators with several entry points and all of them together as a virtual root, against
// networkx.immediate_dominators computed in this run (tests/analysis/reference/
// dominators_reference.py; the virtual root is a node added with an edge to every entry).
import { beforeAll, describe, expect, it } from "vitest";
import { analyse } from "@/lib/analysis";
import { dominators, dominatorTree, entryRoots } from "@/lib/analysis/dominators";
import { buildGraph, type CompactGraph } from "@/lib/analysis/graph";
import { mulberry32 } from "@/lib/analysis/random";
import type { AnalysisInput } from "@/lib/analysis/types";
import type { Tier } from "@/lib/inventory/types";
import { node } from "./helpers";
import { runReference } from "./python";

interface Case {
  id: number;
  n: number;
  edges: Array<[number, number]>;
  entries: number[];
}

interface Reference {
  id: number;
  perEntry: Record<string, Record<string, number>>;
  reachedFrom: number[];
  dominatesFrom: number[];
  maxDominated: number[];
  allIdom: number[];
  allDominated: number[];
}

/** A layered estate: a few front doors (tier 1, nothing needs them) over shared services, with some cycles. */
function estate(id: number): { input: AnalysisInput; case: Omit<Case, "entries"> } {
  const rand = mulberry32(500 + id);
  const n = 12 + Math.floor(rand() * 60);
  const fronts = 2 + Math.floor(rand() * 5);
  const edges: Array<[number, number]> = [];
  for (let v = 0; v < n; v++) {
    const k = 1 + Math.floor(rand() * 3);
    for (let i = 0; i < k; i++) {
      // Mostly needs further down (higher ids), sometimes back up (a cycle), never onto a front door.
      const back = rand() < 0.08;
      const lo = back ? fronts : Math.max(fronts, v + 1);
      if (lo >= n) continue;
      edges.push([v, lo + Math.floor(rand() * (n - lo))]);
    }
  }
  const tiers = Array.from({ length: n }, (_, v) => (v < fronts ? 1 : ((2 + Math.floor(rand() * 3)) as Tier)));
  // A tier-1 component deeper down that something needs is not an entry.
  if (n > fronts + 1) tiers[fronts + 1] = 1;
  const input: AnalysisInput = {
    nodes: Array.from({ length: n }, (_, v) => node(String(v), { tier: tiers[v] as Tier })),
    edges: edges.map(([u, v]) => ({ from: String(u), to: String(v), strength: "hard", group: null })),
  };
  return { input, case: { id, n, edges } };
}

const CASES = Array.from({ length: 120 }, (_, id) => estate(id));

describe("dominators per entry point and for all entries together, against networkx.immediate_dominators", () => {
  const graphs = new Map<number, CompactGraph>();
  let refs: Reference[] = [];
  beforeAll(() => {
    const cases: Case[] = CASES.map(({ input, case: c }) => {
      const g = buildGraph(input);
      graphs.set(c.id, g);
      return { ...c, entries: entryRoots(g).map((v) => Number(g.keys[v])) };
    });
    expect(cases.filter((c) => c.entries.length >= 2).length).toBeGreaterThan(100);
    refs = runReference<{ results: Reference[] }>("dominators_reference.py", { cases }).results;
  }, 60_000);

  const key = (g: CompactGraph, v: number): number => Number(g.keys[v]);
  const byId = (g: CompactGraph, values: ArrayLike<number>): number[] => {
    const out = new Array<number>(g.n);
    for (let v = 0; v < g.n; v++) out[key(g, v)] = values[v]!;
    return out;
  };

  it("each entry's immediate dominators are networkx's", () => {
    for (const r of refs) {
      const g = graphs.get(r.id)!;
      for (const [entry, expected] of Object.entries(r.perEntry)) {
        const t = dominatorTree(g, g.indexOf.get(entry)!);
        const ours: Record<string, number> = {};
        t.nodes.forEach((v, i) => (ours[g.keys[v]!] = key(g, t.idom[i]!)));
        expect(ours, `graph ${r.id} entry ${entry}`).toEqual(expected);
      }
    }
  });

  it("the virtual root's immediate dominators and dominated counts are networkx's on the graph with that root added", () => {
    for (const r of refs) {
      const g = graphs.get(r.id)!;
      const d = dominators(g);
      expect(byId(g, Array.from(d.allIdom, (x) => (x < 0 ? -1 : key(g, x)))), `graph ${r.id}`).toEqual(r.allIdom);
      expect(byId(g, d.allDominated), `graph ${r.id}`).toEqual(r.allDominated);
    }
  });

  it("per node: entries reaching it, entries it dominates something from, and the most from one entry", () => {
    for (const r of refs) {
      const g = graphs.get(r.id)!;
      const d = dominators(g);
      expect(byId(g, d.reachedFrom), `graph ${r.id}`).toEqual(r.reachedFrom);
      expect(byId(g, d.dominatesFrom), `graph ${r.id}`).toEqual(r.dominatesFrom);
      expect(byId(g, d.maxDominated), `graph ${r.id}`).toEqual(r.maxDominated);
      expect(d.complete).toBe(true);
    }
  });
});

describe("what the analysis hands the screens", () => {
  // checkout-web and search-web are the entries; sessions sits on every path from checkout-web to
  // the session store, so it dominates it from that entry and (being needed by checkout-web only)
  // from all entries together too.
  it("names the entries a component dominates from and stops honestly at the work limit", async () => {
    const input: AnalysisInput = {
      nodes: ["checkout-web", "search-web", "sessions", "session-store", "catalog", "dns"].map((k) =>
        node(k, { tier: k.endsWith("-web") ? 1 : 2 }),
      ),
      edges: [
        ["checkout-web", "sessions"],
        ["sessions", "session-store"],
        ["checkout-web", "catalog"],
        ["search-web", "catalog"],
        ["catalog", "dns"],
        ["session-store", "dns"],
      ].map(([from, to]) => ({ from: from!, to: to!, strength: "hard" as const, group: null })),
    };
    const r = await analyse(input);
    const sessions = r.nodes.find((n) => n.key === "sessions")!;
    expect(sessions.dominator.topEntries).toEqual([{ entry: "checkout-web", dominated: 1 }]);
    expect(sessions.dominator.allIdom).toBe("checkout-web");
    expect(r.nodes.find((n) => n.key === "catalog")!.dominator.dominatesFrom).toBe(1); // dns, from search-web
    const limited = await analyse(input, { dominatorWorkLimit: 0 });
    expect(limited.graph.dominators).toEqual({ roots: ["checkout-web", "search-web"], complete: false, entriesAnalysed: 1 });
  });
});
