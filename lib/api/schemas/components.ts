// Requests and answers about components: the list (paged, sorted and filtered on the server),
// one component with its needs, measures and history, and the owner/notes annotation.
import { z } from "zod";
import { snapshotDiffSchema } from "./history";
import { booleanParam, defineList, filePositionSchema, instantSchema, kindSchema, listQuery, pageOf, provenanceSchema, slugSchema, strengthSchema, tierSchema } from "./common";
import { dominatorStatusSchema, rankPositionSchema } from "./analysis";

export const COMPONENT_LIST = defineList({
  sorts: { key: "asc", name: "asc", kind: "asc", team: "asc", tier: "asc", replicas: "asc", source: "asc" },
  defaultSort: "key",
  defaultLimit: 100,
  maxLimit: 1000,
});

/** The list's filters, each also a column of the screen. */
const componentFiltersSchema = z.object({
  team: slugSchema.optional(),
  kind: kindSchema.optional(),
  tier: z.coerce.number().int().min(1).max(4).optional(),
  /** part of the key or the name, any case */
  q: z.string().max(128).optional(),
  unowned: booleanParam.optional(),
});

export const componentsQuerySchema = listQuery(COMPONENT_LIST).extend(componentFiltersSchema.shape).strict();
export type ComponentsQuery = z.infer<typeof componentsQuerySchema>;

export const annotateBodySchema = z
  .object({
    team: slugSchema.nullable().optional(),
    notes: z.string().max(5000).nullable().optional(),
  })
  .strict()
  .refine((b) => b.team !== undefined || b.notes !== undefined, { message: "send team, notes, or both" });

// ---------------------------------------------------------------------------------------------
// Responses

const componentListItemSchema = z.object({
  key: z.string(),
  name: z.string(),
  kind: kindSchema,
  /** effective owner: the team assigned in Pinchpoint, else the team the source declared */
  team: z.string().nullable(),
  declaredTeam: z.string().nullable(),
  tier: tierSchema,
  replicas: z.int(),
  zones: z.array(z.string()),
  tags: z.array(z.string()),
  source: z.string().nullable(),
  notes: z.string().nullable(),
  /** one replica or fewer than two zones (lib/analysis/pinch-score.ts) */
  singlePoint: z.boolean(),
});
export type ComponentListItem = z.infer<typeof componentListItemSchema>;

export const environmentCountsSchema = z.object({ components: z.int(), teams: z.int(), unowned: z.int(), undeclared: z.int(), dependencies: z.int() });
export type EnvironmentCounts = z.infer<typeof environmentCountsSchema>;

/** GET …/components: one page of the list, and the environment's counts (all components, whatever the filters). */
export const componentsResponseSchema = pageOf(componentListItemSchema).extend({ environment: z.string(), counts: environmentCountsSchema });
export type ComponentsResponse = z.infer<typeof componentsResponseSchema>;

export const trafficSchema = z.object({
  calls: z.int(),
  errors: z.int(),
  callsPerMinute: z.number(),
  errorRate: z.number(),
  p50Ms: z.number().nullable(),
  p95Ms: z.number().nullable(),
  firstSeenAt: instantSchema,
  lastSeenAt: instantSchema,
});

const componentEdgeSchema = z.object({
  key: z.string(),
  name: z.string(),
  kind: kindSchema,
  strength: strengthSchema,
  group: z.string().nullable(),
  via: z.string().nullable(),
  provenance: z.array(provenanceSchema),
  /** where an inferred need was named */
  origin: filePositionSchema.nullable(),
  traffic: trafficSchema.optional(),
});
export type ComponentEdge = z.infer<typeof componentEdgeSchema>;

const componentMetricsSchema = z.object({
  rank: z.int(),
  tied: z.int(),
  ranks: z.object({ betweenness: rankPositionSchema, pagerank: rankPositionSchema, eigenvector: rankPositionSchema, pinchScore: rankPositionSchema, blastDown: rankPositionSchema }),
  betweenness: z.number(),
  pagerank: z.number().nullable(),
  eigenvector: z.number().nullable(),
  clustering: z.number(),
  articulation: z.boolean(),
  inCycle: z.boolean(),
  blastRadius: z.object({ down: z.int(), degraded: z.int() }),
  pinchScore: z.number(),
  bootStage: z.int().nullable(),
  waitsOnCycle: z.boolean(),
  entry: z.boolean(),
  /** null fields: an analysis from before dominators were stored */
  dominators: z.object({
    entriesReaching: z.int().nullable(),
    entriesDominated: z.int().nullable(),
    maxDominated: z.int().nullable(),
    dominatedAll: z.int().nullable(),
    idomAll: z.string().nullable(),
    fromEntries: z.array(z.object({ entry: z.string(), dominated: z.int() })),
  }),
});
export type ComponentMetrics = z.infer<typeof componentMetricsSchema>;

const convergenceSchema = z.object({ converged: z.boolean(), reason: z.string().nullable() }).nullable();

/** GET …/components/{key}. */
export const componentDetailResponseSchema = componentListItemSchema.extend({
  links: z.record(z.string(), z.string()),
  annotationUpdatedAt: instantSchema.nullable(),
  needs: z.array(componentEdgeSchema),
  dependents: z.array(componentEdgeSchema),
  metrics: componentMetricsSchema.nullable(),
  /** for an entry point: what every path from it passes through */
  fromHere: z.object({ reached: z.int(), total: z.int(), through: z.array(z.object({ key: z.string(), dominated: z.int() })) }).nullable(),
  snapshot: z.object({ number: z.int(), createdAt: instantSchema }).nullable(),
  measures: z.object({ pagerank: convergenceSchema, eigenvector: convergenceSchema, dominators: dominatorStatusSchema.nullable() }),
});
export type ComponentDetailResponse = z.infer<typeof componentDetailResponseSchema>;

/** GET …/components/{key}/history: snapshots that touched it, newest first. */
export const componentHistoryResponseSchema = z.object({
  key: z.string(),
  scanned: z.int(),
  items: z.array(
    z.object({
      number: z.int(),
      createdAt: instantSchema,
      source: z.string().nullable(),
      actor: z.string().nullable(),
      change: z.enum(["added", "removed", "changed"]),
      diff: snapshotDiffSchema,
    }),
  ),
});
export type ComponentHistoryResponse = z.infer<typeof componentHistoryResponseSchema>;

/** PATCH …/components/{key}. */
export const annotationResultSchema = z.object({ key: z.string(), team: z.string().nullable(), declaredTeam: z.string().nullable(), notes: z.string().nullable() });

