// Seeded synthetic dependency graphs for the benchmark: preferential attachment (Barabási &
// Albert 1999) with edges from each new component to ~outDegree older ones it needs, so that
// shared platforms become hubs, plus a few dependency cycles closed by back edges. Invented
// names only. Exported so that other bench sections (e.g. a push benchmark) use the same graphs.
import type { AnalysisEdge, AnalysisInput, AnalysisNode } from "../../lib/analysis/types";
import { mulberry32 } from "../../lib/analysis/random";
import type { Tier } from "../../lib/inventory/types";

export interface GenerateOptions {
  n: number;
  outDegree?: number;
  cycles?: number;
  seed?: number;
  /** Share of components with an any_of group of two alternatives. */
  anyOfShare?: number;
  softShare?: number;
  /** Close one long dependency cycle through this many random components (a stress case). */
  ring?: number;
}

const ZONES = ["zone-a", "zone-b", "zone-c"];

export function generateGraph(options: GenerateOptions): AnalysisInput {
  const { n } = options;
  const d = options.outDegree ?? 3;
  const rand = mulberry32(options.seed ?? 42);
  const anyOfShare = options.anyOfShare ?? 0.05;
  const softShare = options.softShare ?? 0.2;
  const pick = <T>(xs: readonly T[]): T => xs[Math.floor(rand() * xs.length)]!;
  const width = String(n).length;
  const key = (i: number): string => `svc-${String(i).padStart(width, "0")}`;
  const teams = Math.max(1, Math.round(n / 50));

  const nodes: AnalysisNode[] = [];
  for (let i = 0; i < n; i++) {
    const r = rand();
    const tier: Tier = r < 0.1 ? 1 : r < 0.3 ? 2 : r < 0.7 ? 3 : 4;
    const replicas = rand() < 0.5 ? 1 : 2 + Math.floor(rand() * 3);
    const zr = rand();
    const zones = zr < 0.15 ? [] : zr < 0.55 ? [pick(ZONES)] : ZONES.filter(() => rand() < 0.7);
    nodes.push({ key: key(i), tier, replicas, zones, team: rand() < 0.05 ? null : `team-${Math.floor(rand() * teams)}` });
  }

  // `ends` holds each node once plus once per dependent: sampling from it is attachment ∝ in-degree + 1.
  const ends: number[] = [0];
  const out: number[][] = [[]];
  const edges: AnalysisEdge[] = [];
  for (let i = 1; i < n; i++) {
    const want = Math.min(i, d);
    const chosen = new Set<number>();
    let guard = 0;
    while (chosen.size < want && guard++ < want * 20) chosen.add(ends[Math.floor(rand() * ends.length)]!);
    const targets = [...chosen];
    out.push(targets);
    let g = 0;
    if (targets.length >= 2 && rand() < anyOfShare) {
      const group = `any-${i}`;
      for (const t of targets.slice(0, 2)) edges.push({ from: key(i), to: key(t), strength: "hard", group });
      g = 2;
    }
    for (const t of targets.slice(g)) {
      edges.push({ from: key(i), to: key(t), strength: rand() < softShare ? "soft" : "hard", group: null });
    }
    for (const t of targets) ends.push(t);
    ends.push(i);
  }
  // Close a few cycles: walk a short way down from a component and point the last one back at it.
  const cycles = options.cycles ?? 5;
  for (let c = 0; c < cycles; c++) {
    const start = Math.floor(n / 2 + rand() * (n / 2));
    let v = start;
    const steps = 2 + c * 2;
    for (let s = 0; s < steps; s++) {
      const next = out[v];
      if (!next || next.length === 0) break;
      v = pick(next);
    }
    if (v !== start) edges.push({ from: key(v), to: key(start), strength: "hard", group: null });
  }
  const ring = Math.min(n, options.ring ?? 0);
  if (ring > 1) {
    const members = new Set<number>();
    while (members.size < ring) members.add(Math.floor(rand() * n));
    const list = [...members];
    list.forEach((v, i) => edges.push({ from: key(v), to: key(list[(i + 1) % list.length]!), strength: "hard", group: null }));
  }
  return { nodes, edges };
}

export function toEdgeList(input: AnalysisInput): string {
  return input.edges.map((e) => `${e.from} ${e.to}`).join("\n") + "\n";
}
