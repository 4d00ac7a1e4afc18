// Pure view model of the map: which components and edges are on the canvas after the
// filters, the focus neighbourhood and the team grouping. No React, no ELK.
import { strongerStrength, type ComponentKind, type Strength, type Tier } from "@/lib/inventory/types";
import type { MapEdge, MapGraph, MapNode } from "@/lib/api/schemas/map";

/** Known only from a host name in configuration: drawn apart so nobody mistakes it for a declared need. */
const isInferredOnly = (e: Pick<MapEdge, "provenance">): boolean =>
  e.provenance !== undefined && e.provenance.length > 0 && e.provenance.every((p) => p === "inferred");

/** Team slot for components with no owner; never a valid slug (slugs start [a-z0-9]). */
export const UNOWNED = "_unowned";

export interface MapFilters {
  /** null means every team; UNOWNED stands for components with no team. */
  teams: ReadonlySet<string> | null;
  tiers: ReadonlySet<Tier> | null;
  kinds: ReadonlySet<ComponentKind> | null;
  hard: boolean;
  soft: boolean;
  startup: boolean;
}

export const NO_FILTERS: MapFilters = { teams: null, tiers: null, kinds: null, hard: true, soft: true, startup: true };

export interface Adjacency {
  /** needs: dependent → what it needs */
  out: Map<string, string[]>;
  /** dependents: need → who needs it */
  in: Map<string, string[]>;
}

export function teamSlotOf(node: Pick<MapNode, "team">): string {
  return node.team ?? UNOWNED;
}

export function buildAdjacency(edges: readonly Pick<MapEdge, "from" | "to">[]): Adjacency {
  const out = new Map<string, string[]>();
  const inn = new Map<string, string[]>();
  for (const e of edges) {
    const o = out.get(e.from);
    if (o) {
      if (!o.includes(e.to)) o.push(e.to);
    } else out.set(e.from, [e.to]);
    const i = inn.get(e.to);
    if (i) {
      if (!i.includes(e.from)) i.push(e.from);
    } else inn.set(e.to, [e.from]);
  }
  return { out, in: inn };
}

function bfs(start: string, hops: number, next: Map<string, string[]>, into: Set<string>): void {
  let frontier = [start];
  const seen = new Set([start]);
  for (let d = 0; d < hops && frontier.length > 0; d++) {
    const nextFrontier: string[] = [];
    for (const k of frontier) {
      for (const n of next.get(k) ?? []) {
        if (seen.has(n)) continue;
        seen.add(n);
        nextFrontier.push(n);
      }
    }
    frontier = nextFrontier;
  }
  for (const k of seen) into.add(k);
}

/**
 * The component, everything it needs within `hops` steps, and everything that depends on
 * it within `hops` steps. Directions are not mixed: a dependent's other needs are not
 * included, because they say nothing about what this component's failure touches.
 */
export function neighbourhood(adj: Adjacency, key: string, hops: number): Set<string> {
  const result = new Set<string>();
  bfs(key, hops, adj.out, result);
  bfs(key, hops, adj.in, result);
  return result;
}

function nodePasses(node: MapNode, f: MapFilters): boolean {
  if (f.teams && !f.teams.has(teamSlotOf(node))) return false;
  if (f.tiers && !f.tiers.has(node.tier)) return false;
  if (f.kinds && !f.kinds.has(node.kind)) return false;
  return true;
}

function edgePasses(edge: MapEdge, f: MapFilters): boolean {
  return f[edge.strength];
}

/** Filters nodes and edges; `keep` (the focused component) survives any node filter so focus never points at nothing. */
export function applyFilters(
  graph: Pick<MapGraph, "nodes" | "edges">,
  f: MapFilters,
  keep: string | null = null,
): { nodes: MapNode[]; edges: MapEdge[] } {
  const nodes = graph.nodes.filter((n) => n.key === keep || nodePasses(n, f));
  const kept = new Set(nodes.map((n) => n.key));
  const edges = graph.edges.filter((e) => kept.has(e.from) && kept.has(e.to) && edgePasses(e, f));
  return { nodes, edges };
}

export interface FocusSpec {
  key: string;
  hops: number;
}

export interface GroupingSpec {
  byTeam: boolean;
  /** team slots shown as one node each */
  collapsed: ReadonlySet<string>;
}

export type ViewItem =
  | { type: "component"; id: string; node: MapNode; parent: string | null }
  | { type: "team"; id: string; team: string; name: string; members: string[]; parent: null };

export interface ViewGroup {
  id: string;
  team: string;
  name: string;
  memberCount: number;
}

export interface ViewEdge {
  id: string;
  source: string;
  target: string;
  /** the strongest of the underlying dependencies (hard, then soft, then startup) */
  strength: Strength;
  /** every underlying dependency was inferred from configuration */
  inferred: boolean;
  inCycle: boolean;
  /** how many component-level dependencies this edge stands for (>1 only between collapsed teams) */
  count: number;
  /** calls traces saw on the dependencies it stands for (summed; error rate weighted by calls) */
  traffic?: { callsPerMinute: number; errorRate: number };
}

export interface MapView {
  items: ViewItem[];
  groups: ViewGroup[];
  edges: ViewEdge[];
  /** components on the canvas, counting those inside collapsed team nodes */
  componentCount: number;
  /** the focus key, when it exists in the graph */
  focus: string | null;
}

