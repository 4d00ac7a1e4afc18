// The map's input, exactly as `GET /api/v1/environments/{env}/graph` serves it.
// The schema lets the client parse the response (a boundary) rather than trust it.
import { z } from "zod";
import { COMPONENT_KINDS, PROVENANCES, STRENGTHS, type ComponentKind } from "@/lib/inventory/types";

export const MAP_KINDS = [...COMPONENT_KINDS, "undeclared"] as const satisfies readonly ComponentKind[];

const metricsSchema = z.object({
  betweenness: z.number(),
  /** null: the measure did not converge in this analysis */
  pagerank: z.number().nullable(),
  eigenvector: z.number().nullable(),
  clustering: z.number(),
  blastDown: z.number(),
  blastDegraded: z.number(),
  pinchScore: z.number(),
  articulation: z.boolean(),
  inCycle: z.boolean(),
  /** entry points from which every path to something passes through it (null: not computed) */
  entriesDominated: z.number().nullable().optional(),
  /** components every path from any entry passes through it to reach */
  dominatedAll: z.number().nullable().optional(),
});

export const mapNodeSchema = z.object({
  key: z.string(),
  name: z.string(),
  kind: z.enum(MAP_KINDS),
  team: z.string().nullable(),
  tier: z.union([z.literal(1), z.literal(2), z.literal(3), z.literal(4)]),
  replicas: z.number().int(),
  zones: z.array(z.string()),
  undeclared: z.boolean(),
  metrics: metricsSchema.nullable(),
});

export const mapEdgeSchema = z.object({
  from: z.string(),
  to: z.string(),
  strength: z.enum(STRENGTHS),
  /** How the need is known; absent means declared only. */
  provenance: z.array(z.enum(PROVENANCES)).optional(),
  group: z.string().nullable(),
  inCycle: z.boolean(),
  /** Traffic traces saw on this need over the environment's trace window. */
  traffic: z.object({ callsPerMinute: z.number(), errorRate: z.number(), p95Ms: z.number().nullable() }).optional(),
});

export const mapGraphSchema = z.object({
  environment: z.string(),
  snapshot: z.object({ number: z.number().int(), createdAt: z.string() }).nullable(),
  nodes: z.array(mapNodeSchema),
  edges: z.array(mapEdgeSchema),
  teams: z.array(z.object({ slug: z.string(), name: z.string() })),
  /** Which needs the measures were computed on (DESIGN §10). */
  graphView: z
    .object({ view: z.enum(["declared", "observed", "both"]), setting: z.enum(["declared", "observed", "both"]).nullable(), observedOnlyComponents: z.number(), observedNeeds: z.number() })
    .nullable()
    .optional(),
});

export type MapMetrics = z.infer<typeof metricsSchema>;
export type MapNode = z.infer<typeof mapNodeSchema>;
export type MapEdge = z.infer<typeof mapEdgeSchema>;
export type MapGraph = z.infer<typeof mapGraphSchema>;

// Compile-time guard: the schema's kind must stay the inventory's ComponentKind.
type Same<A, B> = [A] extends [B] ? ([B] extends [A] ? true : false) : false;
const kindsAgree: Same<MapNode["kind"], ComponentKind> = true;
void kindsAgree;

export type Position = { x: number; y: number };
export type PinnedPositions = Record<string, Position>;

/** What the map colours nodes by. */
export const COLOUR_MODES = ["betweenness", "pinchScore", "blastDown", "entriesDominated", "tier", "team"] as const;
export type ColourMode = (typeof COLOUR_MODES)[number];
