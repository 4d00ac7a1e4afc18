// A snapshot's content as the analysis sees it, under the environment's settings: needs known only
// from configuration or only from traces count as the settings say (DESIGN §10), and the analysis
// view picks which needs take part at all.
import { OBSERVED_SOURCE } from "../inventory/observed";
import { provenanceOf, type SnapshotContent, type SnapshotDependency } from "../inventory/snapshot";
import type { EnvironmentSettings } from "../inventory/settings";
import type { Strength } from "../inventory/types";
import type { AnalysisInput } from "./types";

export type AnalysisSettings = Pick<EnvironmentSettings, "inferredNeeds" | "observedNeeds" | "analysisView">;

export const DEFAULT_ANALYSIS_SETTINGS: AnalysisSettings = { inferredNeeds: "hard", observedNeeds: "soft", analysisView: null };

/** The strength a need counts with: a stated start-up or soft need is never promoted. */
export function effectiveStrength(d: Pick<SnapshotDependency, "strength" | "provenance">, settings: AnalysisSettings): Strength {
  if (d.strength !== "hard") return d.strength;
  const p = provenanceOf(d);
  if (p.includes("declared")) return "hard";
  if (p.includes("inferred")) return settings.inferredNeeds;
  return settings.observedNeeds;
}

/** Whether a need takes part in the chosen view; `null` (both, or whichever exists) keeps every need. */
function inView(d: Pick<SnapshotDependency, "provenance">, view: AnalysisSettings["analysisView"]): boolean {
  if (view === null || view === "both") return true;
  const p = provenanceOf(d);
  return view === "observed" ? p.includes("observed") : p.some((x) => x !== "observed");
}

export function analysisInputFromContent(content: SnapshotContent, settings: AnalysisSettings = DEFAULT_ANALYSIS_SETTINGS): AnalysisInput {
  // Components, too, belong to a view: the declared one leaves out what only traces know of (unless
  // a declared need points at it: it stands where an undeclared placeholder would), the observed
  // one what no trace touched.
  const view = settings.analysisView;
  const dependencies = content.dependencies.filter((d) => inView(d, view));
  const endpoints = new Set(dependencies.flatMap((d) => [d.from, d.to]));
  const components = content.components.filter((c) =>
    view === "declared" ? c.source !== OBSERVED_SOURCE || endpoints.has(c.key) : view === "observed" ? endpoints.has(c.key) || c.source === OBSERVED_SOURCE : true,
  );
  return {
    nodes: components.map((c) => ({
      key: c.key,
      tier: c.tier,
      replicas: c.replicas,
      zones: c.zones,
      team: c.team,
      undeclared: c.kind === "undeclared",
    })),
    edges: dependencies.map((d) => ({ from: d.from, to: d.to, strength: effectiveStrength(d, settings), group: d.group })),
  };
}

/** A stable key of the settings that change the analysis input (for caches of built graphs). */
export const analysisSettingsKey = (s: AnalysisSettings): string => `${s.inferredNeeds}/${s.observedNeeds}/${s.analysisView ?? "auto"}`;
