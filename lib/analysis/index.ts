// Runs every measure of DESIGN §3 over one snapshot and returns plain, serialisable results.
// Pure: no database, no framework. Long phases report progress through `onProgress`.
import { articulation } from "./articulation";
import { betweennessParallel } from "./betweenness";
import { singleFailureBlast } from "./single-failures";
import { bootOrder } from "./boot-order";
import { clustering } from "./clustering";
import { dominators } from "./dominators";
import { eigenvector } from "./eigenvector";
import { buildGraph, type CompactGraph } from "./graph";
import { pagerank } from "./pagerank";
import { pinchScores } from "./pinch-score";
import { competitionRanks } from "./ranks";
import { scc } from "./scc";
import {
  DEFAULT_PINCH_WEIGHTS,
  analysisOptionsSchema,
  type AnalysisInput,
  type AnalysisOptions,
  type AnalysisPhase,
  type AnalysisResult,
  type NodeMetrics,
  type ProgressCallback,
  type RankedMeasure,
  RANKED_MEASURES,
} from "./types";
import type { Strength } from "../inventory/types";

export * from "./types";
export { buildGraph, type CompactGraph } from "./graph";
export { passesThrough } from "./dominators";
export { drill, type DrillRequest } from "./drill";

const STRENGTH_OF_CODE: Record<number, Strength> = { 3: "hard", 2: "startup", 1: "soft" };

// Rough share of the total run time of each phase on dependency-shaped graphs, so that the
// progress fraction moves evenly rather than jumping.
const PHASES: Array<[AnalysisPhase, number]> = [
  ["graph", 0.04],
  ["betweenness", 0.5],
  ["pagerank", 0.03],
  ["eigenvector", 0.03],
  ["clustering", 0.03],
  ["articulation", 0.02],
  ["scc", 0.02],
  ["boot-order", 0.01],
  ["dominators", 0.12],
  ["blast-radius", 0.18],
  ["pinch-score", 0.02],
];

