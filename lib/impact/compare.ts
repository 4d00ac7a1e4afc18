// What a proposed inventory change does to the estate's failure points: the current graph and its
// analysis (before) against the proposed graph analysed by the same code as the worker (after).
// Pure: no database, no framework. Every measure named here is the analysis' own (DESIGN §3);
// this file only compares them, and works out the few things the stored analysis does not keep
// (who exactly goes down, cycles of hard needs, dominators per entry) for the part of the graph
// the change can reach, so that a 50-component change to a 20,000-component estate costs little
// beyond analysing the proposed graph once.
import { entryRoots, passesThrough } from "@/lib/analysis/dominators";
import type { CompactGraph, Csr } from "@/lib/analysis/graph";
import { isSinglePoint } from "@/lib/analysis/pinch-score";
import { ranksByKey } from "@/lib/analysis/rank";
import { scc } from "@/lib/analysis/scc";
import type { AnalysisInput, AnalysisResult } from "@/lib/analysis/types";
import type { ComponentKind, Tier } from "@/lib/inventory/types";
import { DownSets } from "./down-sets";
import type { PolicySet } from "./policies";

/** What the comparison reports of one component (from the snapshot content). */
export interface ComponentFacts {
  key: string;
  name: string;
  kind: ComponentKind;
  tier: Tier;
  team: string | null;
}

/** The measures of one component that the comparison reads (stored or freshly computed). */
export interface MeasureFacts {
  pinchScore: number;
  rank: number;
  blastDown: number;
  blastDegraded: number;
  articulation: boolean;
}

/** One side of the comparison: a graph as the analysis sees it, and its analysis. */
export interface ImpactSide {
  input: AnalysisInput;
  graph: CompactGraph;
  measures: ReadonlyMap<string, MeasureFacts>;
  bridges: ReadonlyArray<readonly [string, string]>;
  components: ReadonlyMap<string, ComponentFacts>;
}

/** A side from a fresh analysis (the proposed graph, or the current one when nothing fresh is stored). */
export function sideFromAnalysis({
  input,
  graph,
  result,
  components,
}: {
  input: AnalysisInput;
  graph: CompactGraph;
  result: AnalysisResult;
  components: ReadonlyMap<string, ComponentFacts>;
}): ImpactSide {
  const ranks = ranksByKey(result.nodes);
  const measures = new Map<string, MeasureFacts>();
  for (const n of result.nodes) {
    measures.set(n.key, { pinchScore: n.pinchScore, rank: ranks.get(n.key)!, blastDown: n.blastDown, blastDegraded: n.blastDegraded, articulation: n.articulation });
  }
  return { input, graph, measures, bridges: result.graph.bridges, components };
}

export interface NeedRef {
  from: string;
  to: string;
}

export interface MovedComponent {
  key: string;
  before: { pinchScore: number; rank: number } | null;
  after: { pinchScore: number; rank: number } | null;
}

export interface HardCycleChange {
  /** Members, sorted. A cycle counts as new unless all its members were already in one cycle. */
  members: string[];
  /** Hard needs inside the cycle that the change added or made hard: what closed it. */
  closedBy: NeedRef[];
}

export interface BlastChange {
  key: string;
  before: { down: number; degraded: number } | null;
  after: { down: number; degraded: number } | null;
  /** Down after but not before when this component fails (null when not worked out). */
  newlyDown: string[] | null;
  noLongerDown: string[] | null;
}

export type SinglePointReason = "new-need" | "now-hard" | "now-tier-1" | "now-single-point";

export interface SinglePointNeed extends NeedRef {
  reason: SinglePointReason;
  target: { replicas: number; zones: string[]; undeclared: boolean };
}

export interface DominatorChange {
  entry: string;
  status: "changed" | "new-entry" | "no-longer-entry";
  /** Components this entry point now cannot avoid (each dominates `dominates` components from it). */
  added: Array<{ key: string; dominates: number }>;
  removed: Array<{ key: string; dominates: number }>;
}

