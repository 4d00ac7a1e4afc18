import { z } from "zod";
import { slugSchema } from "./common";

export const pageQuerySchema = z
  .object({
    limit: z.coerce.number().int().min(1).max(500).default(50),
    offset: z.coerce.number().int().min(0).default(0),
  })
  .strict();

export const diffParamsSchema = z.object({ env: slugSchema, a: z.coerce.number().int().min(1), b: z.coerce.number().int().min(1) });
