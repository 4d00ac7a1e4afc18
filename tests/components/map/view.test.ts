import { describe, expect, it } from "vitest";
import type { MapEdge, MapGraph, MapNode } from "@/components/map/types";
import {
  NO_FILTERS,
  UNOWNED,
  applyFilters,
  buildAdjacency,
  buildView,
  layoutSignature,
  neighbourhood,
  teamNodeId,
} from "@/components/map/view";

function node(key: string, over: Partial<MapNode> = {}): MapNode {
  return { key, name: key, kind: "service", team: "t1", tier: 3, replicas: 2, zones: ["a", "b"], undeclared: false, metrics: null, ...over };
}
function edge(from: string, to: string, over: Partial<MapEdge> = {}): MapEdge {
  return { from, to, strength: "hard", group: null, inCycle: false, ...over };
}
function graph(nodes: MapNode[], edges: MapEdge[]): MapGraph {
  return { environment: "production", snapshot: null, nodes, edges, teams: [{ slug: "t1", name: "Team one" }, { slug: "t2", name: "Team two" }] };
}

// A chain with a side branch: a → b → c → d → e, x → c, c → y.
// Expected sets are worked by hand: they equal the union of NetworkX
// single_source_shortest_path_length(G, "c", cutoff=N) and the same on G.reverse().
const chain = graph(
  ["a", "b", "c", "d", "e", "x", "y", "z"].map((k) => node(k)),
  [edge("a", "b"), edge("b", "c"), edge("c", "d"), edge("d", "e"), edge("x", "c"), edge("c", "y"), edge("z", "a")],
);

describe("focus neighbourhood", () => {
  const adj = buildAdjacency(chain.edges);
  it("1 hop takes direct needs and direct dependents", () => {
    expect([...neighbourhood(adj, "c", 1)].sort()).toEqual(["b", "c", "d", "x", "y"]);
  });
  it("2 hops follow each direction separately", () => {
    expect([...neighbourhood(adj, "c", 2)].sort()).toEqual(["a", "b", "c", "d", "e", "x", "y"]);
  });
  it("3 hops reach z, a dependent of a dependent of a dependent", () => {
    expect([...neighbourhood(adj, "c", 3)].sort()).toEqual(["a", "b", "c", "d", "e", "x", "y", "z"]);
  });
  it("does not mix directions: a dependent's other needs stay out", () => {
    // b needs c and also q; q is neither a need nor a dependent of c.
    const g = buildAdjacency([edge("b", "c"), edge("b", "q")]);
    expect([...neighbourhood(g, "c", 3)].sort()).toEqual(["b", "c"]);
  });
  it("terminates on cycles", () => {
    const g = buildAdjacency([edge("p", "q"), edge("q", "p")]);
    expect([...neighbourhood(g, "p", 3)].sort()).toEqual(["p", "q"]);
  });
  it("focus through buildView keeps only the induced edges", () => {
    const v = buildView(chain, { filters: NO_FILTERS, focus: { key: "c", hops: 1 }, grouping: { byTeam: false, collapsed: new Set() } });
    expect(v.items.map((i) => i.id).sort()).toEqual(["b", "c", "d", "x", "y"]);
    expect(v.edges.map((e) => e.id).sort()).toEqual(["b->c", "c->d", "c->y", "x->c"]);
    expect(v.focus).toBe("c");
  });
});

describe("filters", () => {
  const g = graph(
    [
      node("web", { team: "t1", tier: 1, kind: "gateway" }),
      node("api", { team: "t1", tier: 2 }),
      node("db", { team: "t2", tier: 1, kind: "datastore" }),
      node("orphan", { team: null, tier: 4, kind: "job" }),
    ],
    [edge("web", "api"), edge("api", "db"), edge("api", "orphan", { strength: "soft" })],
  );
  it("team filter, with unowned as its own slot", () => {
    const r = applyFilters(g, { ...NO_FILTERS, teams: new Set(["t2", UNOWNED]) });
    expect(r.nodes.map((n) => n.key)).toEqual(["db", "orphan"]);
    expect(r.edges).toEqual([]);
  });
  it("tier and kind filters combine (AND)", () => {
    const r = applyFilters(g, { ...NO_FILTERS, tiers: new Set([1]), kinds: new Set(["datastore"]) });
    expect(r.nodes.map((n) => n.key)).toEqual(["db"]);
  });
  it("edge strength filter drops edges, not nodes", () => {
    const r = applyFilters(g, { ...NO_FILTERS, soft: false });
    expect(r.nodes).toHaveLength(4);
    expect(r.edges.map((e) => `${e.from}>${e.to}`)).toEqual(["web>api", "api>db"]);
    const hardOff = applyFilters(g, { ...NO_FILTERS, hard: false });
    expect(hardOff.edges.map((e) => `${e.from}>${e.to}`)).toEqual(["api>orphan"]);
  });
  it("the focused component survives a filter that would hide it", () => {
    const v = buildView(g, { filters: { ...NO_FILTERS, teams: new Set(["t2"]) }, focus: { key: "api", hops: 1 }, grouping: { byTeam: false, collapsed: new Set() } });
    expect(v.items.map((i) => i.id).sort()).toEqual(["api", "db"]);
  });
});