export interface ImpactComparison {
  /** Components whose needs, tier, replicas or zones differ, and those added or removed. */
  changedComponents: string[];
  moved: MovedComponent[];
  articulation: { added: string[]; removed: string[] };
  bridges: { added: Array<[string, string]>; removed: Array<[string, string]> };
  hardCycles: { added: HardCycleChange[]; removed: string[][] };
  /** Every tier-1 component whose blast radius changed. */
  tier1Blast: BlastChange[];
  /** Every component whose failure takes down more than before, most growth first. */
  downGrowth: BlastChange[];
  singlePointNeeds: SinglePointNeed[];
  dominators: { entries: DominatorChange[]; entriesChecked: number; entriesTotal: number };
  /** Runtime needs present after and not before (or made hard): where findings are located. */
  addedNeeds: Array<NeedRef & { hard: boolean }>;
}

export interface CompareOptions {
  movement: PolicySet["movement"];
  /** Work out who newly goes down for at most this many components of downGrowth (largest first). */
  detailedGrowth?: number;
  /**
   * Keys whose component or needs may differ between the sides (a superset is fine), e.g. from the
   * snapshot diff the push computes anyway; only these are compared. Without it every component is.
   */
  changed?: ReadonlySet<string>;
}

const pairKey = (a: string, b: string): string => `${a}\u0000${b}`;
const cmp = (a: string, b: string): number => (a < b ? -1 : a > b ? 1 : 0);

const edgeId = (e: AnalysisInput["edges"][number]): string => `${e.from}\u0000${e.to}\u0000${e.strength}\u0000${e.group ?? ""}`;

/** Each wanted owner's needs (to, strength, group), sorted, as one comparable string. */
function needSignatures(input: AnalysisInput, owners: ReadonlySet<string>): Map<string, string> {
  const lists = new Map<string, string[]>();
  for (const e of input.edges) {
    if (!owners.has(e.from)) continue;
    const list = lists.get(e.from) ?? [];
    list.push(edgeId(e));
    lists.set(e.from, list);
  }
  return new Map([...lists].map(([k, list]) => [k, list.sort().join("\n")]));
}

function changedComponents(before: ImpactSide, after: ImpactSide, hint: ReadonlySet<string> | undefined): { needOwners: Set<string>; all: Set<string> } {
  const needOwners = new Set<string>();
  if (hint) {
    const sb = needSignatures(before.input, hint);
    const sa = needSignatures(after.input, hint);
    for (const k of hint) if (sb.get(k) !== sa.get(k)) needOwners.add(k);
  } else {
    // An owner whose needs differ has an edge (to, strength, group) on one side only.
    const idsB = new Set(before.input.edges.map(edgeId));
    const idsA = new Set<string>();
    for (const e of after.input.edges) {
      const id = edgeId(e);
      idsA.add(id);
      if (!idsB.has(id)) needOwners.add(e.from);
    }
    for (const e of before.input.edges) if (!idsA.has(edgeId(e))) needOwners.add(e.from);
  }
  const all = new Set(needOwners);
  const nodeB = new Map<string, AnalysisInput["nodes"][number]>();
  for (const n of before.input.nodes) if (!hint || hint.has(n.key)) nodeB.set(n.key, n);
  for (const a of after.input.nodes) {
    if (hint && !hint.has(a.key)) continue;
    const b = nodeB.get(a.key);
    nodeB.delete(a.key);
    if (!b || a.tier !== b.tier || a.replicas !== b.replicas || a.zones.length !== b.zones.length || [...a.zones].sort().join() !== [...b.zones].sort().join()) all.add(a.key);
  }
  for (const k of nodeB.keys()) all.add(k);
  // Keys only named by needs (placeholders the graph adds on its own) come and go too.
  for (const k of before.graph.implicitKeys) if (!after.graph.indexOf.has(k)) all.add(k);
  for (const k of after.graph.implicitKeys) if (!before.graph.indexOf.has(k)) all.add(k);
  return { needOwners, all };
}

