// Pure layout plumbing: view → ELK graph → positions → React Flow nodes and edges.
// ELK itself runs elsewhere (layout.worker.ts in the browser, elk.bundled.js in tests).
import type { Edge, Node } from "@xyflow/react";
import type { ElkExtendedEdge, ElkNode } from "elkjs/lib/elk-api";
import { GROUP_HEADER, NODE_H, NODE_W, TEAM_NODE_H, TEAM_NODE_W } from "./shapes";
import type { PinnedPositions, Position } from "./types";
import type { MapView, ViewEdge, ViewGroup, ViewItem } from "./view";

export interface LayoutInput {
  nodes: { id: string; width: number; height: number; parent: string | null }[];
  groups: { id: string }[];
  edges: { id: string; source: string; target: string }[];
}

export interface Box {
  x: number;
  y: number;
  width: number;
  height: number;
}

/** Absolute coordinates for every laid-out node, group and edge route. */
export interface LayoutResult {
  boxes: Record<string, Box>;
  routes: Record<string, Position[]>;
  width: number;
  height: number;
}

/** Above this many nodes ELK's effort is turned down (fewer crossing-minimisation sweeps). */
export const LOW_THOROUGHNESS_ABOVE = 400;

export function layoutInputFromView(view: MapView): LayoutInput {
  return {
    nodes: view.items.map((i) =>
      i.type === "team"
        ? { id: i.id, width: TEAM_NODE_W, height: TEAM_NODE_H, parent: null }
        : { id: i.id, width: NODE_W, height: NODE_H, parent: i.parent },
    ),
    groups: view.groups.map((g) => ({ id: g.id })),
    edges: view.edges.map((e) => ({ id: e.id, source: e.source, target: e.target })),
  };
}

export function elkRootOptions(input: LayoutInput): Record<string, string> {
  const large = input.nodes.length > LOW_THOROUGHNESS_ABOVE;
  return {
    "elk.algorithm": "layered",
    // Edges point from dependent to need, so DOWN puts dependents above what they need.
    "elk.direction": "DOWN",
    // Orthogonal routing; SPLINES crashed on graphs with back edges when we tried it.
    "elk.edgeRouting": "ORTHOGONAL",
    // Brandes–Köpf placement; NETWORK_SIMPLEX was ~60× slower at 1,000 nodes when measured.
    "elk.layered.nodePlacement.strategy": "BRANDES_KOEPF",
    "elk.layered.cycleBreaking.strategy": "GREEDY",
    "elk.layered.thoroughness": large ? "1" : "7",
    "elk.spacing.nodeNode": "28",
    "elk.layered.spacing.nodeNodeBetweenLayers": "56",
    "elk.spacing.edgeNode": "18",
    "elk.spacing.edgeEdge": "8",
    "elk.spacing.componentComponent": "56",
    // Edge sections in root coordinates, so routes draw directly in React Flow's space.
    "elk.json.edgeCoords": "ROOT",
    ...(input.groups.length > 0 ? { "elk.hierarchyHandling": "INCLUDE_CHILDREN" } : {}),
  };
}

export function buildElkGraph(input: LayoutInput): ElkNode {
  const groupChildren = new Map<string, ElkNode[]>();
  const groupNodes: ElkNode[] = input.groups.map((g) => {
    const children: ElkNode[] = [];
    groupChildren.set(g.id, children);
    return {
      id: g.id,
      layoutOptions: { "elk.padding": `[top=${GROUP_HEADER + 10},left=14,bottom=14,right=14]` },
      children,
    };
  });
  const top: ElkNode[] = [];
  for (const n of input.nodes) {
    const leaf: ElkNode = { id: n.id, width: n.width, height: n.height };
    const siblings = n.parent ? groupChildren.get(n.parent) : undefined;
    (siblings ?? top).push(leaf);
  }
  const edges: ElkExtendedEdge[] = input.edges.map((e) => ({ id: e.id, sources: [e.source], targets: [e.target] }));
  return {
    id: "root",
    layoutOptions: elkRootOptions(input),
    children: [...groupNodes.filter((g) => (g.children?.length ?? 0) > 0), ...top],
    edges,
  };
}

export function readElkLayout(out: ElkNode): LayoutResult {
  const boxes: Record<string, Box> = {};
  const walk = (n: ElkNode, ox: number, oy: number): void => {
    for (const c of n.children ?? []) {
      const x = ox + (c.x ?? 0);
      const y = oy + (c.y ?? 0);
      boxes[c.id] = { x, y, width: c.width ?? 0, height: c.height ?? 0 };
      walk(c, x, y);
    }
  };
  walk(out, 0, 0);
  const routes: Record<string, Position[]> = {};
  const collect = (n: ElkNode): void => {
    for (const e of n.edges ?? []) {
      const s = e.sections?.[0];
      if (s) routes[e.id] = [s.startPoint, ...(s.bendPoints ?? []), s.endPoint].map((p) => ({ x: p.x, y: p.y }));
    }
    for (const c of n.children ?? []) collect(c);
  };
  collect(out);
  return { boxes, routes, width: out.width ?? 0, height: out.height ?? 0 };
}

