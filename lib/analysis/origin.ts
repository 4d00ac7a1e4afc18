// Probable origin of an incident: many components alert at once; which failures explain the rest?
// Two readings of the declared graph, shown side by side because neither is a diagnosis.
//
// 1. Explanation by blast radius. A component c "explains" a firing component f when f is down
//    or degraded in the blast radius of c alone (DESIGN §3 rules: hard and soft needs, any_of
//    groups, zones; start-up-only needs ignored). Degraded counts: an unmet soft need is a common
//    cause of latency alerts; the result keeps which firing components are explained only as
//    degraded so that a screen can say so. The smallest set of firing components whose combined
//    blast radii cover the most firing components is a set-cover problem; we use the greedy
//    algorithm (pick the candidate covering most still-unexplained firing components, repeat),
//    which is within a factor H(d) = 1 + 1/2 + … + 1/d ≤ ln d + 1 of the optimum, d the largest
//    set (Johnson 1974; Lovász 1975; Chvátal, "A greedy heuristic for the set-covering problem",
//    Math. Oper. Res. 4, 1979). Ties go to more explained as down, then the higher tier-weighted
//    reach, then the key.
// 2. Personalised PageRank seeded by the firing components, walking along needs (from a dependent
//    to what it needs, the reverse of the direction failure travels), in the manner of MonitorRank
//    (Kim, Sumbaly & Shah, SIGMETRICS 2013) without its metric-correlation weights, which the
//    declared graph does not have: probability mass collects on what many firing components
//    share. Teleport and dangling mass go to the firing set, as NetworkX
//    `pagerank(G, alpha, personalization=…)` does on the dependency graph as stored.
//
// Beside the cover, three things an on-call engineer would otherwise miss:
// - Silent suspects: a component that is not alerting (or a zone) whose failure alone explains
//   more firing components than any firing one does — a shared dependency without monitoring,
//   the usual reason why "two independent origins" are really one.
// - Jointly explained: a firing component no single failure explains but that is down once the
//   other firing components are, e.g. an any_of group whose members all alert.
// - Unexplained: firing components that nothing firing explains even together: a separate fault,
//   or a need the inventory does not declare.
import { BlastPropagation, failedByZones, tierWeight } from "./blast-radius";
import type { CompactGraph } from "./graph";
import { pagerank } from "./pagerank";

interface Explanation {
  /** Firing components down or degraded when this alone fails (a firing candidate itself included), sorted. */
  explains: string[];
  /** Of `explains`, the ones only degraded (a soft need unmet), sorted. */
  degraded: string[];
}

interface OriginCandidate extends Explanation {
  key: string;
  /** Of `explains`, the ones not already explained by an earlier pick of the cover. */
  newlyExplained: string[];
  /** What its failure takes down or degrades that is not firing (yet), most critical tier first. */
  predicted: { down: string[]; degraded: string[] };
}

interface SilentSuspect extends Explanation {
  kind: "component" | "zone";
  /** Component key or zone name. */
  key: string;
  /** How many components beyond the firing ones its failure would take down or degrade. */
  predicted: { down: number; degraded: number };
}

interface JointExplanation {
  key: string;
  /** The members of its unmet needs when every other firing component fails. */
  by: string[];
}

interface RankedFiring {
  key: string;
  /** Firing components its failure explains, itself included. */
  explains: number;
  /** Of those, explained only as degraded. */
  degraded: number;
  /** Σ tier weight over what its failure takes down (itself excluded), as in the pinch score's R term. */
  reach: number;
}