/** owner → members of its hard needs; `plainOnly` leaves out any_of groups (they have an alternative). */
function hardAdjacency(graph: CompactGraph, plainOnly: boolean): Csr {
  const { needs, n } = graph;
  const counts = new Int32Array(n + 1);
  for (let g = 0; g < needs.count; g++) {
    if (!needs.hard[g] || (plainOnly && needs.size[g] !== 1)) continue;
    counts[needs.owner[g]! + 1]! += needs.members.offsets[g + 1]! - needs.members.offsets[g]!;
  }
  for (let v = 0; v < n; v++) counts[v + 1]! += counts[v]!;
  const fill = counts.slice(0, n);
  const targets = new Int32Array(counts[n]!);
  for (let g = 0; g < needs.count; g++) {
    if (!needs.hard[g] || (plainOnly && needs.size[g] !== 1)) continue;
    const o = needs.owner[g]!;
    for (let e = needs.members.offsets[g]!; e < needs.members.offsets[g + 1]!; e++) targets[fill[o]!++] = needs.members.targets[e]!;
  }
  return { offsets: counts, targets };
}

/** Keys reached from `start` along `adjacency` (the start keys included). */
function reach(graph: CompactGraph, adjacency: Csr, start: Iterable<string>): Set<string> {
  const seen = new Uint8Array(graph.n);
  const queue: number[] = [];
  for (const k of start) {
    const v = graph.indexOf.get(k);
    if (v !== undefined && !seen[v]) {
      seen[v] = 1;
      queue.push(v);
    }
  }
  for (let i = 0; i < queue.length; i++) {
    const v = queue[i]!;
    for (let e = adjacency.offsets[v]!; e < adjacency.offsets[v + 1]!; e++) {
      const w = adjacency.targets[e]!;
      if (!seen[w]) {
        seen[w] = 1;
        queue.push(w);
      }
    }
  }
  return new Set(queue.map((v) => graph.keys[v]!));
}

/**
 * The needs of some owners: plain hard needs as "from\0to" (cycles), and every runtime need with
 * its hardness (located findings). Only owners whose needs changed are worth reading: the others
 * have the same needs on both sides.
 */
function needPairs(graph: CompactGraph, owners: ReadonlySet<string>): { plainHard: Set<string>; runtime: Map<string, boolean> } {
  const { needs, keys } = graph;
  const plainHard = new Set<string>();
  const runtime = new Map<string, boolean>();
  const wanted = new Uint8Array(graph.n);
  for (const k of owners) {
    const v = graph.indexOf.get(k);
    if (v !== undefined) wanted[v] = 1;
  }
  for (let g = 0; g < needs.count; g++) {
    if (!wanted[needs.owner[g]!]) continue;
    const from = keys[needs.owner[g]!]!;
    const hard = needs.hard[g] === 1;
    for (let e = needs.members.offsets[g]!; e < needs.members.offsets[g + 1]!; e++) {
      const k = pairKey(from, keys[needs.members.targets[e]!]!);
      if (hard && needs.size[g] === 1) plainHard.add(k);
      runtime.set(k, (runtime.get(k) ?? false) || hard);
    }
  }
  return { plainHard, runtime };
}

function hardCycles(graph: CompactGraph, plainHard: Csr): string[][] {
  // A component needing itself is a self-loop, reported by the analysis on its own; a cycle here
  // is two or more components each down without the next.
  return scc(graph, plainHard)
    .cycles.filter((c) => c.length > 1)
    .map((c) => c.map((v) => graph.keys[v]!).sort(cmp));
}

