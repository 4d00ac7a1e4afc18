import ELK from "elkjs/lib/elk.bundled.js";
import { describe, expect, it } from "vitest";
import { demoMapGraph } from "./fixtures";
import { buildElkGraph, findOverlap, layoutInputFromView, polylineMidpoint, readElkLayout, toFlow, type LayoutResult } from "@/components/map/layout";
import { NODE_H, NODE_W, TEAM_NODE_W } from "@/components/map/shapes";
import { NO_FILTERS, buildView, teamSlots, type MapView } from "@/components/map/view";

// The reference here is elkjs itself (npm elkjs 0.12): the checks are properties any valid
// layered layout must have (no overlaps, downward edges on a DAG, axis-parallel segments).
const elk = new ELK();

async function layOut(view: MapView): Promise<{ result: LayoutResult; ms: number }> {
  const t0 = performance.now();
  const out = await elk.layout(buildElkGraph(layoutInputFromView(view)));
  const ms = performance.now() - t0;
  return { result: readElkLayout(out), ms };
}

const flat = { byTeam: false, collapsed: new Set<string>() };

describe("ELK graph construction", () => {
  const g = demoMapGraph(60);
  it("flat view: layered, downward, orthogonal, Brandes–Köpf, no hierarchy handling", () => {
    const elkGraph = buildElkGraph(layoutInputFromView(buildView(g, { filters: NO_FILTERS, focus: null, grouping: flat })));
    const o = elkGraph.layoutOptions ?? {};
    expect(o["elk.algorithm"]).toBe("layered");
    expect(o["elk.direction"]).toBe("DOWN");
    expect(o["elk.edgeRouting"]).toBe("ORTHOGONAL");
    expect(o["elk.layered.nodePlacement.strategy"]).toBe("BRANDES_KOEPF");
    expect(Object.values(o)).not.toContain("NETWORK_SIMPLEX");
    expect(Object.values(o)).not.toContain("SPLINES");
    expect(o["elk.hierarchyHandling"]).toBeUndefined();
    expect(elkGraph.children).toHaveLength(g.nodes.length);
    expect(elkGraph.children?.every((c) => c.width === NODE_W && c.height === NODE_H)).toBe(true);
    expect(elkGraph.edges).toHaveLength(new Set(g.edges.map((e) => `${e.from}>${e.to}`)).size);
  });
  it("grouped view: one compound node per team holding its components, hierarchy crossing on", () => {
    const view = buildView(g, { filters: NO_FILTERS, focus: null, grouping: { byTeam: true, collapsed: new Set() } });
    const elkGraph = buildElkGraph(layoutInputFromView(view));
    expect(elkGraph.layoutOptions?.["elk.hierarchyHandling"]).toBe("INCLUDE_CHILDREN");
    const slots = teamSlots(g);
    expect(elkGraph.children?.map((c) => c.id).sort()).toEqual(slots.map((s) => `group:${s}`).sort());
    const childCount = (elkGraph.children ?? []).reduce((s, c) => s + (c.children?.length ?? 0), 0);
    expect(childCount).toBe(g.nodes.length);
    for (const grp of elkGraph.children ?? []) expect(grp.layoutOptions?.["elk.padding"]).toMatch(/top=/);
  });
  it("collapsed teams are leaves with aggregated edges", () => {
    const slots = teamSlots(g);
    const view = buildView(g, { filters: NO_FILTERS, focus: null, grouping: { byTeam: true, collapsed: new Set(slots) } });
    const elkGraph = buildElkGraph(layoutInputFromView(view));
    expect(elkGraph.children).toHaveLength(slots.length);
    expect(elkGraph.children?.every((c) => !c.children && c.width === TEAM_NODE_W)).toBe(true);
    const ids = new Set(elkGraph.children?.map((c) => c.id));
    for (const e of elkGraph.edges ?? []) {
      expect(ids.has(e.sources[0] ?? "")).toBe(true);
      expect(ids.has(e.targets[0] ?? "")).toBe(true);
    }
  });
});

