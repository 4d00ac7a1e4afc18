// Requests and answers of the analysis routes: rankings, trends, boot order, drills, annotations.
import { z } from "zod";
import { RANKING_SORT_KEYS, defaultRankingOrder, type RankingSort } from "@/lib/api/ranking-sorts";
import { ANALYSIS_VIEWS } from "@/lib/inventory/settings";
import { instantSchema, keySchema, kindSchema, provenanceSchema, slugSchema, strengthSchema, tierSchema, type ListSpec } from "./common";

/** The ranking as a list (lib/api/ranking-sorts.ts gives its columns and which way each reads first). */
export const RANKING_LIST: ListSpec<RankingSort> = {
  sorts: Object.fromEntries(RANKING_SORT_KEYS.map((k) => [k, defaultRankingOrder(k)])) as Record<RankingSort, "asc" | "desc">,
  // The one ranking of every screen (overview, component page, pinch points): the pinch score, which
  // weighs what a failure takes down with how much runs through it (DESIGN §4).
  defaultSort: "pinchScore",
  defaultLimit: 50,
  maxLimit: 1000,
};

export const rankingsQuerySchema = z
  .object({
    sort: z.enum(RANKING_SORT_KEYS).default("betweenness"),
    order: z.enum(["asc", "desc"]).optional(),
    limit: z.coerce.number().int().min(1).max(1000).default(50),
    offset: z.coerce.number().int().min(0).default(0),
    team: slugSchema.optional(),
    kind: kindSchema.optional(),
    tier: z.coerce.number().int().min(1).max(4).optional(),
    q: z.string().max(128).optional(),
  })
  .strict();

/** Boot order: the stages can be left out (the overview only counts cycles); the runbook wants each component's name and owner. */
export const bootOrderQuerySchema = z
  .object({
    stages: z.enum(["true", "false"]).default("true").transform((v) => v === "true"),
    components: z.enum(["true", "false"]).default("false").transform((v) => v === "true"),
  })
  .strict();

/** The CSV export: the same filters and sort as the rankings, every row. */
export const rankingsExportQuerySchema = rankingsQuerySchema.omit({ limit: true, offset: true });

export const rankHistoryQuerySchema = z
  .object({
    keys: z
      .string()
      .max(20_000)
      .transform((s) => s.split(",").filter(Boolean))
      .pipe(z.array(keySchema).max(200))
      .optional(),
    top: z.coerce.number().int().min(1).max(50).default(8),
    count: z.coerce.number().int().min(2).max(100).default(20),
  })
  .strict();

/** GET …/chain?from=a&to=b: why does a depend on b? */
export const chainQuerySchema = z.object({ from: keySchema, to: keySchema }).strict();

export const drillBodySchema = z
  .object({
    fail: z
      .object({
        components: z.array(keySchema).max(5000).optional(),
        zones: z.array(z.string().min(1).max(64)).max(100).optional(),
      })
      .strict()
      .refine((f) => (f.components?.length ?? 0) + (f.zones?.length ?? 0) > 0, { message: "name at least one component or zone to fail" }),
  })
  .strict();

export { defaultRankingOrder };

// ---------------------------------------------------------------------------------------------
// Responses

const convergenceSchema = z.object({ converged: z.boolean(), reason: z.string().nullable() }).nullable();

/** Which needs an analysis ran on (DESIGN §10). */
const graphViewSchema = z.object({
  view: z.enum(ANALYSIS_VIEWS),
  /** the environment's setting; null when the view follows what the graph holds */
  setting: z.enum(ANALYSIS_VIEWS).nullable(),
  observedOnlyComponents: z.int(),
  observedNeeds: z.int(),
});

export const dominatorStatusSchema = z.object({ entries: z.int(), complete: z.boolean(), entriesAnalysed: z.int() });

/** The block every analysis answer carries (DESIGN §4, §9): which snapshot, how fresh, how far to trust it. */
export const analysisMetaSchema = z.object({
  graphView: graphViewSchema.optional(),
  snapshot: z.object({
    number: z.int(),
    createdAt: instantSchema,
    ageSeconds: z.number(),
    components: z.int(),
    undeclared: z.int(),
    undeclaredShare: z.number(),
  }),
  analysis: z.object({
    status: z.string(),
    computedAt: instantSchema.nullable(),
    exact: z.boolean().nullable(),
    sampleSize: z.int().nullable().optional(),
    measures: z.object({ pagerank: convergenceSchema, eigenvector: convergenceSchema, dominators: dominatorStatusSchema.nullable() }),
  }),
  /** the newest snapshot when it is still being analysed (or failed): ranks shown are older */
  latest: z.object({ number: z.int(), status: z.string(), progress: z.number(), phase: z.string().nullable() }).nullable(),
});
export type AnalysisMeta = z.infer<typeof analysisMetaSchema>;

export const rankPositionSchema = z.object({ rank: z.int().nullable(), tied: z.int() });

