// Shared zod pieces for requests and responses.
import { z } from "zod";
import { COMPONENT_KINDS, KEY_PATTERN, SLUG_PATTERN } from "@/lib/inventory/types";

export const slugSchema = z.string().regex(SLUG_PATTERN, "must be a slug: lower-case letters, digits and dashes");
export const keySchema = z.string().regex(KEY_PATTERN, "must be a component key: ^[a-z0-9][a-z0-9._-]{0,127}$");
export const kindSchema = z.enum([...COMPONENT_KINDS, "undeclared"]);
/** `true`/`false`, and `1`/`0` as scripts often write them. */
export const booleanParam = z.enum(["true", "false", "1", "0"], { error: "must be true, false, 1 or 0" }).transform((v) => v === "true" || v === "1");

export const envParamsSchema = z.object({ env: slugSchema });
export const componentParamsSchema = z.object({ env: slugSchema, key: keySchema });
