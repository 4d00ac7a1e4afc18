// Input and output shapes of the analysis. Pure data: no database, no framework.
import { z } from "zod";
import type { Strength, Tier } from "../inventory/types";

export interface AnalysisNode {
  key: string;
  tier: Tier;
  replicas: number;
  zones: string[];
  team: string | null;
  /** true for a placeholder created for a key that no source declares */
  undeclared?: boolean;
}

/** A directed dependency `from` (dependent) → `to` (what it needs). */
export interface AnalysisEdge {
  from: string;
  to: string;
  strength: Strength;
  /** Edges of one any_of group on one component share a group id; null for a plain need. */
  group: string | null;
}

export interface AnalysisInput {
  nodes: AnalysisNode[];
  edges: AnalysisEdge[];
}

export interface PinchWeights {
  betweenness: number;
  reach: number;
  single: number;
}

export const DEFAULT_PINCH_WEIGHTS: PinchWeights = { betweenness: 0.4, reach: 0.4, single: 0.2 };

/** Weights come from architects through the API: finite, non-negative, not all zero. */
export const pinchWeightsSchema = z
  .strictObject({
    betweenness: z.number().min(0).max(1),
    reach: z.number().min(0).max(1),
    single: z.number().min(0).max(1),
  })
  .refine((w) => w.betweenness + w.reach + w.single > 0, { message: "at least one weight must be positive" });

export const analysisOptionsSchema = z.strictObject({
    weights: pinchWeightsSchema.optional(),
    exactLimit: z.number().int().positive().optional(),
    sampleSize: z.number().int().positive().optional(),
    seed: z.number().int().optional(),
    threads: z.number().int().min(1).max(64).optional(),
    parallelThreshold: z.number().int().min(0).optional(),
    minParallelMs: z.number().min(0).optional(),
    maxDominatorTreeEntries: z.number().int().min(0).optional(),
    /** Tuning of the eigenvector methods (tests force a non-converging run with these). */
    eigenvector: z
      .strictObject({
        tol: z.number().positive().optional(),
        lanczosSteps: z.number().int().min(1).optional(),
        lanczosCycles: z.number().int().min(1).optional(),
        fillLimit: z.number().int().min(0).optional(),
      })
      .optional(),
});

export type AnalysisOptions = z.infer<typeof analysisOptionsSchema>;

export interface DominatorInfo {
  /** Entry components (tier 1, no dependents; not this one) that reach this component. */
  reachedFrom: number;
  /** Of those, how many it strictly dominates at least one component from. */
  dominatesFrom: number;
  /** Most components it strictly dominates from any one entry. */
  maxDominated: number;
}

export interface NodeMetrics {
  key: string;
  betweenness: number;
  /** null when the iteration did not converge (graph.pagerank says why): never a number then. */
  pagerank: number | null;
  /** null when no method converged (graph.eigenvector.reason says why). */
  eigenvector: number | null;
  clustering: number;
  articulation: boolean;
  inCycle: boolean;
  /** Components down when this one alone fails, itself excluded. */
  blastDown: number;
  blastDegraded: number;
  pinchScore: number;
  /** S of the pinch score: one replica, or fewer than two distinct zones (common practice). */
  singlePoint: boolean;
  /** Stage in the boot order (0 = needs nothing). */
  bootStage: number;
  dominator: DominatorInfo;
}

export interface DominatorTreeResult {
  root: string;
  /** Immediate dominator of every component reachable from the root (the root maps to itself). */
  idom: Record<string, string>;
}

export type AnalysisPhase =
  | "graph"
  | "betweenness"
  | "pagerank"
  | "eigenvector"
  | "clustering"
  | "articulation"
  | "scc"
  | "boot-order"
  | "dominators"
  | "blast-radius"
  | "pinch-score"
  | "done";

/** Whether an iterative measure reached its tolerance; when not, its values are withheld. */
export interface IterativeMeasureStatus {
  converged: boolean;
  /** "did not converge: …" when not converged, else null. */
  reason: string | null;
  iterations: number;
}

export interface AnalysisResult {
  nodes: NodeMetrics[];
  graph: {
    nodeCount: number;
    edgeCount: number;
    selfLoops: string[];
    implicitKeys: string[];
    bridges: Array<[string, string]>;
    cycles: string[][];
    bootOrder: { stages: string[][]; cycles: string[][]; waitingOnCycle: string[] };
    exact: boolean;
    sampleSize: number;
    betweennessThreads: number;
    pagerank: IterativeMeasureStatus;
    eigenvector: IterativeMeasureStatus & { method: "exact" | "lanczos" | "shift-invert"; eigenvalue: number };
    dominatorRoots: string[];
    /** null when the trees were larger than the configured cap (compute one on demand instead). */
    dominatorTrees: DominatorTreeResult[] | null;
    weights: PinchWeights;
  };
  /** Milliseconds per phase. */
  timings: Partial<Record<AnalysisPhase, number>>;
}

export type ProgressCallback = (fraction: number, phase: AnalysisPhase) => void;