const rankingItemSchema = z.object({
  key: z.string(),
  name: z.string(),
  kind: kindSchema,
  team: z.string().nullable(),
  tier: tierSchema,
  /** competition rank by betweenness: equal values share a rank (1, 2, 2, 4) */
  rank: z.int(),
  tied: z.int(),
  /** rank and ties in the measure the list is ranked by (`rankBy`) */
  position: rankPositionSchema,
  betweenness: z.number(),
  /** null: did not converge (analysis.measures says why) */
  pagerank: z.number().nullable(),
  eigenvector: z.number().nullable(),
  clustering: z.number(),
  blastRadius: z.object({ down: z.int(), degraded: z.int() }),
  pinchScore: z.number(),
  articulation: z.boolean(),
  inCycle: z.boolean(),
  singlePoint: z.boolean(),
  entriesDominated: z.int().nullable(),
  dominatedAll: z.int().nullable(),
});
export type RankingItem = z.infer<typeof rankingItemSchema>;

/** GET …/rankings: one page of the ranking, with the analysis block. */
export const rankingsResponseSchema = analysisMetaSchema.extend({
  sort: z.enum(RANKING_SORT_KEYS),
  order: z.enum(["asc", "desc"]),
  /** the measure the # column (`position`) ranks by */
  rankBy: z.string(),
  limit: z.int(),
  offset: z.int(),
  total: z.int(),
  items: z.array(rankingItemSchema),
});

const rankTrendSchema = z.object({
  snapshots: z.array(z.int()),
  series: z.array(z.object({ key: z.string(), points: z.array(z.object({ snapshot: z.int(), rank: z.int().nullable() })) })),
});
export const rankTrendResponseSchema = analysisMetaSchema.extend(rankTrendSchema.shape);
export type RankTrendResponse = z.infer<typeof rankTrendResponseSchema>;

const storedCycleSchema = z.object({
  members: z.array(z.string()),
  /** boot cycles: a suggested start order and the needs to break first */
  startOrder: z.array(z.string()).nullable(),
  breaks: z.array(z.object({ from: z.string(), to: z.string(), strength: strengthSchema })).nullable(),
  breakCount: z.int().nullable(),
});

/** GET …/boot-order?stages=false: only the cycles that block a cold start. */
export const bootCyclesResponseSchema = analysisMetaSchema.extend({ cycles: z.array(storedCycleSchema) });

/** GET …/boot-order: the stages, the cycles, and (components=true) the runbook's names and owners. */
export const bootOrderResponseSchema = bootCyclesResponseSchema.extend({
  stages: z.array(z.array(z.string())),
  waitingOnCycle: z.array(z.string()),
  /** with components=true: each component's name, kind, owner and tier (empty otherwise) */
  components: z.record(z.string(), z.object({ name: z.string(), kind: kindSchema, team: z.string().nullable(), tier: tierSchema })),
  /** with components=true: each component's start-up-only needs */
  startupNeeds: z.record(z.string(), z.array(z.string())).optional(),
});

export const teamContactSchema = z.object({ slug: z.string(), name: z.string(), email: z.string().nullable(), oncall: z.string().nullable() });
export type TeamContact = z.infer<typeof teamContactSchema>;

/** POST …/drills and GET …/components/{key}/blast-radius. */
export const drillResponseSchema = analysisMetaSchema.extend({
  failed: z.object({ components: z.array(z.string()), zones: z.array(z.string()) }),
  down: z.array(z.string()),
  degraded: z.array(z.string()),
  teams: z.array(z.object({ team: z.string().nullable(), contact: teamContactSchema.nullable(), down: z.array(z.string()), degraded: z.array(z.string()) })),
  byTier: z.object({ "1": z.int(), "2": z.int(), "3": z.int(), "4": z.int() }),
});
export type DrillResponse = z.infer<typeof drillResponseSchema>;

/** GET …/chain: the shortest chain of runtime needs from `from` to `to` (lib/data/snapshot-graph.ts). */
export const chainHopSchema = z.object({
  from: z.string(),
  to: z.string(),
  strength: strengthSchema,
  provenance: z.array(provenanceSchema),
  via: z.string().nullable(),
  /** the need is one member of an any_of group, so this hop alone does not take `from` down */
  anyOf: z.boolean(),
});
export const chainResponseSchema = z.object({
  snapshot: z.object({ number: z.int(), createdAt: instantSchema }),
  from: z.string(),
  to: z.string(),
  /** keys from `from` to `to`, both included; null when `from` does not depend on `to` */
  path: z.array(z.string()).nullable(),
  hops: z.array(chainHopSchema),
  /** every hop a plain hard need: `from` goes down when `to` fails */
  hardAllTheWay: z.boolean(),
  /** when `from` does not depend on `to`: whether `to` depends on `from` instead */
  reversed: z.boolean(),
});
export type ChainResponse = z.infer<typeof chainResponseSchema>;
