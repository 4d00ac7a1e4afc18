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
} from "./types";

export * from "./types";
export { buildGraph, type CompactGraph } from "./graph";
export { betweenness, betweennessParallel } from "./betweenness";
export { pagerank } from "./pagerank";
export { eigenvector } from "./eigenvector";
export { clustering } from "./clustering";
export { articulation } from "./articulation";
export { scc } from "./scc";
export { bootOrder } from "./boot-order";
export { dominators, dominatorTree, entryRoots } from "./dominators";
export { blastRadius, failedByZones, singleFailureBlastByPropagation, TIER_WEIGHTS } from "./blast-radius";
export { singleFailureBlast } from "./single-failures";
export { pinchScores, isSinglePoint } from "./pinch-score";
export { drill, type DrillRequest, type DrillResult } from "./drill";
export { probableOrigin, type OriginResult, type OriginCandidate } from "./origin";

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
  const dom = await phase("dominators", () =>
    dominators(graph, { maxTreeEntries: opts.maxDominatorTreeEntries }),
  );
  const blast = await phase("blast-radius", (report) => singleFailureBlast(graph, report));
  const pinch = await phase("pinch-score", () => pinchScores(graph, bc.values, blast.downTierWeight, weights));

  const { keys } = graph;
  const key = (v: number): string => keys[v]!;
  const nodes: NodeMetrics[] = [];
  for (let v = 0; v < graph.n; v++) {
    nodes.push({
      key: key(v),
      betweenness: bc.values[v]!,
      pagerank: pr.converged ? pr.values[v]! : null,
      eigenvector: ev.converged ? ev.values[v]! : null,
      clustering: cc[v]!,
      articulation: ap.articulation[v] === 1,
      inCycle: comps.inCycle[v] === 1,
      blastDown: blast.down[v]!,
      blastDegraded: blast.degraded[v]!,
      pinchScore: pinch.score[v]!,
      singlePoint: pinch.s[v] === 1,
      bootStage: boot.stageOf[v]!,
      dominator: {
        reachedFrom: dom.reachedFrom[v]!,
        dominatesFrom: dom.dominatesFrom[v]!,
        maxDominated: dom.maxDominated[v]!,
      },
    });
  }
  const selfLoops: string[] = [];
  for (let v = 0; v < graph.n; v++) if (graph.selfLoop[v]) selfLoops.push(key(v));
  const cycles = comps.cycles.map((c) => c.map(key));
  const waitingOnCycle: string[] = [];
  for (let v = 0; v < graph.n; v++) if (boot.waitsOnCycle[v]) waitingOnCycle.push(key(v));
  onProgress?.(1, "done");
  return {
    nodes,
    graph: {
      nodeCount: graph.n,
      edgeCount: graph.edgeCount,
      selfLoops,
      implicitKeys: [...graph.implicitKeys],
      bridges: ap.bridges.map(([a, b]) => [key(a), key(b)]),
      cycles,
      bootOrder: { stages: boot.stages.map((s) => s.map(key)), cycles: boot.cycles.map((c) => c.map(key)), waitingOnCycle },
      exact: bc.exact,
      sampleSize: bc.sampleSize,
      betweennessThreads: bc.threadsUsed,
      pagerank: {
        converged: pr.converged,
        reason: pr.converged ? null : `did not converge: PageRank still moved after ${pr.iterations} iterations`,
        iterations: pr.iterations,
      },
      eigenvector: { converged: ev.converged, reason: ev.reason, iterations: ev.iterations, method: ev.method, eigenvalue: ev.eigenvalue },
      dominatorRoots: dom.roots.map(key),
      dominatorTrees:
        dom.trees?.map((t) => {
          const idom: Record<string, string> = {};
          for (let i = 0; i < t.nodes.length; i++) idom[key(t.nodes[i]!)] = key(t.idom[i]!);
          return { root: key(t.root), idom };
        }) ?? null,
      weights,
    },
    timings,
  };
}