export type ComponentFlowData = { item: Extract<ViewItem, { type: "component" }>; pinned: boolean };
export type TeamFlowData = { item: Extract<ViewItem, { type: "team" }> };
export type GroupFlowData = { group: ViewGroup };
export type EdgeFlowData = {
  edge: ViewEdge;
  route: Position[] | null;
  /** handle points at layout time (bottom-centre of source, top-centre of target); a moved node no longer matches */
  expect: { sx: number; sy: number; tx: number; ty: number } | null;
};

export type ComponentFlowNode = Node<ComponentFlowData, "component">;
export type TeamFlowNode = Node<TeamFlowData, "team">;
export type GroupFlowNode = Node<GroupFlowData, "teamGroup">;
export type MapFlowNode = ComponentFlowNode | TeamFlowNode | GroupFlowNode;
export type MapFlowEdge = Edge<EdgeFlowData, "routed">;

/**
 * React Flow nodes with positions. Pins (absolute positions the user saved) override ELK
 * for ungrouped components only: inside a team box a pin would pull the node out of its group.
 * Edges touching a pinned node drop ELK's route and are drawn from the handles instead.
 */
export function toFlow(
  view: MapView,
  layout: LayoutResult,
  pinned: PinnedPositions = {},
): { nodes: MapFlowNode[]; edges: MapFlowEdge[] } {
  const nodes: MapFlowNode[] = [];
  const moved = new Set<string>();
  for (const g of view.groups) {
    const b = layout.boxes[g.id];
    if (!b) continue;
    nodes.push({
      id: g.id,
      type: "teamGroup",
      position: { x: b.x, y: b.y },
      data: { group: g },
      style: { width: b.width, height: b.height },
      width: b.width,
      height: b.height,
      selectable: false,
      draggable: false,
      focusable: false,
      zIndex: -1,
    });
  }
  for (const item of view.items) {
    const b = layout.boxes[item.id];
    if (!b) continue;
    if (item.type === "team") {
      nodes.push({ id: item.id, type: "team", position: { x: b.x, y: b.y }, data: { item }, width: b.width, height: b.height });
      continue;
    }
    const parentBox = item.parent ? layout.boxes[item.parent] : undefined;
    const pin = item.parent ? undefined : pinned[item.id];
    if (pin) moved.add(item.id);
    const position = pin
      ? { x: pin.x, y: pin.y }
      : parentBox
        ? { x: b.x - parentBox.x, y: b.y - parentBox.y }
        : { x: b.x, y: b.y };
    nodes.push({
      id: item.id,
      type: "component",
      position,
      data: { item, pinned: Boolean(pin) },
      width: b.width,
      height: b.height,
      ...(item.parent && parentBox ? { parentId: item.parent, extent: "parent" as const } : {}),
    });
  }
  const edges: MapFlowEdge[] = view.edges.map((e) => {
    const s = layout.boxes[e.source];
    const t = layout.boxes[e.target];
    const expect = s && t ? { sx: s.x + s.width / 2, sy: s.y + s.height, tx: t.x + t.width / 2, ty: t.y } : null;
    return {
      id: e.id,
      source: e.source,
      target: e.target,
      type: "routed",
      data: { edge: e, route: moved.has(e.source) || moved.has(e.target) ? null : (layout.routes[e.id] ?? null), expect },
    };
  });
  return { nodes, edges };
}

/** The first pair of boxes that overlap (touching allowed), or null. */
export function findOverlap(boxes: readonly (Box & { id: string })[]): [string, string] | null {
  const sorted = [...boxes].sort((a, b) => a.x - b.x);
  for (let i = 0; i < sorted.length; i++) {
    const a = sorted[i];
    if (!a) continue;
    for (let j = i + 1; j < sorted.length; j++) {
      const b = sorted[j];
      if (!b) continue;
      if (b.x >= a.x + a.width) break;
      if (a.y < b.y + b.height && b.y < a.y + a.height) return [a.id, b.id];
    }
  }
  return null;
}

/** Point halfway along a polyline, for the cycle marker. */
export function polylineMidpoint(points: readonly Position[]): Position | null {
  if (points.length === 0) return null;
  let total = 0;
  for (let i = 1; i < points.length; i++) {
    const a = points[i - 1];
    const b = points[i];
    if (a && b) total += Math.hypot(b.x - a.x, b.y - a.y);
  }
  let left = total / 2;
  for (let i = 1; i < points.length; i++) {
    const a = points[i - 1];
    const b = points[i];
    if (!a || !b) continue;
    const len = Math.hypot(b.x - a.x, b.y - a.y);
    if (len >= left && len > 0) return { x: a.x + ((b.x - a.x) * left) / len, y: a.y + ((b.y - a.y) * left) / len };
    left -= len;
  }
  return points[points.length - 1] ?? null;
}

export function polylinePath(points: readonly Position[]): string {
  return points.map((p, i) => `${i === 0 ? "M" : "L"}${Math.round(p.x * 10) / 10},${Math.round(p.y * 10) / 10}`).join(" ");
}
