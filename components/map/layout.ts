// Pure layout plumbing: view → ELK graph → positions → React Flow nodes and edges.
// ELK itself runs elsewhere (layout.worker.ts in the browser, lib/map/estate.ts in the worker).
import type { Edge, Node } from "@xyflow/react";
import type { LayoutResult } from "@/lib/map/elk";
import type { PinnedPositions, Position } from "./types";
import type { MapView, ViewEdge, ViewGroup, ViewItem } from "./view";

// ELK plumbing is shared with the worker, which lays the estate out after each analysis.
export {  buildElkGraph,  layoutInputFromView, readElkLayout, type Box, type LayoutInput, type LayoutResult } from "@/lib/map/elk";
import type { Box } from "@/lib/map/elk";

type ComponentFlowData = { item: Extract<ViewItem, { type: "component" }>; pinned: boolean };
type TeamFlowData = { item: Extract<ViewItem, { type: "team" }> };
type GroupFlowData = { group: ViewGroup };
type EdgeFlowData = {
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
