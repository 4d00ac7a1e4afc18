import { z } from "zod";
import { IMPORT_FORMATS, SOURCE_PATTERN } from "@/lib/inventory/types";
import { booleanParam, kindSchema, slugSchema } from "./common";

export const pushQuerySchema = z
  .object({
    dry_run: booleanParam.optional(),
    format: z.enum(IMPORT_FORMATS).optional(),
    source: z.string().regex(SOURCE_PATTERN, "must be a source name").optional(),
  })
  .strict();

export const componentsQuerySchema = z
  .object({
    team: slugSchema.optional(),
    kind: kindSchema.optional(),
    q: z.string().max(128).optional(),
    unowned: booleanParam.optional(),
  })
  .strict();