export interface OriginResult {
  firing: string[];
  /** Firing keys not in the graph (listed, never dropped). */
  unknown: string[];
  /** The greedy cover, in pick order; only picks that explain at least one other firing component. */
  origins: OriginCandidate[];
  /** How many firing components the origins explain (themselves included). */
  explainedCount: number;
  /** Firing components no single failure explains but that the other firing ones do together. */
  jointly: JointExplanation[];
  /** Firing components nothing firing explains, alone or together; firing = explained + jointly + unexplained. */
  unexplained: string[];
  /** Every firing component by how many firing components its failure alone explains. */
  ranking: RankedFiring[];
  /** Components not firing (and zones) that alone explain more than any firing component does. */
  silent: SilentSuspect[];
  /**
   * Components ranked by personalised PageRank, highest first, with their scores (sum to 1 over the
   * graph) and their share under plain PageRank (uniform teleport): shared infrastructure that every
   * walk ends in (name resolution, the network) scores high in any incident, so the ratio of the two
   * says what this incident adds.
   */
  pagerank: Array<{ key: string; score: number; usual: number; firing: boolean }>;
  /** What the origins' failures take down or degrade beyond what already fires, most critical tier first. */
  predicted: { down: string[]; degraded: string[] };
}

export interface OriginOptions {
  /** How many PageRank entries to return (firing or not); default 20. */
  pagerankTop?: number;
  alpha?: number;
  /** How many silent suspects to return at most; default 5. */
  silentTop?: number;
}

interface Cover {
  covers: number[];
  degraded: Set<number>;
  down: Int32Array;
  degradedAll: number[];
  reach: number;
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
  const keys = (vs: Iterable<number>) => [...vs].map(key).sort();
  // What will likely fail next reads best most critical first.
  const byTier = (vs: Iterable<number>) => [...vs].sort((a, b) => graph.tier[a]! - graph.tier[b]! || (key(a) < key(b) ? -1 : 1)).map(key);
  const prop = new BlastPropagation(graph);

  const explanationOf = (down: Int32Array, degradedAll: number[]): { covers: number[]; degraded: Set<number> } => {
    const covers: number[] = [];
    const degraded = new Set<number>();
    for (const v of down) if (isFiring[v]) covers.push(v);
    for (const v of degradedAll)
      if (isFiring[v]) {
        covers.push(v);
        degraded.add(v);
      }
    return { covers, degraded };
  };

  // Blast radius of each firing component alone.
  const cover = new Map<number, Cover>();
  for (const c of firing) {
    const r = prop.run([c]);
    let reach = 0;
    for (const v of r.down) if (v !== c) reach += tierWeight(graph.tier[v]!);
    cover.set(c, { ...explanationOf(r.down, r.degraded), down: r.down, degradedAll: r.degraded, reach });
  }
  const entry = (c: number) => cover.get(c)!;

  const explained = new Uint8Array(graph.n);
  const origins: OriginCandidate[] = [];
  const predictedDown = new Set<number>();
  const predictedDegraded = new Set<number>();
  let explainedCount = 0;
  const remaining = new Set(firing);
  for (;;) {
    let best = -1;
    let bestGain = 0;
    let bestDownGain = 0;
    for (const c of remaining) {
      const e = entry(c);
      let gain = 0;
      let downGain = 0;
      let others = 0;
      for (const v of e.covers) {
        if (explained[v]) continue;
        gain++;
        if (!e.degraded.has(v)) downGain++;
        if (v !== c) others++;
      }
      // A candidate that would explain no other firing component is no origin of anything.
      if (others === 0) continue;
      const b = best === -1 ? null : entry(best);
      const better =
        b === null ||
        gain > bestGain ||
        (gain === bestGain && (downGain > bestDownGain || (downGain === bestDownGain && (e.reach > b.reach || (e.reach === b.reach && key(c) < key(best))))));
      if (better) {
        best = c;
        bestGain = gain;
        bestDownGain = downGain;
      }
    }
    if (best === -1) break;
    remaining.delete(best);
    const e = entry(best);
    const newly = e.covers.filter((v) => !explained[v]);
    for (const v of newly) explained[v] = 1;
    explainedCount += newly.length;
    const down = [...e.down].filter((v) => !isFiring[v]);
    const degraded = e.degradedAll.filter((v) => !isFiring[v]);
    for (const v of down) predictedDown.add(v);
    for (const v of degraded) predictedDegraded.add(v);
    origins.push({
      key: key(best),
      explains: keys(e.covers),
      degraded: keys(e.degraded),
      newlyExplained: keys(newly),
      predicted: { down: byTier(down), degraded: byTier(degraded) },
    });
  }
  for (const v of predictedDown) predictedDegraded.delete(v);