function moved(before: ImpactSide, after: ImpactSide, t: PolicySet["movement"]): MovedComponent[] {
  const out: Array<MovedComponent & { weight: number }> = [];
  for (const key of new Set([...before.measures.keys(), ...after.measures.keys()])) {
    const b = before.measures.get(key);
    const a = after.measures.get(key);
    const delta = (a?.pinchScore ?? 0) - (b?.pinchScore ?? 0);
    let counts: boolean;
    if (a && b) counts = Math.abs(delta) > t.pinchScore || (Math.min(a.rank, b.rank) <= t.topWindow && Math.abs(a.rank - b.rank) > t.rank);
    else counts = (a ?? b)!.rank <= t.topWindow || Math.abs(delta) > t.pinchScore;
    if (!counts) continue;
    out.push({
      key,
      before: b ? { pinchScore: b.pinchScore, rank: b.rank } : null,
      after: a ? { pinchScore: a.pinchScore, rank: a.rank } : null,
      weight: Math.abs(delta),
    });
  }
  out.sort((x, y) => y.weight - x.weight || Math.min(x.after?.rank ?? Infinity, x.before?.rank ?? Infinity) - Math.min(y.after?.rank ?? Infinity, y.before?.rank ?? Infinity) || cmp(x.key, y.key));
  return out.map(({ weight: _weight, ...m }) => m);
}

function setDiff<T>(a: Iterable<T>, b: ReadonlySet<T>): T[] {
  const out: T[] = [];
  for (const x of a) if (!b.has(x)) out.push(x);
  return out;
}

function blastChange(key: string, before: ImpactSide, after: ImpactSide): BlastChange {
  const b = before.measures.get(key);
  const a = after.measures.get(key);
  return {
    key,
    before: b ? { down: b.blastDown, degraded: b.blastDegraded } : null,
    after: a ? { down: a.blastDown, degraded: a.blastDegraded } : null,
    newlyDown: null,
    noLongerDown: null,
  };
}

function withDownSets(change: BlastChange, downBefore: DownSets, downAfter: DownSets): BlastChange {
  const b = downBefore.keysOf(change.key);
  const a = downAfter.keysOf(change.key);
  return { ...change, newlyDown: setDiff(a, b).sort(cmp), noLongerDown: setDiff(b, a).sort(cmp) };
}

/**
 * Components each entry point cannot avoid: those that strictly dominate at least one component
 * from it (semi-NCA, lib/analysis/dominators.ts), with how many they dominate.
 */
function chokepoints(graph: CompactGraph, entries: readonly string[]): Map<string, Map<string, number>> {
  const out = new Map<string, Map<string, number>>();
  for (const entry of entries) {
    const root = graph.indexOf.get(entry);
    if (root === undefined) continue;
    out.set(entry, new Map(passesThrough(graph, root).through.map((t) => [graph.keys[t.node]!, t.dominated])));
  }
  return out;
}

function dominatorChanges(before: ImpactSide, after: ImpactSide, changed: Set<string>): ImpactComparison["dominators"] {
  const entriesB = new Set(entryRoots(before.graph).map((v) => before.graph.keys[v]!));
  const entriesA = new Set(entryRoots(after.graph).map((v) => after.graph.keys[v]!));
  // An entry's dominator tree can change only if it reaches a changed component in one of the graphs.
  const upB = reach(before.graph, before.graph.in, changed);
  const upA = reach(after.graph, after.graph.in, changed);
  const check = [...entriesA].filter((e) => entriesB.has(e) && (upB.has(e) || upA.has(e))).sort(cmp);
  const fresh = [...entriesA].filter((e) => !entriesB.has(e)).sort(cmp);
  const gone = [...entriesB].filter((e) => !entriesA.has(e)).sort(cmp);
  const chokeB = chokepoints(before.graph, [...check, ...gone]);
  const chokeA = chokepoints(after.graph, [...check, ...fresh]);
  const list = (m: Map<string, number> | undefined, skip: Map<string, number> | undefined) =>
    [...(m ?? new Map<string, number>())].filter(([k]) => !skip?.has(k)).map(([key, dominates]) => ({ key, dominates })).sort((x, y) => y.dominates - x.dominates || cmp(x.key, y.key));
  const entries: DominatorChange[] = [];
  for (const e of check) {
    const added = list(chokeA.get(e), chokeB.get(e));
    const removed = list(chokeB.get(e), chokeA.get(e));
    if (added.length || removed.length) entries.push({ entry: e, status: "changed", added, removed });
  }
  for (const e of fresh) entries.push({ entry: e, status: "new-entry", added: list(chokeA.get(e), undefined), removed: [] });
  for (const e of gone) entries.push({ entry: e, status: "no-longer-entry", added: [], removed: list(chokeB.get(e), undefined) });
  return { entries, entriesChecked: check.length + fresh.length + gone.length, entriesTotal: entriesA.size };
}

