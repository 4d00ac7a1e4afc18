// Per-environment settings (environments.settings, JSONB). Every field has a default, so an
// environment that never set anything reads `{}` and behaves as documented here.
import { z } from "zod";

export const ANALYSIS_VIEWS = ["declared", "observed", "both"] as const;
export type AnalysisView = (typeof ANALYSIS_VIEWS)[number];

const DEFAULT_ALERT_LABELS = ["service", "app", "job"] as const;

/**
 * Label names as the Prometheus data model allows them (any UTF-8 since Prometheus 3; the classic
 * [a-zA-Z_][a-zA-Z0-9_]* is one case), without spaces so that a list typed with commas reads back.
 */
export const alertLabelsSchema = z
  .array(z.string().trim().min(1, "a label name cannot be empty").max(128, "at most 128 characters").regex(/^\S+$/, "a label name has no spaces"))
  .min(1, "name at least one label")
  .max(10, "at most 10 labels")
  .refine((xs) => new Set(xs).size === xs.length, { message: "each label once" });

export const EnvironmentSettingsSchema = z
  .object({
    /**
     * How needs inferred from host names in configuration count in the analysis. Hard by default:
     * a service configured to reach a database usually fails without it; teams whose
     * configuration names many optional peers can make them soft.
     */
    inferredNeeds: z.enum(["hard", "soft"]).default("hard"),
    /** How needs seen only in traces count until a file declares them. */
    observedNeeds: z.enum(["hard", "soft"]).default("soft"),
    /** Which graph the analysis runs on; null means `both` when both exist, else whichever does. */
    analysisView: z.enum(ANALYSIS_VIEWS).nullable().default(null),
    /** Rolling window of trace aggregates, in days. */
    traceWindowDays: z.int().min(1).max(90).default(7),
    /**
     * Labels of an Alertmanager alert that may name the component it is about, tried in order: the
     * first whose value is a component key or alias wins. `service`, `app` and `job` are the usual
     * ones (common practice); an estate that labels alerts otherwise lists its own.
     */
    alertLabels: alertLabelsSchema.default([...DEFAULT_ALERT_LABELS]),
  })
  .strict();

export type EnvironmentSettings = z.infer<typeof EnvironmentSettingsSchema>;

/** Stored settings with every default filled in; unknown or invalid stored values fall back to defaults field by field. */
export function readSettings(stored: unknown): EnvironmentSettings {
  const base = EnvironmentSettingsSchema.parse({});
  if (typeof stored !== "object" || stored === null) return base;
  const out: Record<string, unknown> = { ...base };
  for (const [k, v] of Object.entries(stored)) {
    if (!(k in base)) continue;
    const one = EnvironmentSettingsSchema.safeParse({ [k]: v });
    if (one.success) out[k] = (one.data as Record<string, unknown>)[k];
  }
  return out as EnvironmentSettings;
}
