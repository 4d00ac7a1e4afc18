// Requests of environment management (admin): create, rename, delete with a typed confirmation.
import { z } from "zod";
import { ANALYSIS_VIEWS, alertLabelsSchema } from "@/lib/inventory/settings";
import { slugSchema } from "./common";

const nameSchema = z.string().trim().min(1, "give the environment a name people will recognise").max(200, "at most 200 characters");

export const createEnvironmentSchema = z
  .object({
    slug: slugSchema,
    name: nameSchema.optional(),
  })
  .strict();
export type CreateEnvironmentInput = z.infer<typeof createEnvironmentSchema>;

/** Only the display name changes: the slug is in every URL, token binding and CI job. */
export const renameEnvironmentSchema = z.object({ name: nameSchema }).strict();
export type RenameEnvironmentInput = z.infer<typeof renameEnvironmentSchema>;

/** `?confirm=<slug>`: the caller types the slug again, so a stray DELETE cannot wipe a graph. */
export const deleteEnvironmentQuerySchema = z.object({
  confirm: z.string({ error: "repeat the environment's slug in ?confirm= to delete it" }).min(1, "repeat the environment's slug in ?confirm= to delete it"),
});

/** Any subset of the settings; each field as lib/inventory/settings.ts defines it, no defaults filled in. */
export const settingsPatchSchema = z
  .object({
    inferredNeeds: z.enum(["hard", "soft"]),
    observedNeeds: z.enum(["hard", "soft"]),
    analysisView: z.enum(ANALYSIS_VIEWS).nullable(),
    traceWindowDays: z.int().min(1).max(90),
    alertLabels: alertLabelsSchema,
  })
  .partial()
  .strict()
  .refine((v) => Object.keys(v).length > 0, { message: "name at least one setting to change" });
