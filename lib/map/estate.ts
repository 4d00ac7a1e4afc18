// The map at estate scale: hub bundling, the layouts the worker computes once per snapshot, and
// how the browser composes any team-grouped view from them without running ELK again.
//
// Why our own composition rather than one ELK run per view: ELK layered grows faster than linearly
// (measured on this machine: 2,000 components in one run ≈ 40–60 s, 1,459 links between 41 teams
// ≈ 4 s), while each team on its own is small (the 41 teams of a 2,000-component estate in ≈ 2 s
// together). So the worker lays out each team's members alone, then the teams as boxes, and a view
// with some teams expanded is those pieces put together: growing a team box in place and moving
// every box right of it or below it out of the way (a monotone shift keeps boxes from overlapping).
import type { ElkNode } from "elkjs/lib/elk-api";
import type { MapGraph } from "@/lib/api/schemas/map";
import { GROUP_PAD, TEAM_NODE_H, TEAM_NODE_W, buildElkGraph, layoutInputFromView, readElkLayout, type Box, type LayoutInput, type LayoutResult } from "./elk";
import { NO_FILTERS, UNOWNED, groupNodeId, groupSelection, selectComponents, teamNodeId, teamSlots, type MapView, type Selection } from "./view";

/** A component (or team) that at least this many others on the view need is drawn as a hub: a count marker, not a fan of lines. */
export const HUB_MIN_DEPENDENTS = 12;
/** Above this many components the map opens on the team-to-team view. */
export const TEAM_VIEW_ABOVE = 120;
/** Up to this many components the worker also stores a flat (ungrouped) layout of the whole estate. */
const FLAT_STORED_LIMIT = 600;

export interface HubBundle {
  /** the needed node's id on the view */
  target: string;
  /** who needs it, with how many component-level needs each stands for */
  sources: { id: string; count: number; inCycle: boolean }[];
  /** component-level needs bundled */
  needs: number;
}

/**
 * Edges into hubs taken out of the view (and out of the layout: a fan of 97 lines into one node is
 * what made the layout slow and the picture unreadable); each hub keeps the list of its dependents.
 */
export function bundleHubs(view: MapView, min = HUB_MIN_DEPENDENTS): { view: MapView; hubs: Map<string, HubBundle> } {
  const incoming = new Map<string, number>();
  for (const e of view.edges) incoming.set(e.target, (incoming.get(e.target) ?? 0) + 1);
  const hubs = new Map<string, HubBundle>();
  const edges = view.edges.filter((e) => {
    if ((incoming.get(e.target) ?? 0) < min) return true;
    let hub = hubs.get(e.target);
    if (!hub) {
      hub = { target: e.target, sources: [], needs: 0 };
      hubs.set(e.target, hub);
    }
    hub.sources.push({ id: e.source, count: e.count, inCycle: e.inCycle });
    hub.needs += e.count;
    return false;
  });
  for (const h of hubs.values()) h.sources.sort((a, b) => b.count - a.count || a.id.localeCompare(b.id));
  return { view: { ...view, edges }, hubs };
}

/** Positions stored for one view of one snapshot (coordinates rounded: whole pixels are plenty). */
type StoredView = LayoutResult;

/**
 * Views the worker stores per snapshot:
 * - `teams`: every team collapsed, boxes keyed `team:<slot>`;
 * - `grouped`: every team expanded, one box per team keyed `group:<slot>` (members come from `team:<slot>`);
 * - `team:<slot>`: one team's members laid out alone, origin at the group's content corner;
 * - `flat`: the whole estate ungrouped (small estates only).
 */
export type StoredViews = Record<string, StoredView>;

export interface ElkLike {
  layout(graph: ElkNode): Promise<ElkNode>;
}