// Generous timeouts: the machine is shared, and these are not speed checks (bench.ts is).
describe("ELK layout of the 150-component fixture (elkjs in Node)", { timeout: 60_000 }, () => {
  const g = demoMapGraph(150);

  it("flat: every component placed, none overlapping, every edge routed, dependents above their needs", async () => {
    const view = buildView(g, { filters: NO_FILTERS, focus: null, grouping: flat });
    const { result, ms } = await layOut(view);
    console.log(`[map] ELK layered, 150-component fixture (${view.items.length} nodes, ${view.edges.length} edges), flat: ${ms.toFixed(0)} ms`);
    const boxes = view.items.map((i) => ({ id: i.id, ...(result.boxes[i.id] ?? { x: NaN, y: NaN, width: 0, height: 0 }) }));
    expect(boxes.every((b) => Number.isFinite(b.x) && Number.isFinite(b.y))).toBe(true);
    expect(findOverlap(boxes)).toBeNull();
    expect(Object.keys(result.routes)).toHaveLength(view.edges.length);
    // The fixture is acyclic apart from one marked cycle, so every other edge must point down.
    for (const e of view.edges) {
      if (e.inCycle) continue;
      const s = result.boxes[e.source];
      const t = result.boxes[e.target];
      expect(s && t && s.y + s.height <= t.y).toBe(true);
    }
    // Orthogonal routing: consecutive route points share an x or a y.
    for (const pts of Object.values(result.routes)) {
      for (let i = 1; i < pts.length; i++) {
        const a = pts[i - 1];
        const b = pts[i];
        expect(a && b && (Math.abs(a.x - b.x) < 1e-6 || Math.abs(a.y - b.y) < 1e-6)).toBe(true);
      }
    }
  });

  it("grouped by team: children inside their group box, groups not overlapping", async () => {
    const view = buildView(g, { filters: NO_FILTERS, focus: null, grouping: { byTeam: true, collapsed: new Set() } });
    const { result, ms } = await layOut(view);
    console.log(`[map] ELK layered, 150-component fixture, grouped into ${view.groups.length} teams: ${ms.toFixed(0)} ms`);
    const groupBoxes = view.groups.map((gr) => ({ id: gr.id, ...(result.boxes[gr.id] ?? { x: NaN, y: NaN, width: 0, height: 0 }) }));
    expect(findOverlap(groupBoxes)).toBeNull();
    const leaves = view.items.map((i) => ({ id: i.id, ...(result.boxes[i.id] ?? { x: NaN, y: NaN, width: 0, height: 0 }) }));
    expect(findOverlap(leaves)).toBeNull();
    for (const item of view.items) {
      if (item.type !== "component" || !item.parent) continue;
      const c = result.boxes[item.id];
      const p = result.boxes[item.parent];
      expect(c && p && c.x >= p.x && c.y >= p.y && c.x + c.width <= p.x + p.width && c.y + c.height <= p.y + p.height).toBe(true);
    }

    // React Flow wants child positions relative to the parent, parents first.
    const { nodes } = toFlow(view, result);
    const firstChild = nodes.findIndex((n) => n.parentId);
    const lastGroup = nodes.map((n) => n.type).lastIndexOf("teamGroup");
    expect(lastGroup).toBeLessThan(firstChild);
    const child = nodes.find((n) => n.parentId);
    if (!child?.parentId) throw new Error("no child node");
    const abs = result.boxes[child.id];
    const par = result.boxes[child.parentId];
    expect(child.position).toEqual({ x: (abs?.x ?? 0) - (par?.x ?? 0), y: (abs?.y ?? 0) - (par?.y ?? 0) });
  });

  it("pinned positions override ELK's and drop the stale routes of their edges", async () => {
    const small = demoMapGraph(20);
    const view = buildView(small, { filters: NO_FILTERS, focus: null, grouping: flat });
    const { result } = await layOut(view);
    const key = view.edges[0]?.source ?? "";
    const { nodes, edges } = toFlow(view, result, { [key]: { x: -500, y: 42 } });
    expect(nodes.find((n) => n.id === key)?.position).toEqual({ x: -500, y: 42 });
    for (const e of edges) {
      if (e.source === key || e.target === key) expect(e.data?.route).toBeNull();
      else expect(e.data?.route).not.toBeNull();
    }
  });
});

describe.skipIf(!process.env.MAP_LAYOUT_BIG)("ELK layout at 2,000 components (set MAP_LAYOUT_BIG=1; slow)", () => {
  it("flat, and the collapsed team view the map opens with", async () => {
    const g = demoMapGraph(2000);
    const full = buildView(g, { filters: NO_FILTERS, focus: null, grouping: flat });
    const a = await layOut(full);
    console.log(`[map] ELK layered, 2,000 components (${full.edges.length} edges), flat: ${a.ms.toFixed(0)} ms`);
    expect(findOverlap(full.items.map((i) => ({ id: i.id, ...(a.result.boxes[i.id] ?? { x: 0, y: 0, width: 0, height: 0 }) })))).toBeNull();
    const slots = teamSlots(g);
    const collapsed = buildView(g, { filters: NO_FILTERS, focus: null, grouping: { byTeam: true, collapsed: new Set(slots) } });
    const b = await layOut(collapsed);
    console.log(`[map] 2,000 components as ${collapsed.items.length} collapsed teams: ${b.ms.toFixed(0)} ms`);
    const oneOpen = buildView(g, { filters: NO_FILTERS, focus: null, grouping: { byTeam: true, collapsed: new Set(slots.slice(1)) } });
    const c = await layOut(oneOpen);
    console.log(`[map] 2,000 components, one team open (${oneOpen.items.length} nodes, ${oneOpen.edges.length} edges): ${c.ms.toFixed(0)} ms`);
  }, 600_000);
});

describe("polyline midpoint", () => {
  it("halfway along an L-shaped route", () => {
    // total length 20: halfway is the corner
    expect(polylineMidpoint([{ x: 0, y: 0 }, { x: 10, y: 0 }, { x: 10, y: 10 }])).toEqual({ x: 10, y: 0 });
    expect(polylineMidpoint([{ x: 0, y: 0 }, { x: 0, y: 8 }])).toEqual({ x: 0, y: 4 });
  });
});
