import { z } from "zod";
import { RANKING_SORT_KEYS } from "@/lib/api/ranking-sorts";
import { keySchema, kindSchema, slugSchema } from "./common";


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

export const annotateBodySchema = z
  .object({
    team: slugSchema.nullable().optional(),
    notes: z.string().max(5000).nullable().optional(),
  })
  .strict()
  .refine((b) => b.team !== undefined || b.notes !== undefined, { message: "send team, notes, or both" });

export { defaultRankingOrder } from "@/lib/api/ranking-sorts";