function round(result: LayoutResult): LayoutResult {
  const r = (v: number) => Math.round(v);
  const boxes: Record<string, Box> = {};
  for (const [id, b] of Object.entries(result.boxes)) boxes[id] = { x: r(b.x), y: r(b.y), width: r(b.width), height: r(b.height) };
  const routes: LayoutResult["routes"] = {};
  for (const [id, pts] of Object.entries(result.routes)) routes[id] = pts.map((p) => ({ x: r(p.x), y: r(p.y) }));
  return { boxes, routes, width: r(result.width), height: r(result.height) };
}

async function run(elk: ElkLike, input: LayoutInput): Promise<LayoutResult> {
  if (input.nodes.length === 0) return { boxes: {}, routes: {}, width: 0, height: 0 };
  return round(readElkLayout(await elk.layout(buildElkGraph(input))));
}

/** A group's outer size from its members' layout. */
function groupSize(inner: Pick<LayoutResult, "width" | "height">): { width: number; height: number } {
  return { width: inner.width + GROUP_PAD.left + GROUP_PAD.right, height: inner.height + GROUP_PAD.top + GROUP_PAD.bottom };
}

/**
 * Every stored view of an estate. `pause` runs between ELK calls (the worker yields its event loop
 * there, so heartbeats keep going while a 10,000-component estate is laid out team by team).
 */
export async function layoutEstate({
  graph,
  elk,
  pause = async () => undefined,
}: {
  graph: Pick<MapGraph, "nodes" | "edges" | "teams">;
  elk: ElkLike;
  pause?: () => Promise<void>;
}): Promise<StoredViews> {
  const full = graph as MapGraph;
  const all = selectComponents(full, NO_FILTERS, null);
  const slots = teamSlots(full);
  const views: StoredViews = {};

  // Each team alone, bundled as the browser bundles a one-team view.
  const bySlot = new Map<string, Set<string>>();
  for (const n of all.nodes) {
    const slot = n.team ?? UNOWNED;
    const set = bySlot.get(slot) ?? new Set<string>();
    set.add(n.key);
    bySlot.set(slot, set);
  }
  for (const slot of slots) {
    const members = bySlot.get(slot) ?? new Set<string>();
    const selection: Selection = { nodes: all.nodes.filter((n) => members.has(n.key)), edges: all.edges.filter((e) => members.has(e.from) && members.has(e.to)), focus: null };
    const view = bundleHubs(groupSelection(full, selection, { byTeam: false, collapsed: new Set() })).view;
    views[teamNodeId(slot)] = await run(elk, layoutInputFromView(view));
    await pause();
  }

  // Teams as boxes: collapsed, and at their expanded sizes.
  const teamView = bundleHubs(groupSelection(full, all, { byTeam: true, collapsed: new Set(slots) })).view;
  views.teams = await run(elk, layoutInputFromView(teamView));
  await pause();
  const expanded: LayoutInput = {
    nodes: teamView.items.map((i) => {
      const slot = i.type === "team" ? i.team : i.id;
      const inner = views[teamNodeId(slot)] ?? { width: 0, height: 0 };
      return { id: groupNodeId(slot), ...groupSize(inner), parent: null };
    }),
    groups: [],
    edges: teamView.edges.map((e) => ({ id: e.id, source: e.source.replace(/^team:/, "group:"), target: e.target.replace(/^team:/, "group:") })),
  };
  views.grouped = await run(elk, expanded);
  await pause();

  if (all.nodes.length <= FLAT_STORED_LIMIT) {
    views.flat = await run(elk, layoutInputFromView(bundleHubs(groupSelection(full, all, { byTeam: false, collapsed: new Set() })).view));
  }
  return views;
}

/**
 * Grow `id`'s box to `size` in place: boxes entirely right of it move right by the growth in
 * width, boxes entirely below it move down by the growth in height (both when both). The shift is
 * monotone in x and in y, so boxes that did not overlap still do not, and nothing overlaps the
 * grown box (a box left unmoved lies above it or left of it).
 */
