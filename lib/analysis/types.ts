// Input and output shapes of the analysis. Pure data: no database, no framework.
import type { Strength, Tier } from "../inventory/types";

export interface AnalysisNode {
  key: string;
  tier: Tier;
  replicas: number;
  zones: string[];
  team: string | null;
  /** true when the node has no dependents and tier 1: an entry point for dominators */
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
