import { z } from "zod";
import { RANKING_SORTS, type RankingSort } from "@/lib/data/analysis-results";
import { keySchema, kindSchema, slugSchema } from "./common";

const sortKeys = Object.keys(RANKING_SORTS) as [RankingSort, ...RankingSort[]];

export const rankingsQuerySchema = z
  .object({
    sort: z.enum(sortKeys).default("betweenness"),
    order: z.enum(["asc", "desc"]).optional(),
    limit: z.coerce.number().int().min(1).max(1000).default(50),
    offset: z.coerce.number().int().min(0).default(0),
    team: slugSchema.optional(),
    kind: kindSchema.optional(),
    tier: z.coerce.number().int().min(1).max(4).optional(),
    q: z.string().max(128).optional(),
  })
  .strict();

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
