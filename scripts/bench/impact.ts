// Impact benchmark: a 20,000-component estate in PostgreSQL (one platform source and one team's
// source of 200 components), analysed by the worker's job code; then a change to the team's file
// that touches 50 components, dry-run through the API's push path with impact=true. Invented names.
import type { AnalysisEdge, AnalysisInput } from "../../lib/analysis/types";
import { mulberry32 } from "../../lib/analysis/random";
import { inventoryYaml } from "./push";

export interface ImpactBenchFiles {
  platform: string;
  team: string;
  /** The team's file with 50 components changed. */
  changed: string;
  /** The whole estate in one file with the same 50 changes (every line parsed with positions). */
  wholeChanged: string;
  touched: number;
}

const subset = (input: AnalysisInput, keys: Set<string>): AnalysisInput => ({
  nodes: input.nodes.filter((n) => keys.has(n.key)),
  edges: input.edges.filter((e) => keys.has(e.from)),
});

export function impactBenchFiles(input: AnalysisInput, teamSize = 200, touch = 50): ImpactBenchFiles {
  const rand = mulberry32(7);
  const teamKeys = new Set(input.nodes.slice(-teamSize).map((n) => n.key));
  const platformKeys = new Set(input.nodes.filter((n) => !teamKeys.has(n.key)).map((n) => n.key));
  const team = subset(input, teamKeys);
  // Platform components on one replica: the targets of new hard needs a policy should catch.
  const single = input.nodes.filter((n) => platformKeys.has(n.key) && n.replicas <= 1).map((n) => n.key);
  const nodes = team.nodes.map((n) => ({ ...n, zones: [...n.zones] }));
  let edges: AnalysisEdge[] = team.edges.map((e) => ({ ...e }));
  const chosen = [...nodes].sort(() => rand() - 0.5).slice(0, touch);
  chosen.forEach((n, i) => {
    if (i % 5 === 0) n.tier = 1; // made tier 1
    else if (i % 5 === 1) n.replicas = 1; // lost its replicas
    else if (i % 5 === 2) edges = edges.filter((e) => e.from !== n.key || e.group !== null).slice(0); // plain needs dropped
    else edges.push({ from: n.key, to: single[Math.floor(rand() * single.length)]!, strength: "hard", group: null }); // a new hard need
  });
  const changedTeam: AnalysisInput = { nodes, edges };
  const platform = subset(input, platformKeys);
  return {
    platform: inventoryYaml(platform, "platform-repo", "bench-impact"),
    team: inventoryYaml(team, "team-repo", "bench-impact"),
    changed: inventoryYaml(changedTeam, "team-repo", "bench-impact"),
    wholeChanged: inventoryYaml({ nodes: [...platform.nodes, ...changedTeam.nodes], edges: [...platform.edges, ...changedTeam.edges] }, "estate-repo", "bench-impact-one"),
    touched: chosen.length,
  };
}