export function growInPlace(boxes: Map<string, Box>, id: string, size: { width: number; height: number }): void {
  const b = boxes.get(id);
  if (!b) return;
  const dw = Math.max(0, size.width - b.width);
  const dh = Math.max(0, size.height - b.height);
  const right = b.x + b.width;
  const bottom = b.y + b.height;
  for (const [other, o] of boxes) {
    if (other === id) continue;
    const dx = o.x >= right ? dw : 0;
    const dy = o.y >= bottom ? dh : 0;
    if (dx || dy) boxes.set(other, { ...o, x: o.x + dx, y: o.y + dy });
  }
  boxes.set(id, { ...b, width: b.width + dw, height: b.height + dh });
}

/**
 * The layout of `view` made from stored views, or null when they do not cover it (a filter or focus,
 * an owner changed since the snapshot was laid out, layouts not computed yet): the browser then
 * lays the view out itself.
 */
export function composeStored(view: MapView, stored: StoredViews | null): LayoutResult | null {
  if (!stored) return null;
  const teamItems = view.items.filter((i) => i.type === "team");
  const grouped = view.groups.length > 0 || teamItems.length > 0;
  if (!grouped) {
    const flat = stored.flat;
    if (!flat || view.items.some((i) => !flat.boxes[i.id])) return null;
    return flat;
  }
  if (view.items.some((i) => i.type === "component" && !i.parent)) return null;

  // Members of each expanded group must be exactly the stored team's.
  const membersOf = new Map<string, string[]>();
  for (const i of view.items) if (i.type === "component" && i.parent) membersOf.set(i.parent, [...(membersOf.get(i.parent) ?? []), i.id]);
  const inners = new Map<string, StoredView>();
  for (const g of view.groups) {
    const inner = stored[teamNodeId(g.team)];
    const members = membersOf.get(g.id) ?? [];
    if (!inner || Object.keys(inner.boxes).length !== members.length || members.some((m) => !inner.boxes[m])) return null;
    inners.set(g.id, inner);
  }

  const allExpanded = teamItems.length === 0 && stored.grouped !== undefined;
  const base = allExpanded ? stored.grouped : stored.teams;
  if (!base) return null;
  const boxes = new Map<string, Box>();
  for (const t of teamItems) {
    const b = base.boxes[t.id];
    if (!b) return null;
    boxes.set(t.id, b);
  }
  for (const g of view.groups) {
    const b = base.boxes[allExpanded ? g.id : teamNodeId(g.team)];
    if (!b) return null;
    boxes.set(g.id, allExpanded ? b : { ...b, width: TEAM_NODE_W, height: TEAM_NODE_H });
  }
  if (!allExpanded) {
    // Top-left first, so each growth pushes only what lies beyond it.
    const order = [...view.groups].sort((a, b) => {
      const ba = boxes.get(a.id);
      const bb = boxes.get(b.id);
      return (ba?.y ?? 0) - (bb?.y ?? 0) || (ba?.x ?? 0) - (bb?.x ?? 0);
    });
    for (const g of order) growInPlace(boxes, g.id, groupSize(inners.get(g.id) ?? { width: 0, height: 0 }));
  }

  const out: Record<string, Box> = {};
  const routes: LayoutResult["routes"] = {};
  let width = 0;
  let height = 0;
  for (const [id, b] of boxes) {
    out[id] = b;
    width = Math.max(width, b.x + b.width);
    height = Math.max(height, b.y + b.height);
  }
  // Routes between teams only while nothing moved; once a box grows they would be stale.
  if (view.groups.length === 0) Object.assign(routes, base.routes);
  for (const g of view.groups) {
    const gb = boxes.get(g.id);
    const inner = inners.get(g.id);
    if (!gb || !inner) continue;
    const ox = gb.x + GROUP_PAD.left;
    const oy = gb.y + GROUP_PAD.top;
    for (const [id, b] of Object.entries(inner.boxes)) out[id] = { ...b, x: b.x + ox, y: b.y + oy };
    for (const [id, pts] of Object.entries(inner.routes)) routes[id] = pts.map((p) => ({ x: p.x + ox, y: p.y + oy }));
  }
  return { boxes: out, routes, width, height };
}