  // Explained only together: down (or degraded) once every other firing component has failed.
  const jointly: JointExplanation[] = [];
  const unexplained: number[] = [];
  const leftOver = firing.filter((v) => !explained[v]);
  if (leftOver.length > 0) {
    const groupsOf = ownerGroups(graph);
    for (const f of leftOver) {
      const others = firing.filter((v) => v !== f);
      prop.run(others);
      const groups = unmetGroups(graph, groupsOf, f, prop);
      if (groups.length === 0) {
        unexplained.push(f);
        continue;
      }
      const by = new Set<number>();
      const { members } = graph.needs;
      for (const g of groups) for (let e = members.offsets[g]!; e < members.offsets[g + 1]!; e++) by.add(members.targets[e]!);
      jointly.push({ key: key(f), by: keys(by) });
    }
  }
  jointly.sort((a, b) => (a.key < b.key ? -1 : 1));

  const ranking: RankedFiring[] = firing
    .map((c) => {
      const e = entry(c);
      return { key: key(c), explains: e.covers.length, degraded: e.degraded.size, reach: e.reach };
    })
    .sort((a, b) => b.explains - a.explains || b.explains - b.degraded - (a.explains - a.degraded) || b.reach - a.reach || (a.key < b.key ? -1 : 1));

  const silent = silentSuspects(graph, prop, firing, isFiring, ranking[0]?.explains ?? 0, explanationOf, options.silentTop ?? 5);

  const personalization = new Float64Array(graph.n);
  for (const v of firing) personalization[v] = 1;
  const alpha = options.alpha ?? 0.85;
  const pr = firing.length > 0 ? pagerank(graph, { alpha, personalization }).values : new Float64Array(graph.n);
  const top = options.pagerankTop ?? 20;
  const order = firing.length > 0 ? topIndices(pr, top, key) : [];
  const usual = order.length > 0 ? pagerank(graph, { alpha }).values : new Float64Array(graph.n);

  return {
    firing: keys(firing),
    unknown: unknown.sort(),
    origins,
    explainedCount,
    jointly,
    unexplained: keys(unexplained),
    ranking,
    silent,
    pagerank: order.map((v) => ({ key: key(v), score: pr[v]!, usual: usual[v]!, firing: isFiring[v] === 1 })),
    predicted: { down: byTier(predictedDown), degraded: byTier(predictedDegraded) },
  };
}

/** Groups (needs) of each owner, built on demand: only incidents with left-over alerts need it. */
function ownerGroups(graph: CompactGraph): { offsets: Int32Array; groups: Int32Array } {
  const { n, needs } = graph;
  const offsets = new Int32Array(n + 1);
  for (let g = 0; g < needs.count; g++) offsets[needs.owner[g]! + 1]!++;
  for (let v = 0; v < n; v++) offsets[v + 1]! += offsets[v]!;
  const fill = offsets.slice(0, n);
  const groups = new Int32Array(needs.count);
  for (let g = 0; g < needs.count; g++) groups[fill[needs.owner[g]!]!++] = g;
  return { offsets, groups };
}

/** Needs of f with every member down in the last propagation run. */
function unmetGroups(graph: CompactGraph, index: { offsets: Int32Array; groups: Int32Array }, f: number, prop: BlastPropagation): number[] {
  const { members } = graph.needs;
  const out: number[] = [];
  for (let i = index.offsets[f]!; i < index.offsets[f + 1]!; i++) {
    const g = index.groups[i]!;
    let all = true;
    for (let e = members.offsets[g]!; e < members.offsets[g + 1]! && all; e++) all = prop.isDown(members.targets[e]!);
    if (all) out.push(g);
  }
  return out;
}

