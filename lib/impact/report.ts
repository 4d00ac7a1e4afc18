// The impact answer of a dry run (DESIGN §10, Impact): the comparison and the policy results in
// one plain, bounded JSON document that the API returns and the Markdown and SARIF renderers read.
// Lists are cut to a reviewable length; the summary always carries the full counts.
import type { Tier } from "@/lib/inventory/types";
import type { BlastChange, DominatorChange, HardCycleChange, ImpactComparison, ImpactSide, MovedComponent, SinglePointNeed } from "./compare";
import { isBlocked, type PolicyFinding, type PolicyResult } from "./evaluate";
import type { FilePosition } from "@/lib/inventory/types";

/** Longest list of any one kind in the answer. */
const LIST_LIMIT = 100;
/** Longest list of components inside one entry (who newly goes down, dominators of one entry). */
const INNER_LIMIT = 25;

interface ComponentRef {
  key: string;
  name: string;
  tier: Tier | null;
  team: string | null;
}

export interface ImpactBasis {
  /** The current snapshot the change is compared with (null before the first push). */
  snapshot: number | null;
  /** `stored`: the worker's analysis of that snapshot was fresh and reused; `recomputed`: analysed now. */
  analysis: "stored" | "recomputed" | "empty";
  /** The analysis view the environment's settings chose (lib/analysis/input.ts). */
  view: string;
  exactBetweenness: boolean;
}

interface ImpactSummary {
  changedComponents: number;
  moved: number;
  articulationAdded: number;
  articulationRemoved: number;
  bridgesAdded: number;
  bridgesRemoved: number;
  hardCyclesAdded: number;
  hardCyclesRemoved: number;
  tier1BlastChanged: number;
  downGrowth: number;
  singlePointNeeds: number;
  dominatorEntriesChanged: number;
  policiesFailed: number;
  policiesBlocking: number;
}

export interface ImpactReport {
  environment: string;
  /** Where a reviewer reads more: the environment's pinch points in Pinchpoint. */
  link: string;
  basis: ImpactBasis;
  /** false when the change leaves the analysed graph as it is. */
  changed: boolean;
  blocked: boolean;
  headline: string;
  summary: ImpactSummary;
  moved: Array<MovedComponent & ComponentRef>;
  articulation: { added: ComponentRef[]; removed: ComponentRef[] };
  bridges: { added: Array<[string, string]>; removed: Array<[string, string]> };
  hardCycles: { added: HardCycleChange[]; removed: string[][] };
  tier1Blast: Array<BlastChange & ComponentRef & { newlyDownTotal: number; noLongerDownTotal: number }>;
  /** The largest growths of what one failure takes down (any tier). */
  downGrowth: Array<BlastChange & ComponentRef & { newlyDownTotal: number; noLongerDownTotal: number }>;
  singlePointNeeds: Array<SinglePointNeed & { at?: FilePosition }>;
  dominators: { entries: Array<DominatorChange & { addedTotal: number; removedTotal: number }>; entriesChecked: number; entriesTotal: number };
  policies: Array<PolicyResult & { findingsTotal: number }>;
  timings: Record<string, number>;
}

const cut = <T>(xs: readonly T[], n = LIST_LIMIT): T[] => xs.slice(0, n);
const plural = (n: number, one: string, many = `${one}s`): string => `${n} ${n === 1 ? one : many}`;

function refOf(key: string, before: ImpactSide | null, after: ImpactSide): ComponentRef {
  const c = after.components.get(key) ?? before?.components.get(key);
  return { key, name: c?.name ?? key, tier: c?.tier ?? null, team: c?.team ?? null };
}

function blastEntry(b: BlastChange, before: ImpactSide | null, after: ImpactSide) {
  return {
    ...refOf(b.key, before, after),
    ...b,
    newlyDown: b.newlyDown ? cut(b.newlyDown, INNER_LIMIT) : null,
    noLongerDown: b.noLongerDown ? cut(b.noLongerDown, INNER_LIMIT) : null,
    newlyDownTotal: b.newlyDown?.length ?? 0,
    noLongerDownTotal: b.noLongerDown?.length ?? 0,
  };
}