function singlePointNeeds(before: ImpactSide, after: ImpactSide, pairsB: ReturnType<typeof needPairs>, needOwners: ReadonlySet<string>): SinglePointNeed[] {
  const g = after.graph;
  const out: SinglePointNeed[] = [];
  const tierB = (k: string): number | undefined => {
    const v = before.graph.indexOf.get(k);
    return v === undefined ? undefined : before.graph.tier[v];
  };
  const singleB = (k: string): boolean | undefined => {
    const v = before.graph.indexOf.get(k);
    return v === undefined ? undefined : isSinglePoint(before.graph.replicas[v]!, before.graph.zones[v]!);
  };
  const seen = new Set<string>();
  for (let grp = 0; grp < g.needs.count; grp++) {
    // Plain hard needs only: an any_of group still has an alternative when one member fails.
    if (!g.needs.hard[grp] || g.needs.size[grp] !== 1) continue;
    const u = g.needs.owner[grp]!;
    const w = g.needs.members.targets[g.needs.members.offsets[grp]!]!;
    if (g.tier[u] !== 1 || !isSinglePoint(g.replicas[w]!, g.zones[w]!)) continue;
    const from = g.keys[u]!;
    const to = g.keys[w]!;
    const k = pairKey(from, to);
    if (seen.has(k)) continue;
    seen.add(k);
    let reason: SinglePointReason | null;
    // An owner whose needs did not change had this very need before.
    if (needOwners.has(from) && !pairsB.plainHard.has(k)) reason = pairsB.runtime.has(k) ? "now-hard" : "new-need";
    else if (tierB(from) !== 1) reason = "now-tier-1";
    else if (singleB(to) === false) reason = "now-single-point";
    else reason = null;
    if (!reason) continue;
    const kind = after.components.get(to)?.kind;
    out.push({ from, to, reason, target: { replicas: g.replicas[w]!, zones: [...g.zones[w]!], undeclared: kind === undefined || kind === "undeclared" } });
  }
  return out.sort((a, b) => cmp(a.from, b.from) || cmp(a.to, b.to));
}