export const teamNodeId = (team: string): string => `team:${team}`;
export const groupNodeId = (team: string): string => `group:${team}`;

export function teamName(graph: Pick<MapGraph, "teams">, slot: string): string {
  if (slot === UNOWNED) return "Unowned";
  return graph.teams.find((t) => t.slug === slot)?.name ?? slot;
}

export interface Selection {
  nodes: MapNode[];
  edges: MapEdge[];
  /** the focus key, when it exists in the graph */
  focus: string | null;
}

/** Filters, then the focus neighbourhood (computed over the filtered edges, so hidden edges do not widen it). */
export function selectComponents(graph: MapGraph, filters: MapFilters, focus: FocusSpec | null): Selection {
  const focusKey = focus && graph.nodes.some((n) => n.key === focus.key) ? focus.key : null;
  let { nodes, edges } = applyFilters(graph, filters, focusKey);
  if (focusKey && focus) {
    const near = neighbourhood(buildAdjacency(edges), focusKey, focus.hops);
    nodes = nodes.filter((n) => near.has(n.key));
    edges = edges.filter((e) => near.has(e.from) && near.has(e.to));
  }
  return { nodes, edges, focus: focusKey };
}

export function buildView(
  graph: MapGraph,
  opts: { filters: MapFilters; focus: FocusSpec | null; grouping: GroupingSpec },
): MapView {
  return groupSelection(graph, selectComponents(graph, opts.filters, opts.focus), opts.grouping);
}

export function groupSelection(graph: Pick<MapGraph, "teams">, selection: Selection, grouping: GroupingSpec): MapView {
  const { nodes, edges, focus: focusKey } = selection;
  const items: ViewItem[] = [];
  const groups: ViewGroup[] = [];
  const rep = new Map<string, string>();

  if (!grouping.byTeam) {
    for (const n of nodes) {
      items.push({ type: "component", id: n.key, node: n, parent: null });
      rep.set(n.key, n.key);
    }
  } else {
    const bySlot = new Map<string, MapNode[]>();
    for (const n of nodes) {
      const slot = teamSlotOf(n);
      const list = bySlot.get(slot);
      if (list) list.push(n);
      else bySlot.set(slot, [n]);
    }
    const slots = [...bySlot.keys()].sort((a, b) => (a === UNOWNED ? 1 : b === UNOWNED ? -1 : a.localeCompare(b)));
    for (const slot of slots) {
      const members = bySlot.get(slot) ?? [];
      const name = teamName(graph, slot);
      // A focused component is never swallowed by its collapsed team.
      const collapse = grouping.collapsed.has(slot) && !members.some((m) => m.key === focusKey);
      if (collapse) {
        const id = teamNodeId(slot);
        items.push({ type: "team", id, team: slot, name, members: members.map((m) => m.key), parent: null });
        for (const m of members) rep.set(m.key, id);
      } else {
        const gid = groupNodeId(slot);
        groups.push({ id: gid, team: slot, name, memberCount: members.length });
        for (const m of members) {
          items.push({ type: "component", id: m.key, node: m, parent: gid });
          rep.set(m.key, m.key);
        }
      }
    }
  }

  const byId = new Map<string, ViewEdge>();
  // Repeated rows between one pair (e.g. an any_of member also declared plainly) are one dependency (DESIGN §3).
  const pairs = new Set<string>();
  for (const e of edges) {
    const source = rep.get(e.from);
    const target = rep.get(e.to);
    if (!source || !target || source === target) continue;
    const id = `${source}->${target}`;
    const pair = `${e.from}\u0000${e.to}`;
    const fresh = !pairs.has(pair);
    pairs.add(pair);
    const prev = byId.get(id);
    if (prev) {
      if (fresh) prev.count += 1;
      prev.strength = strongerStrength(prev.strength, e.strength);
      if (!isInferredOnly(e)) prev.inferred = false;
      if (e.inCycle) prev.inCycle = true;
      if (e.traffic && fresh) {
        const before = prev.traffic ?? { callsPerMinute: 0, errorRate: 0 };
        const calls = before.callsPerMinute + e.traffic.callsPerMinute;
        prev.traffic = { callsPerMinute: calls, errorRate: calls > 0 ? (before.errorRate * before.callsPerMinute + e.traffic.errorRate * e.traffic.callsPerMinute) / calls : 0 };
      }
    } else {
      byId.set(id, {
        id,
        source,
        target,
        strength: e.strength,
        inferred: isInferredOnly(e),
        inCycle: e.inCycle,
        count: 1,
        ...(e.traffic ? { traffic: { callsPerMinute: e.traffic.callsPerMinute, errorRate: e.traffic.errorRate } } : {}),
      });
    }
  }
  return { items, groups, edges: [...byId.values()], componentCount: nodes.length, focus: focusKey };
}

/** Team slots present in the graph, unowned last. */
export function teamSlots(graph: Pick<MapGraph, "nodes">): string[] {
  const slots = new Set(graph.nodes.map(teamSlotOf));
  return [...slots].sort((a, b) => (a === UNOWNED ? 1 : b === UNOWNED ? -1 : a.localeCompare(b)));
}

/** Stable string that changes exactly when the layout must be recomputed. */
export function layoutSignature(view: MapView): string {
  const parts: string[] = [];
  for (const i of view.items) parts.push(i.parent ? `${i.id}@${i.parent}` : i.id);
  parts.push("|");
  for (const e of view.edges) parts.push(e.id);
  return parts.join(",");
}