export async function analyse(
  input: AnalysisInput | CompactGraph,
  options: AnalysisOptions = {},
  onProgress?: ProgressCallback,
): Promise<AnalysisResult> {
  const opts = analysisOptionsSchema.parse(options);
  const weights = opts.weights ?? DEFAULT_PINCH_WEIGHTS;
  const timings: AnalysisResult["timings"] = {};
  let base = 0;
  const phase = async <T>(name: AnalysisPhase, run: (report: (f: number) => void) => T | Promise<T>): Promise<T> => {
    const share = PHASES.find(([p]) => p === name)?.[1] ?? 0;
    const report = (f: number): void => onProgress?.(Math.min(1, base + share * f), name);
    report(0);
    const t0 = performance.now();
    const value = await run(report);
    timings[name] = performance.now() - t0;
    // Yield to the event loop between phases, so a caller's timers (the job's heartbeat) can run.
    await new Promise<void>((resolve) => setImmediate(resolve));
    base += share;
    report(0);
    return value;
  };

  const graph = await phase("graph", () => ("n" in input ? input : buildGraph(input)));
  const bc = await phase("betweenness", (report) =>
    betweennessParallel(graph, {
      exactLimit: opts.exactLimit,
      sampleSize: opts.sampleSize,
      seed: opts.seed,
      threads: opts.threads,
      parallelThreshold: opts.parallelThreshold,
      minParallelMs: opts.minParallelMs,
      onProgress: report,
    }),
  );
  const pr = await phase("pagerank", () => pagerank(graph));
  const ev = await phase("eigenvector", () => eigenvector(graph, opts.eigenvector));
  const cc = await phase("clustering", () => clustering(graph));
  const ap = await phase("articulation", () => articulation(graph));
  const comps = await phase("scc", () => scc(graph));
  const boot = await phase("boot-order", () => bootOrder(graph, graph.boot === graph.out ? comps : scc(graph, graph.boot)));
  const dom = await phase("dominators", () => dominators(graph, { workLimit: opts.dominatorWorkLimit }));
  const blast = await phase("blast-radius", (report) => singleFailureBlast(graph, report));
  const pinch = await phase("pinch-score", () => pinchScores(graph, bc.values, blast.downTierWeight, weights));

  const { keys, n } = graph;
  const key = (v: number): string => keys[v]!;
  const prValue = (v: number): number | null => (pr.converged ? pr.values[v]! : null);
  const evValue = (v: number): number | null => (ev.converged ? ev.values[v]! : null);
  const ranked: Record<RankedMeasure, ReturnType<typeof competitionRanks>> = {
    betweenness: competitionRanks(bc.values),
    pagerank: competitionRanks(Array.from({ length: n }, (_, v) => prValue(v))),
    eigenvector: competitionRanks(Array.from({ length: n }, (_, v) => evValue(v))),
    pinchScore: competitionRanks(pinch.score),
    blastDown: competitionRanks(blast.down),
  };
  const ranksOf = (v: number): NodeMetrics["ranks"] =>
    Object.fromEntries(RANKED_MEASURES.map((m) => [m, { rank: ranked[m].rank[v] ?? null, tied: ranked[m].tied[v]! }])) as NodeMetrics["ranks"];
  const isEntry = new Uint8Array(n);
  for (const r of dom.roots) isEntry[r] = 1;
  const nodes: NodeMetrics[] = [];
  for (let v = 0; v < n; v++) {
    nodes.push({
      key: key(v),
      betweenness: bc.values[v]!,
      pagerank: prValue(v),
      eigenvector: evValue(v),
      clustering: cc[v]!,
      articulation: ap.articulation[v] === 1,
      inCycle: comps.inCycle[v] === 1,
      blastDown: blast.down[v]!,
      blastDegraded: blast.degraded[v]!,
      pinchScore: pinch.score[v]!,
      singlePoint: pinch.s[v] === 1,
      ranks: ranksOf(v),
      bootStage: boot.stageOf[v]!,
      waitsOnCycle: boot.waitsOnCycle[v] === 1,
      entry: isEntry[v] === 1,
      dominator: {
        reachedFrom: dom.reachedFrom[v]!,
        dominatesFrom: dom.dominatesFrom[v]!,
        maxDominated: dom.maxDominated[v]!,
        allDominated: dom.allDominated[v]!,
        allIdom: dom.allIdom[v]! >= 0 ? key(dom.allIdom[v]!) : null,
        topEntries: dom.topEntries[v]!.map((t) => ({ entry: key(t.entry), dominated: t.dominated })),
      },
    });
  }
  const selfLoops: string[] = [];
  for (let v = 0; v < n; v++) if (graph.selfLoop[v]) selfLoops.push(key(v));
  const cycles = comps.cycles.map((c) => c.map(key));
  const waitingOnCycle: string[] = [];
  for (let v = 0; v < n; v++) if (boot.waitsOnCycle[v]) waitingOnCycle.push(key(v));
  onProgress?.(1, "done");
  return {
    nodes,
    graph: {
      nodeCount: n,
      edgeCount: graph.edgeCount,
      selfLoops,
      implicitKeys: [...graph.implicitKeys],
      bridges: ap.bridges.map(([a, b]) => [key(a), key(b)]),
      cycles,
      bootOrder: {
        stages: boot.stages.map((s) => s.map(key)),
        cycles: boot.cycles.map((c) => c.map(key)),
        waitingOnCycle,
        plans: boot.plans.map((p) => ({
          order: p.order.map(key),
          breaks: p.breaks.map((b) => ({ from: key(b.from), to: key(b.to), strength: STRENGTH_OF_CODE[b.strength] ?? "hard" })),
          breakCount: p.breakCount,
        })),
      },
      exact: bc.exact,
      sampleSize: bc.sampleSize,
      betweennessThreads: bc.threadsUsed,
      betweennessMs: timings.betweenness ?? 0,
      pagerank: {
        converged: pr.converged,
        reason: pr.converged ? null : `did not converge: PageRank still moved after ${pr.iterations} iterations`,
        iterations: pr.iterations,
      },
      eigenvector: { converged: ev.converged, reason: ev.reason, iterations: ev.iterations, method: ev.method, eigenvalue: ev.eigenvalue },
      dominators: { roots: dom.roots.map(key), complete: dom.complete, entriesAnalysed: dom.entriesAnalysed },
      weights,
    },
    timings,
  };
}