/**
 * Components not firing, and zones, whose failure alone explains more firing components than the
 * best firing one does. A firing component f can only be explained by what it reaches along its
 * needs, so the number of firing components reaching v bounds what v explains: candidates are
 * tried in order of that bound and the search stops when the bound cannot beat the weakest kept.
 */
function silentSuspects(
  graph: CompactGraph,
  prop: BlastPropagation,
  firing: readonly number[],
  isFiring: Uint8Array,
  bestFiring: number,
  explanationOf: (down: Int32Array, degraded: number[]) => { covers: number[]; degraded: Set<number> },
  topN: number,
): SilentSuspect[] {
  if (firing.length < 2 || topN <= 0) return [];
  const { n, out } = graph;
  const bound = new Int32Array(n);
  const seen = new Int32Array(n);
  const stack = new Int32Array(n);
  firing.forEach((f, i) => {
    const stamp = i + 1;
    let top = 0;
    stack[top++] = f;
    seen[f] = stamp;
    while (top > 0) {
      const v = stack[--top]!;
      for (let e = out.offsets[v]!; e < out.offsets[v + 1]!; e++) {
        const w = out.targets[e]!;
        if (seen[w] === stamp) continue;
        seen[w] = stamp;
        if (!isFiring[w]) bound[w]!++;
        stack[top++] = w;
      }
    }
  });
  const kept: SilentSuspect[] = [];
  // Below this count nothing can enter the list; at it, a candidate may still win the tie-break.
  const floor = () => (kept.length < topN ? bestFiring + 1 : kept[kept.length - 1]!.explains.length);
  const consider = (kind: SilentSuspect["kind"], name: string, seeds: readonly number[]) => {
    const r = prop.run(seeds);
    const { covers, degraded } = explanationOf(r.down, r.degraded);
    if (covers.length < floor()) return;
    let down = 0;
    for (const v of r.down) if (!isFiring[v]) down++;
    const degradedBeyond = r.degraded.filter((v) => !isFiring[v]).length;
    const k = (vs: Iterable<number>) => [...vs].map((v) => graph.keys[v]!).sort();
    kept.push({ kind, key: name, explains: k(covers), degraded: k(degraded), predicted: { down, degraded: degradedBeyond } });
    kept.sort((a, b) => b.explains.length - a.explains.length || b.predicted.down - a.predicted.down || (a.key < b.key ? -1 : 1));
    if (kept.length > topN) kept.pop();
  };
  const candidates: number[] = [];
  for (let v = 0; v < n; v++) if (bound[v]! > bestFiring) candidates.push(v);
  candidates.sort((a, b) => bound[b]! - bound[a]! || a - b);
  for (const v of candidates) {
    if (bound[v]! < floor()) break;
    consider("component", graph.keys[v]!, [v]);
  }
  // A zone takes down every component that runs only in it: often the shared cause nobody alerts
  // on. Only zones of the firing components or of what they reach can explain any of them.
  const zones = new Set<string>();
  for (let v = 0; v < n; v++) if (isFiring[v] || bound[v]! > 0) for (const z of graph.zones[v]!) zones.add(z);
  for (const z of [...zones].sort()) consider("zone", z, failedByZones(graph, [z]));
  return kept;
}

/** The `k` largest entries (ties by key), without sorting the whole estate. */
function topIndices(values: Float64Array, k: number, key: (v: number) => string): number[] {
  const before = (a: number, b: number) => values[a]! > values[b]! || (values[a] === values[b] && key(a) < key(b));
  const top: number[] = [];
  for (let v = 0; v < values.length; v++) {
    if (top.length === k && !before(v, top[k - 1]!)) continue;
    let i = top.length;
    while (i > 0 && before(v, top[i - 1]!)) i--;
    top.splice(i, 0, v);
    if (top.length > k) top.pop();
  }
  return top;
}
