// Pure ELK plumbing shared by the browser (components/map/layout.worker.ts) and the worker's estate
// layouts (lib/map/estate.ts): view → ELK graph with our options → absolute boxes and edge routes.
import type { ElkExtendedEdge, ElkNode } from "elkjs/lib/elk-api";
import type { MapView } from "./view";

export const NODE_W = 184;
export const NODE_H = 60;
export const TEAM_NODE_W = 220;
export const TEAM_NODE_H = 76;
/** Space above a team group's children for its title bar. */
const GROUP_HEADER = 34;
/** Padding of a team group around its members (matches buildElkGraph). */
export const GROUP_PAD = { top: GROUP_HEADER + 10, left: 14, bottom: 14, right: 14 } as const;

type Position = { x: number; y: number };

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
const LOW_THOROUGHNESS_ABOVE = 400;

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

function elkRootOptions(input: LayoutInput): Record<string, string> {
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
      layoutOptions: { "elk.padding": `[top=${GROUP_PAD.top},left=${GROUP_PAD.left},bottom=${GROUP_PAD.bottom},right=${GROUP_PAD.right}]` },
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

