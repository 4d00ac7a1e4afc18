// A snapshot's content as the analysis sees it, under the environment's settings: needs known only
// from configuration or only from traces count as the settings say (DESIGN §10), and the analysis
// view picks which needs take part at all.
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
export function inView(d: Pick<SnapshotDependency, "provenance">, view: AnalysisSettings["analysisView"]): boolean {
  if (view === null || view === "both") return true;
  const p = provenanceOf(d);
  return view === "observed" ? p.includes("observed") : p.some((x) => x !== "observed");
}

export function analysisInputFromContent(content: SnapshotContent, settings: AnalysisSettings = DEFAULT_ANALYSIS_SETTINGS): AnalysisInput {
  return {
    nodes: content.components.map((c) => ({
      key: c.key,
      tier: c.tier,
      replicas: c.replicas,
      zones: c.zones,
      team: c.team,
      undeclared: c.kind === "undeclared",
    })),
    edges: content.dependencies
      .filter((d) => inView(d, settings.analysisView))
      .map((d) => ({ from: d.from, to: d.to, strength: effectiveStrength(d, settings), group: d.group })),
  };
}

/** A stable key of the settings that change the analysis input (for caches of built graphs). */
export const analysisSettingsKey = (s: AnalysisSettings): string => `${s.inferredNeeds}/${s.observedNeeds}/${s.analysisView ?? "auto"}`;
