import ELK from "elkjs/lib/elk.bundled.js";
import { describe, expect, it } from "vitest";
import { demoMapGraph } from "./fixtures";
import { findOverlap, type Box } from "@/components/map/layout";
import { HUB_MIN_DEPENDENTS, bundleHubs, composeStored, growInPlace, layoutEstate } from "@/lib/map/estate";
import { NO_FILTERS, buildView, teamSlots } from "@/lib/map/view";

// The reference for positions is elkjs itself (npm elkjs 0.12) and the properties any drawing
// must have: no two boxes overlap, a group holds its members. Hub counts are checked against a
// plain in-degree count of the same view.
const elk = new ELK();
const boxesOf = (r: { boxes: Record<string, Box> }, keep: (id: string) => boolean = () => true) =>
  Object.entries(r.boxes)
    .filter(([id]) => keep(id))
    .map(([id, b]) => ({ id, ...b }));

describe("growInPlace", () => {
  it("grows one box and keeps every pair of boxes apart, whatever the arrangement", () => {
    // A 4×4 grid with irregular gaps and sizes; each box in turn grows a lot.
    for (let grow = 0; grow < 16; grow++) {
      const boxes = new Map<string, Box>();
      for (let i = 0; i < 16; i++) boxes.set(`b${i}`, { x: (i % 4) * 300 + (i % 3) * 17, y: Math.floor(i / 4) * 140 + (i % 2) * 9, width: 220 + (i % 5) * 10, height: 76 });
      growInPlace(boxes, `b${grow}`, { width: 900, height: 600 });
      expect(boxes.get(`b${grow}`)).toMatchObject({ width: 900, height: 600 });
      expect(findOverlap([...boxes].map(([id, b]) => ({ id, ...b })))).toBeNull();
    }
  });
});

describe("bundleHubs", () => {
  it("takes out exactly the lines into components at least HUB_MIN_DEPENDENTS others need", () => {
    const g = demoMapGraph(150);
    const view = buildView(g, { filters: NO_FILTERS, focus: null, grouping: { byTeam: false, collapsed: new Set() } });
    const indegree = new Map<string, number>();
    for (const e of view.edges) indegree.set(e.target, (indegree.get(e.target) ?? 0) + 1);
    const { view: bundled, hubs } = bundleHubs(view);
    const expected = [...indegree].filter(([, d]) => d >= HUB_MIN_DEPENDENTS).map(([k]) => k).sort();
    expect([...hubs.keys()].sort()).toEqual(expected);
    for (const [k, h] of hubs) expect(h.sources.length).toBe(indegree.get(k));
    expect(bundled.edges.length).toBe(view.edges.length - [...hubs.values()].reduce((s, h) => s + h.sources.length, 0));
    expect(bundled.edges.some((e) => hubs.has(e.target))).toBe(false);
  });
});

describe("layouts stored per snapshot and composed in the browser", () => {
  it("covers the team view, one team expanded in place, every team expanded and the flat view, without overlaps", async () => {
    const g = demoMapGraph(150);
    const stored = await layoutEstate({ graph: g, elk });
    const slots = teamSlots(g);
    expect(Object.keys(stored)).toEqual(expect.arrayContaining(["teams", "grouped", "flat", ...slots.map((s) => `team:${s}`)]));

    const teams = composeStored(bundleHubs(buildView(g, { filters: NO_FILTERS, focus: null, grouping: { byTeam: true, collapsed: new Set(slots) } })).view, stored);
    expect(teams && Object.keys(teams.boxes).length).toBe(slots.length);

    const first = slots[0]!;
    const oneOpen = bundleHubs(buildView(g, { filters: NO_FILTERS, focus: null, grouping: { byTeam: true, collapsed: new Set(slots.slice(1)) } })).view;
    const composed = composeStored(oneOpen, stored);
    expect(composed).not.toBeNull();
    const members = oneOpen.items.filter((i) => i.type === "component").map((i) => i.id);
    for (const m of members) expect(composed!.boxes[m]).toBeDefined();
    // Team boxes and the expanded group do not overlap; the members lie inside their group.
    expect(findOverlap(boxesOf(composed!, (id) => id.startsWith("team:") || id.startsWith("group:")))).toBeNull();
    const group = composed!.boxes[`group:${first}`]!;
    for (const m of members) {
      const b = composed!.boxes[m]!;
      expect(b.x >= group.x && b.y >= group.y && b.x + b.width <= group.x + group.width && b.y + b.height <= group.y + group.height).toBe(true);
    }
    expect(findOverlap(boxesOf(composed!, (id) => !id.startsWith("group:") && !id.startsWith("team:")))).toBeNull();

    const allOpen = composeStored(bundleHubs(buildView(g, { filters: NO_FILTERS, focus: null, grouping: { byTeam: true, collapsed: new Set() } })).view, stored);
    expect(allOpen && findOverlap(boxesOf(allOpen, (id) => id.startsWith("group:")))).toBeNull();
    expect(allOpen && Object.keys(allOpen.boxes).length).toBe(g.nodes.length + slots.length);

    const flat = composeStored(bundleHubs(buildView(g, { filters: NO_FILTERS, focus: null, grouping: { byTeam: false, collapsed: new Set() } })).view, stored);
    expect(flat && Object.keys(flat.boxes).length).toBe(g.nodes.length);
  });

  it("answers null when the stored team no longer matches (an owner changed): the browser lays it out", async () => {
    const g = demoMapGraph(60);
    const stored = await layoutEstate({ graph: g, elk });
    const moved = { ...g, nodes: g.nodes.map((n, i) => (i === 0 ? { ...n, team: "someone-else" } : n)) };
    const slots = teamSlots(moved);
    const view = bundleHubs(buildView(moved, { filters: NO_FILTERS, focus: null, grouping: { byTeam: true, collapsed: new Set() } })).view;
    expect(composeStored(view, stored)).toBeNull();
    expect(slots).toContain("someone-else");
  });
});
