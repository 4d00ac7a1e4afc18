// The map's data (GET …/graph) and its pinned positions, exactly as they are served: the screen
// parses the answer with these schemas rather than trusting it.
import { z } from "zod";
import { COMPONENT_KINDS, type ComponentKind } from "@/lib/inventory/types";
import { ANALYSIS_VIEWS } from "@/lib/inventory/settings";
import { instantSchema, keySchema, provenanceSchema, strengthSchema, tierSchema } from "./common";

const coordinate = z.number().finite().min(-1e7).max(1e7);

export const positionsSchema = z
  .record(keySchema, z.object({ x: coordinate, y: coordinate }).strict())
  .refine((p) => Object.keys(p).length <= 50_000, { message: "too many positions" });

/** GET and PUT …/map/positions. */
export const positionsResponseSchema = z.object({ positions: z.record(z.string(), z.object({ x: z.number(), y: z.number() })) });

export const MAP_KINDS = [...COMPONENT_KINDS, "undeclared"] as const satisfies readonly ComponentKind[];

const mapMetricsSchema = z.object({
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

const mapNodeSchema = z.object({
  key: z.string(),
  name: z.string(),
  kind: z.enum(MAP_KINDS),
  team: z.string().nullable(),
  tier: tierSchema,
  replicas: z.number().int(),
  zones: z.array(z.string()),
  undeclared: z.boolean(),
  metrics: mapMetricsSchema.nullable(),
});

const mapEdgeSchema = z.object({
  from: z.string(),
  to: z.string(),
  strength: strengthSchema,
  /** How the need is known; absent means declared only. */
  provenance: z.array(provenanceSchema).optional(),
  group: z.string().nullable(),
  inCycle: z.boolean(),
  /** Traffic traces saw on this need over the environment's trace window. */
  traffic: z.object({ callsPerMinute: z.number(), errorRate: z.number(), p95Ms: z.number().nullable() }).optional(),
});

/** GET …/graph. */
export const mapGraphSchema = z.object({
  environment: z.string(),
  snapshot: z.object({ number: z.number().int(), createdAt: instantSchema }).nullable(),
  nodes: z.array(mapNodeSchema),
  edges: z.array(mapEdgeSchema),
  teams: z.array(z.object({ slug: z.string(), name: z.string() })),
  /** Which needs the measures were computed on (DESIGN §10). */
  graphView: z
    .object({ view: z.enum(ANALYSIS_VIEWS), setting: z.enum(ANALYSIS_VIEWS).nullable(), observedOnlyComponents: z.number(), observedNeeds: z.number() })
    .nullable()
    .optional(),
});

export type MapMetrics = z.infer<typeof mapMetricsSchema>;
export type MapNode = z.infer<typeof mapNodeSchema>;
export type MapEdge = z.infer<typeof mapEdgeSchema>;
export type MapGraph = z.infer<typeof mapGraphSchema>;

const boxSchema = z.object({ x: z.number(), y: z.number(), width: z.number(), height: z.number() });
/** One stored view: absolute boxes per node id and edge routes per edge id (lib/map/estate.ts). */
const storedViewSchema = z.object({
  boxes: z.record(z.string(), boxSchema),
  routes: z.record(z.string(), z.array(z.object({ x: z.number(), y: z.number() }))),
  width: z.number(),
  height: z.number(),
});

/** GET …/map/layouts: the layouts the worker stored for the map's snapshot (views empty until it has). */
export const mapLayoutsResponseSchema = z.object({
  snapshot: z.object({ number: z.number().int() }).nullable(),
  /** how long the worker took to lay out every view */
  computedMs: z.number().int().nullable(),
  views: z.record(z.string(), storedViewSchema),
});
export type MapLayoutsResponse = z.infer<typeof mapLayoutsResponseSchema>;