export function compareSides(before: ImpactSide, after: ImpactSide, options: CompareOptions): ImpactComparison {
  const { needOwners, all: changed } = changedComponents(before, after, options.changed);

  const apB = new Set([...before.measures].filter(([, m]) => m.articulation).map(([k]) => k));
  const apA = new Set([...after.measures].filter(([, m]) => m.articulation).map(([k]) => k));
  const norm = ([a, b]: readonly [string, string]): string => (cmp(a, b) <= 0 ? pairKey(a, b) : pairKey(b, a));
  const bridgesB = new Set(before.bridges.map(norm));
  const bridgesA = new Set(after.bridges.map(norm));
  const unpair = (k: string): [string, string] => k.split("\u0000") as [string, string];

  const pairsB = needPairs(before.graph, needOwners);
  const pairsA = needPairs(after.graph, needOwners);
  const addedNeeds: ImpactComparison["addedNeeds"] = [];
  for (const [k, hard] of pairsA.runtime) {
    const was = pairsB.runtime.get(k);
    if (was === undefined || (hard && !was)) {
      const [from, to] = unpair(k);
      addedNeeds.push({ from, to, hard });
    }
  }
  addedNeeds.sort((a, b) => cmp(a.from, b.from) || cmp(a.to, b.to));

  const cyclesB = hardCycles(before.graph, hardAdjacency(before.graph, true));
  const cyclesA = hardCycles(after.graph, hardAdjacency(after.graph, true));
  // A cycle is new when its members were not already all in one cycle: a cycle that only lost
  // members (a need removed) is not new, and one that gained a member or merged two is.
  const within = (cycles: string[][]) => {
    const id = new Map<string, number>();
    cycles.forEach((c, i) => c.forEach((k) => id.set(k, i)));
    return (members: string[]) => members.every((k) => id.has(k) && id.get(k) === id.get(members[0]!));
  };
  const inBefore = within(cyclesB);
  const inAfter = within(cyclesA);
  const addedCycles: HardCycleChange[] = cyclesA
    .filter((c) => !inBefore(c))
    .map((members) => {
      const inside = new Set(members);
      const closedBy = addedNeeds.filter((n) => inside.has(n.from) && inside.has(n.to) && pairsA.plainHard.has(pairKey(n.from, n.to))).map(({ from, to }) => ({ from, to }));
      return { members, closedBy };
    });

  // Blast radius: counts come from the analyses; who exactly goes down is worked out only for
  // components whose down set can have changed, i.e. those a changed component reaches along
  // hard needs (a component is in X's down set only if it reaches X along hard needs).
  const hardB = hardAdjacency(before.graph, false);
  const hardA = hardAdjacency(after.graph, false);
  const touched = new Set([...reach(before.graph, hardB, changed), ...reach(after.graph, hardA, changed)]);
  const downB = new DownSets(before.graph);
  const downA = new DownSets(after.graph);

  const tier1 = new Set<string>();
  for (const side of [before, after]) for (const [k, c] of side.components) if (c.tier === 1) tier1.add(k);
  const tier1Blast: BlastChange[] = [];
  for (const key of [...tier1].sort(cmp)) {
    let change = blastChange(key, before, after);
    if (touched.has(key)) change = withDownSets(change, downB, downA);
    // A component that comes or goes taking nothing down with it has no blast radius to report.
    const zero = (x: BlastChange["before"]) => x === null || (x.down === 0 && x.degraded === 0);
    if ((change.before === null || change.after === null) && zero(change.before) && zero(change.after)) continue;
    const countsMoved = change.before?.down !== change.after?.down || change.before?.degraded !== change.after?.degraded;
    if (countsMoved || change.newlyDown?.length || change.noLongerDown?.length) tier1Blast.push(change);
  }

  const growth: BlastChange[] = [];
  for (const [key, a] of after.measures) {
    const b = before.measures.get(key);
    if (b && a.blastDown > b.blastDown) growth.push(blastChange(key, before, after));
  }
  growth.sort((x, y) => y.after!.down - y.before!.down - (x.after!.down - x.before!.down) || cmp(x.key, y.key));
  const detailed = options.detailedGrowth ?? 100;
  const downGrowth = growth.map((c, i) => (i < detailed ? withDownSets(c, downB, downA) : c));

  return {
    changedComponents: [...changed].sort(cmp),
    moved: moved(before, after, options.movement),
    articulation: { added: setDiff(apA, apB).sort(cmp), removed: setDiff(apB, apA).sort(cmp) },
    bridges: { added: setDiff(bridgesA, bridgesB).sort(cmp).map(unpair), removed: setDiff(bridgesB, bridgesA).sort(cmp).map(unpair) },
    hardCycles: { added: addedCycles, removed: cyclesB.filter((c) => !inAfter(c)) },
    tier1Blast,
    downGrowth,
    singlePointNeeds: singlePointNeeds(before, after, pairsB, needOwners),
    dominators: dominatorChanges(before, after, new Set([...needOwners, ...changed])),
    addedNeeds,
  };
}
