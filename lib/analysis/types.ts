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
    /** Most node and edge visits spent on per-entry dominator trees (the all-entries tree always runs). */
    dominatorWorkLimit: z.number().int().min(0).optional(),
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

interface DominatorInfo {
  /** Entry components (tier 1, no dependents; not this one) that reach this component. */
  reachedFrom: number;
  /** Of those, how many it strictly dominates at least one component from: every path from that entry to something passes through it. */
  dominatesFrom: number;
  /** Most components it strictly dominates from any one entry. */
  maxDominated: number;
  /** Components it strictly dominates from all entries together (the virtual root). */
  allDominated: number;
  /** Its immediate dominator from all entries together; null when that is the virtual root itself (or it is not reached). */
  allIdom: string | null;
  /** The entries it dominates the most from, most first (at most 20). */
  topEntries: Array<{ entry: string; dominated: number }>;
}

/** The measures ranked with ties. */
export const RANKED_MEASURES = ["betweenness", "pagerank", "eigenvector", "pinchScore", "blastDown"] as const;
export type RankedMeasure = (typeof RANKED_MEASURES)[number];

/** Competition rank (1, 2, 2, 4), rank 1 the highest value, and how many share it; rank null where the measure is withheld. */
interface RankWithTies {
  rank: number | null;
  tied: number;
}

type NodeRanks = Record<RankedMeasure, RankWithTies>;

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
  ranks: NodeRanks;
  /** Stage in the boot order (0 = needs nothing). */
  bootStage: number;
  /** Not in a cycle itself, but needs (transitively) something that is: it waits on the cycle. */
  waitsOnCycle: boolean;
  /** An entry point: tier 1 and nothing depends on it. */
  entry: boolean;
  dominator: DominatorInfo;
}

interface BootCycleResult {
  /** Members in a suggested start order. */
  order: string[];
  /** Needs to break first: the dependent starts before what it needs (soft ones start degraded). */
  breaks: Array<{ from: string; to: string; strength: Strength }>;
  breakCount: number;
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
interface IterativeMeasureStatus {
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
    bootOrder: { stages: string[][]; cycles: string[][]; waitingOnCycle: string[]; plans: BootCycleResult[] };
    exact: boolean;
    sampleSize: number;
    betweennessThreads: number;
    /** Milliseconds the betweenness phase actually spent, threads included. */
    betweennessMs: number;
    pagerank: IterativeMeasureStatus;
    eigenvector: IterativeMeasureStatus & { method: "exact" | "lanczos" | "shift-invert"; eigenvalue: number };
    dominators: { roots: string[]; complete: boolean; entriesAnalysed: number };
    weights: PinchWeights;
  };
  /** Milliseconds per phase. */
  timings: Partial<Record<AnalysisPhase, number>>;
}

export type ProgressCallback = (fraction: number, phase: AnalysisPhase) => void;