describe("team grouping", () => {
  const g = graph(
    [node("a1", { team: "t1" }), node("a2", { team: "t1" }), node("b1", { team: "t2" }), node("b2", { team: "t2" }), node("u", { team: null })],
    [
      edge("a1", "a2"),
      edge("a1", "b1", { strength: "soft" }),
      edge("a2", "b1"),
      edge("a2", "b2", { strength: "soft", inCycle: true }),
      edge("a2", "b2", { strength: "soft", group: "g1" }), // repeated pair: counts once
      edge("b2", "u"),
    ],
  );
  it("expanded teams are compound groups holding their components", () => {
    const v = buildView(g, { filters: NO_FILTERS, focus: null, grouping: { byTeam: true, collapsed: new Set() } });
    expect(v.groups.map((x) => [x.id, x.memberCount])).toEqual([["group:t1", 2], ["group:t2", 2], [`group:${UNOWNED}`, 1]]);
    expect(v.items.filter((i) => i.type === "component" && i.parent === "group:t1").map((i) => i.id)).toEqual(["a1", "a2"]);
    expect(v.edges).toHaveLength(5);
  });
  it("a collapsed team is one node; edges aggregate with counts, strongest strength and cycle flag", () => {
    const v = buildView(g, { filters: NO_FILTERS, focus: null, grouping: { byTeam: true, collapsed: new Set(["t2"]) } });
    const team = v.items.find((i) => i.id === teamNodeId("t2"));
    expect(team?.type === "team" && team.members).toEqual(["b1", "b2"]);
    const byId = new Map(v.edges.map((e) => [e.id, e]));
    // a1→b1 (soft) becomes a1→team:t2 soft; a2→b1 hard + a2→b2 soft become one hard edge of count 2
    expect(byId.get("a1->team:t2")).toMatchObject({ strength: "soft", count: 1, inCycle: false });
    expect(byId.get("a2->team:t2")).toMatchObject({ strength: "hard", count: 2, inCycle: true });
    expect(byId.get(`team:t2->u`)).toMatchObject({ count: 1 });
    expect(byId.has("a1->a2")).toBe(true);
    expect(v.componentCount).toBe(5);
  });
  it("edges inside a collapsed team vanish; two collapsed teams link once", () => {
    const v = buildView(g, { filters: NO_FILTERS, focus: null, grouping: { byTeam: true, collapsed: new Set(["t1", "t2"]) } });
    expect(v.edges.map((e) => [e.id, e.count]).sort()).toEqual([["team:t1->team:t2", 3], ["team:t2->u", 1]]);
  });
  it("the focused component's team is never collapsed", () => {
    const v = buildView(g, { filters: NO_FILTERS, focus: { key: "b1", hops: 1 }, grouping: { byTeam: true, collapsed: new Set(["t1", "t2"]) } });
    expect(v.items.some((i) => i.id === "b1")).toBe(true);
    expect(v.items.some((i) => i.id === teamNodeId("t1"))).toBe(true);
  });
  it("layout signature changes with structure only", () => {
    const opts = { filters: NO_FILTERS, focus: null, grouping: { byTeam: true, collapsed: new Set(["t2"]) } };
    expect(layoutSignature(buildView(g, opts))).toBe(layoutSignature(buildView(g, opts)));
    expect(layoutSignature(buildView(g, { ...opts, grouping: { byTeam: true, collapsed: new Set<string>() } }))).not.toBe(
      layoutSignature(buildView(g, opts)),
    );
  });
});
