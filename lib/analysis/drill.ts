// A drill in the shape the API returns (DESIGN §4): the blast radius of a failed set of
// components and/or zones, with keys, grouped by team and counted by tier.
import { blastRadius } from "./blast-radius";
import type { CompactGraph } from "./graph";

export interface DrillRequest {
  components?: readonly string[];
  zones?: readonly string[];
}

export interface DrillResult {
  down: string[];
  degraded: string[];
  teams: Array<{ team: string | null; down: string[]; degraded: string[] }>;
  byTier: Record<"1" | "2" | "3" | "4", number>;
  /** Requested component keys that are not in the graph (the caller decides if that is a 404). */
  unknown: string[];
}

/**
 * `teamOf` gives the team to page for a component (the caller may know owners the graph does not);
 * by default the team the graph carries. Teams come back unowned first — nobody is paged for
 * those, so a person must notice them — then by how much each has down, then degraded.
 */
export function drill(graph: CompactGraph, request: DrillRequest, teamOf: (v: number) => string | null = (v) => graph.team[v] ?? null): DrillResult {
  const unknown: string[] = [];
  const components: number[] = [];
  for (const k of request.components ?? []) {
    const i = graph.indexOf.get(k);
    if (i === undefined) unknown.push(k);
    else components.push(i);
  }
  const result = blastRadius(graph, { components, zones: request.zones ?? [] });
  const down = result.down.map((v) => graph.keys[v]!);
  const degraded = result.degraded.map((v) => graph.keys[v]!);
  const byTeam = new Map<string | null, { down: string[]; degraded: string[] }>();
  const entry = (team: string | null): { down: string[]; degraded: string[] } => {
    let e = byTeam.get(team);
    if (!e) {
      e = { down: [], degraded: [] };
      byTeam.set(team, e);
    }
    return e;
  };
  const byTier = { "1": 0, "2": 0, "3": 0, "4": 0 };
  for (const v of result.down) {
    const k = graph.keys[v]!;
    entry(teamOf(v)).down.push(k);
    const t = String(graph.tier[v]) as keyof typeof byTier;
    byTier[t]++;
  }
  for (const v of result.degraded) entry(teamOf(v)).degraded.push(graph.keys[v]!);
  const teams = [...byTeam.entries()]
    .map(([team, e]) => ({ team, ...e }))
    .sort(
      (a, b) =>
        Number(a.team !== null) - Number(b.team !== null) ||
        b.down.length - a.down.length ||
        b.degraded.length - a.degraded.length ||
        (a.team ?? "").localeCompare(b.team ?? ""),
    );
  return { down, degraded, teams, byTier, unknown };
}