function headlineOf({ changed, summary, policies }: { changed: boolean; summary: ImpactSummary; policies: readonly PolicyResult[] }): string {
  if (!changed) return "No change to the analysed graph: no failure point moves.";
  const failing = policies.filter((p) => p.status === "fail");
  const blocking = failing.filter((p) => p.severity === "block");
  const parts: string[] = [];
  if (summary.hardCyclesAdded) parts.push(plural(summary.hardCyclesAdded, "new hard cycle"));
  if (summary.singlePointNeeds) parts.push(plural(summary.singlePointNeeds, "new tier-1 hard need on a single point", "new tier-1 hard needs on single points"));
  if (summary.articulationAdded) parts.push(plural(summary.articulationAdded, "new articulation point"));
  if (summary.tier1BlastChanged) parts.push(`blast radius changes for ${plural(summary.tier1BlastChanged, "tier-1 component")}`);
  if (summary.moved) parts.push(`${plural(summary.moved, "component")} move${summary.moved === 1 ? "s" : ""} in the ranking`);
  const what = parts.length ? parts.join(", ") : "no failure point moves";
  if (blocking.length) return `Blocked by ${plural(blocking.length, "policy", "policies")} (${blocking.map((p) => p.title.toLowerCase()).join("; ")}): ${what}.`;
  if (failing.length) return `${plural(failing.length, "policy warning")}: ${what}.`;
  return `Passes every policy: ${what}.`;
}

export function buildReport({
  environment,
  link,
  basis,
  comparison: c,
  policies,
  before,
  after,
  timings,
}: {
  environment: string;
  link: string;
  basis: ImpactBasis;
  comparison: ImpactComparison;
  policies: PolicyResult[];
  before: ImpactSide | null;
  after: ImpactSide;
  timings: Record<string, number>;
}): ImpactReport {
  const changed = c.changedComponents.length > 0;
  const summary: ImpactSummary = {
    changedComponents: c.changedComponents.length,
    moved: c.moved.length,
    articulationAdded: c.articulation.added.length,
    articulationRemoved: c.articulation.removed.length,
    bridgesAdded: c.bridges.added.length,
    bridgesRemoved: c.bridges.removed.length,
    hardCyclesAdded: c.hardCycles.added.length,
    hardCyclesRemoved: c.hardCycles.removed.length,
    tier1BlastChanged: c.tier1Blast.length,
    downGrowth: c.downGrowth.length,
    singlePointNeeds: c.singlePointNeeds.length,
    dominatorEntriesChanged: c.dominators.entries.length,
    policiesFailed: policies.filter((p) => p.status === "fail").length,
    policiesBlocking: policies.filter((p) => p.status === "fail" && p.severity === "block").length,
  };
  const spAt = new Map<string, FilePosition>();
  for (const p of policies) for (const f of p.findings) if (p.rule === "tier1-single-point-need" && f.need && f.at) spAt.set(`${f.need.from}\u0000${f.need.to}`, f.at);
  return {
    environment,
    link,
    basis,
    changed,
    blocked: isBlocked(policies),
    headline: headlineOf({ changed, summary, policies }),
    summary,
    moved: cut(c.moved).map((m) => ({ ...refOf(m.key, before, after), ...m })),
    articulation: { added: cut(c.articulation.added).map((k) => refOf(k, before, after)), removed: cut(c.articulation.removed).map((k) => refOf(k, before, after)) },
    bridges: { added: cut(c.bridges.added), removed: cut(c.bridges.removed) },
    hardCycles: { added: cut(c.hardCycles.added), removed: cut(c.hardCycles.removed) },
    tier1Blast: cut(c.tier1Blast).map((b) => blastEntry(b, before, after)),
    downGrowth: cut(c.downGrowth, 20).map((b) => blastEntry(b, before, after)),
    singlePointNeeds: cut(c.singlePointNeeds).map((n) => {
      const at = spAt.get(`${n.from}\u0000${n.to}`);
      return at ? { ...n, at } : n;
    }),
    dominators: {
      entries: cut(c.dominators.entries).map((e) => ({ ...e, added: cut(e.added, INNER_LIMIT), removed: cut(e.removed, INNER_LIMIT), addedTotal: e.added.length, removedTotal: e.removed.length })),
      entriesChecked: c.dominators.entriesChecked,
      entriesTotal: c.dominators.entriesTotal,
    },
    policies: policies.map((p) => ({ ...p, findings: cut<PolicyFinding>(p.findings), findingsTotal: p.findings.length })),
    timings,
  };
}
