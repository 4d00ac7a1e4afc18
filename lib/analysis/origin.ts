// Probable origin of an incident: many components alert at once; which failures explain the rest?
// Two readings of the declared graph, shown side by side because neither is a diagnosis.
//
// 1. Explanation by blast radius. A firing component c "explains" a firing component f when f is
//    down or degraded in the blast radius of c alone (DESIGN §3 rules: hard and soft needs, any_of
//    groups, start-up-only needs ignored). The smallest set of firing components whose combined
//    blast radii cover the most firing components is a set-cover problem; we use the greedy
//    algorithm (pick the candidate covering most still-unexplained firing components, repeat),
//    which is within a factor H(d) = 1 + 1/2 + … + 1/d ≤ ln d + 1 of the optimum, d the largest
//    set (Johnson 1974; Lovász 1975; Chvátal, "A greedy heuristic for the set-covering problem",
//    Math. Oper. Res. 4, 1979). Ties go to the higher tier-weighted reach, then the key.
// 2. Personalised PageRank seeded by the firing components, walking along needs (from a dependent
//    to what it needs, the reverse of the direction failure travels), in the manner of MonitorRank
//    (Kim, Sumbaly & Shah, SIGMETRICS 2013): probability mass collects on what many firing
//    components share. Teleport and dangling mass go to the firing set, as NetworkX
//    `pagerank(G, alpha, personalization=…)` does on the dependency graph as stored.
import { blastRadius, tierWeight } from "./blast-radius";
import type { CompactGraph } from "./graph";
import { pagerank } from "./pagerank";

export interface OriginCandidate {
  key: string;
  /** Firing components down or degraded when this one alone fails (itself included). */
  explains: string[];
  /** Of those, the ones that were not already explained by an earlier pick of the cover. */
  newlyExplained: string[];
  /** Components its failure would take down or degrade that are not firing (yet): what may fail next. */
  predicted: { down: string[]; degraded: string[] };
}

export interface OriginResult {
  firing: string[];
  /** Firing keys not in the graph (listed, never dropped). */
  unknown: string[];
  /** The greedy cover, in pick order; only picks that explain at least one other firing component. */
  origins: OriginCandidate[];
  /** Firing components that no other firing component explains (each its own origin, or an unrelated alert). */
  unexplained: string[];
  /** How many firing components the origins explain (themselves included). */
  explainedCount: number;
  /** Firing components ranked by personalised PageRank, highest first, with their scores (sum to 1 over the graph). */
  pagerank: Array<{ key: string; score: number; firing: boolean }>;
  /** What the origins' failures take down or degrade beyond what already fires. */
  predicted: { down: string[]; degraded: string[] };
}

export interface OriginOptions {
  /** How many PageRank entries to return (firing or not); default 20. */
  pagerankTop?: number;
  alpha?: number;
}

export function probableOrigin(graph: CompactGraph, firingKeys: readonly string[], options: OriginOptions = {}): OriginResult {
  const unknown: string[] = [];
  const firing: number[] = [];
  const isFiring = new Uint8Array(graph.n);
  for (const k of new Set(firingKeys)) {
    const v = graph.indexOf.get(k);
    if (v === undefined) unknown.push(k);
    else {
      firing.push(v);
      isFiring[v] = 1;
    }
  }
  const key = (v: number) => graph.keys[v]!;

  // Blast radius of each firing component alone: linear in what it reaches (blast-radius.ts).
  const cover = new Map<number, { covers: number[]; down: number[]; degraded: number[]; reach: number }>();
  for (const c of firing) {
    const r = blastRadius(graph, { components: [c] });
    let reach = 0;
    for (const v of r.down) if (v !== c) reach += tierWeight(graph.tier[v]!);
    const covers = [...r.down, ...r.degraded].filter((v) => isFiring[v]);
    cover.set(c, { covers, down: r.down, degraded: r.degraded, reach });
  }

  const explained = new Uint8Array(graph.n);
  const origins: OriginCandidate[] = [];
  const predictedDown = new Set<number>();
  const predictedDegraded = new Set<number>();
  let explainedCount = 0;
  const remaining = new Set(firing);
  for (;;) {
    let best = -1;
    let bestGain = 0;
    for (const c of remaining) {
      const entry = cover.get(c)!;
      let gain = 0;
      let others = 0;
      for (const v of entry.covers) {
        if (explained[v]) continue;
        gain++;
        if (v !== c) others++;
      }
      // A candidate that would explain no other firing component is no origin of anything.
      if (others === 0) continue;
      const better =
        best === -1 ||
        gain > bestGain ||
        (gain === bestGain && (entry.reach > cover.get(best)!.reach || (entry.reach === cover.get(best)!.reach && key(c) < key(best))));
      if (better) {
        best = c;
        bestGain = gain;
      }
    }
    if (best === -1) break;
    remaining.delete(best);
    const entry = cover.get(best)!;
    const newly = entry.covers.filter((v) => !explained[v]);
    for (const v of newly) explained[v] = 1;
    explainedCount += newly.length;
    const down = entry.down.filter((v) => !isFiring[v]);
    const degraded = entry.degraded.filter((v) => !isFiring[v]);
    for (const v of down) predictedDown.add(v);
    for (const v of degraded) predictedDegraded.add(v);
    origins.push({
      key: key(best),
      explains: entry.covers.map(key).sort(),
      newlyExplained: newly.map(key).sort(),
      predicted: { down: down.map(key), degraded: degraded.map(key) },
    });
  }
  for (const v of predictedDown) predictedDegraded.delete(v);

  const personalization = new Float64Array(graph.n);
  for (const v of firing) personalization[v] = 1;
  const pr = firing.length > 0 ? pagerank(graph, { alpha: options.alpha ?? 0.85, personalization }).values : new Float64Array(graph.n);
  const order = Array.from({ length: graph.n }, (_, v) => v).sort((a, b) => pr[b]! - pr[a]! || (key(a) < key(b) ? -1 : 1));
  const top = options.pagerankTop ?? 20;

  return {
    firing: firing.map(key).sort(),
    unknown: unknown.sort(),
    origins,
    unexplained: firing.filter((v) => !explained[v]).map(key).sort(),
    explainedCount,
    pagerank: firing.length > 0 ? order.slice(0, top).map((v) => ({ key: key(v), score: pr[v]!, firing: isFiring[v] === 1 })) : [],
    predicted: { down: [...predictedDown].map(key).sort(), degraded: [...predictedDegraded].map(key).sort() },
  };
}
