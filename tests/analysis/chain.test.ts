// "Why does A depend on B": the chain graphology-shortest-path finds is a shortest path, checked
// against networkx.shortest_path_length (Debian's python3-networkx, run in the test) on seeded
// random graphs; start-up-only needs are not part of it.
import { execFileSync } from "node:child_process";
import { describe, expect, it } from "vitest";
import { needChain, toGraphology } from "@/lib/analysis/chain";
import { buildGraph } from "@/lib/analysis/graph";
import { mulberry32 } from "@/lib/analysis/random";
import { directed } from "./helpers";

const PYTHON = process.env.PINCHPOINT_PYTHON ?? "/usr/bin/python3";

describe("needChain", () => {
  it("follows needs, not dependents, and leaves start-up-only needs out", () => {
    const g = buildGraph({
      nodes: ["web", "api", "db", "migrate"].map((key) => ({ key, tier: 3, replicas: 1, zones: [], team: null })),
      edges: [
        { from: "web", to: "api", strength: "hard", group: null },
        { from: "api", to: "db", strength: "soft", group: null },
        { from: "web", to: "migrate", strength: "startup", group: null },
        { from: "migrate", to: "db", strength: "hard", group: null },
      ],
    });
    const gg = toGraphology(g);
    expect(needChain(gg, "web", "db")).toEqual(["web", "api", "db"]);
    expect(needChain(gg, "db", "web")).toBeNull();
    expect(needChain(gg, "web", "migrate")).toBeNull();
    expect(needChain(gg, "web", "nowhere")).toBeNull();
  });

  it("is a shortest path: its length equals networkx.shortest_path_length on 50 seeded random graphs", () => {
    const rand = mulberry32(42);
    const cases = Array.from({ length: 50 }, () => {
      const n = 30;
      const pairs: Array<[string, string]> = [];
      for (let u = 0; u < n; u++) for (let k = 0; k < 2; k++) {
        const v = Math.floor(rand() * n);
        if (v !== u) pairs.push([String(u), String(v)]);
      }
      return { n, pairs, queries: Array.from({ length: 10 }, () => [String(Math.floor(rand() * n)), String(Math.floor(rand() * n))]) };
    });
    const script = `
import json, sys, networkx as nx
out = []
for c in json.loads(sys.stdin.read()):
    G = nx.DiGraph(); G.add_nodes_from(str(i) for i in range(c["n"])); G.add_edges_from(map(tuple, c["pairs"]))
    out.append([nx.shortest_path_length(G, a, b) if nx.has_path(G, a, b) else None for a, b in c["queries"]])
print(json.dumps(out))`;
    const ref = JSON.parse(execFileSync(PYTHON, ["-c", script], { input: JSON.stringify(cases), encoding: "utf8" })) as Array<Array<number | null>>;
    cases.forEach((c, i) => {
      const gg = toGraphology(buildGraph(directed(c.pairs, Array.from({ length: c.n }, (_, k) => String(k)))));
      c.queries.forEach(([a, b], j) => {
        const path = needChain(gg, a!, b!);
        expect(path === null ? null : path.length - 1).toBe(ref[i]![j]);
        if (path) for (let h = 0; h + 1 < path.length; h++) expect(gg.hasDirectedEdge(path[h]!, path[h + 1]!)).toBe(true);
      });
    });
  });
});
