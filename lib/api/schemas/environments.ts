// Environment management (admin: create, rename, delete with a typed confirmation), environment
// summaries, and the per-environment settings.
import { z } from "zod";
import { ANALYSIS_VIEWS, EnvironmentSettingsSchema, alertLabelsSchema } from "@/lib/inventory/settings";
import { instantSchema, slugSchema } from "./common";
import { environmentCountsSchema } from "./components";

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

/** Every setting as lib/inventory/settings.ts defines it, without defaults. */
const settingsFieldsSchema = z.object({
  inferredNeeds: z.enum(["hard", "soft"]),
  observedNeeds: z.enum(["hard", "soft"]),
  analysisView: z.enum(ANALYSIS_VIEWS).nullable(),
  traceWindowDays: z.int().min(1).max(90),
  alertLabels: alertLabelsSchema,
});

/** Any subset of the settings; no defaults filled in. */
export const settingsPatchSchema = settingsFieldsSchema
  .partial()
  .strict()
  .refine((v) => Object.keys(v).length > 0, { message: "name at least one setting to change" });

/**
 * The settings form: every setting, as typed. The view's "auto" is null (follow what the graph
 * holds); alert labels are typed as one line with commas.
 */
export const settingsFormSchema = settingsFieldsSchema.extend({
  analysisView: z.enum([...ANALYSIS_VIEWS, "auto"]).transform((v) => (v === "auto" ? null : v)),
  alertLabels: z
    .string()
    .transform((text) => text.split(",").map((x) => x.trim()).filter(Boolean))
    .pipe(alertLabelsSchema),
});

// ---------------------------------------------------------------------------------------------
// Responses

export const environmentSummarySchema = z.object({
  id: z.string(),
  slug: z.string(),
  name: z.string(),
  createdAt: instantSchema,
  updatedAt: instantSchema,
  /** the environment `/` shows (PINCHPOINT_DEFAULT_ENV); it cannot be deleted */
  isDefault: z.boolean(),
  componentCount: z.int(),
  snapshotCount: z.int(),
  sourceCount: z.int(),
  /** tokens bound to it and not revoked: deleting the environment deletes them */
  liveTokenCount: z.int(),
  latestSnapshot: z.object({ number: z.int(), createdAt: instantSchema }).nullable(),
  analysis: z.object({ status: z.string(), progress: z.number() }).nullable(),
});
export type EnvironmentSummary = z.infer<typeof environmentSummarySchema>;

/** GET /environments. */
export const environmentsResponseSchema = z.object({ items: z.array(environmentSummarySchema) });

/** GET /environments/{env}: the summary, its counts, and the zones its components run in (the drill screen's choices). */
export const environmentResponseSchema = environmentSummarySchema.extend({ counts: environmentCountsSchema, zones: z.array(z.string()) });

/** DELETE /environments/{env}. */
export const deletedEnvironmentSchema = z.object({
  slug: z.string(),
  name: z.string(),
  removed: z.object({ components: z.int(), snapshots: z.int(), sources: z.int(), tokens: z.int() }),
});
export type DeletedEnvironment = z.infer<typeof deletedEnvironmentSchema>;

/** GET and PATCH /environments/{env}/settings: the settings with defaults filled in. */
export const settingsViewSchema = z.object({
  settings: EnvironmentSettingsSchema,
  defaults: EnvironmentSettingsSchema,
  /** after a change the analysis reads: the snapshot queued again */
  requeued: z.object({ snapshot: z.int() }).nullable().optional(),
});
export type SettingsView = z.infer<typeof settingsViewSchema>;
