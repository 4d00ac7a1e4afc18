// The impact of a proposed change, from two snapshot contents to the report: the proposed graph
// is analysed by `analyse` under the environment's settings (lib/analysis/input.ts), exactly as
// the worker would analyse it once pushed; the current graph's analysis is the stored one when the
// caller has it fresh, else computed here the same way. Pure: the data layer (lib/data/impact.ts)
// loads what this needs.
import { analyse } from "@/lib/analysis";
import { buildGraph } from "@/lib/analysis/graph";
import { analysisInputFromContent, type AnalysisSettings } from "@/lib/analysis/input";
import type { PinchWeights } from "@/lib/analysis/types";
import type { SnapshotContent } from "@/lib/inventory/snapshot";
import { compareSides, sideFromAnalysis, type ComponentFacts, type ImpactSide, type MeasureFacts } from "./compare";
import { evaluatePolicies, type ReviewState } from "./evaluate";
import { NO_POSITIONS, type Locator } from "./locate";
import type { PolicySet } from "./policies";
import { buildReport, type ImpactReport } from "./report";

export type { ImpactReport } from "./report";

/** The worker's stored analysis of the current snapshot, when it is fresh (same content, settings and weights). */
export interface StoredAnalysis {
  snapshot: number;
  measures: ReadonlyMap<string, MeasureFacts>;
  bridges: ReadonlyArray<readonly [string, string]>;
  exact: boolean;
}

function componentFacts(content: SnapshotContent): Map<string, ComponentFacts> {
  return new Map(content.components.map((c) => [c.key, { key: c.key, name: c.name, kind: c.kind, tier: c.tier, team: c.team }]));
}

export interface ImpactRequest {
  environment: string;
  link: string;
  before: SnapshotContent;
  after: SnapshotContent;
  /** Number of the current snapshot, null before the first push. */
  snapshot: number | null;
  stored: StoredAnalysis | null;
  /** The proposed content equals the current one (same hash): analyse once and compare it with itself. */
  unchanged?: boolean;
  /** Keys whose component or needs the change touches, when the caller knows (compareSides' `changed`). */
  changed?: ReadonlySet<string>;
  settings: AnalysisSettings;
  weights: PinchWeights;
  policies: PolicySet;
  reviews: ReadonlyMap<string, ReviewState>;
  locator?: Locator;
}

const ms = (t0: number): number => Math.round(performance.now() - t0);

export async function impactOf(req: ImpactRequest): Promise<ImpactReport> {
  const t0 = performance.now();
  const timings: Record<string, number> = {};
  const inputB = analysisInputFromContent(req.before, req.settings);
  const graphB = buildGraph(inputB);
  const componentsB = componentFacts(req.before);
  let before: ImpactSide;
  let exact: boolean;
  if (req.stored) {
    before = { input: inputB, graph: graphB, measures: req.stored.measures, bridges: req.stored.bridges, components: componentsB };
    exact = req.stored.exact;
  } else {
    const resultB = await analyse(graphB, { weights: req.weights });
    before = sideFromAnalysis({ input: inputB, graph: graphB, result: resultB, components: componentsB });
    exact = resultB.graph.exact;
  }
  timings.current = ms(t0);

  const t1 = performance.now();
  let after: ImpactSide;
  if (req.unchanged) after = { ...before, components: componentFacts(req.after) };
  else {
    const inputA = analysisInputFromContent(req.after, req.settings);
    const graphA = buildGraph(inputA);
    // The dominator trees of every entry are not read here (compare.ts works out the few it needs).
    const resultA = await analyse(graphA, { weights: req.weights });
    after = sideFromAnalysis({ input: inputA, graph: graphA, result: resultA, components: componentFacts(req.after) });
    exact &&= resultA.graph.exact;
  }
  timings.proposed = ms(t1);

  const t2 = performance.now();
  const comparison = compareSides(before, after, { movement: req.policies.movement, ...(req.changed ? { changed: req.changed } : {}) });
  const policies = evaluatePolicies({ comparison, before, after, policies: req.policies, reviews: req.reviews, locator: req.locator ?? NO_POSITIONS });
  timings.compare = ms(t2);
  timings.total = ms(t0);
  return buildReport({
    environment: req.environment,
    link: req.link,
    basis: {
      snapshot: req.snapshot,
      analysis: req.snapshot === null ? "empty" : req.stored ? "stored" : "recomputed",
      view: req.settings.analysisView ?? "auto",
      exactBetweenness: exact,
    },
    comparison,
    policies,
    before,
    after,
    timings,
  });
}
