// Pushing an inventory (every format, dry runs and impact) and what a push answers.
import { z } from "zod";
import { IMPORT_FORMATS, IMPORT_NOTE_KINDS, type KubernetesImportOptions } from "@/lib/inventory/types";
import { booleanParam, filePositionSchema, instantSchema, issueSchema, sourceSchema, strengthSchema } from "./common";
import { snapshotDiffSchema } from "./history";
import { impactReportSchema } from "./impact";

const IMPACT_FORMATS = ["json", "markdown", "sarif"] as const;
export type ImpactFormat = (typeof IMPACT_FORMATS)[number];

/** Query parameters that only the `kubernetes` format reads (importers/README.md, Kubernetes). */
const KUBERNETES_PUSH_PARAMS = ["cluster_domain", "team_key", "teams", "namespace_teams", "aliases"] as const;

/** Compose profiles to include, as typed (Compose Specification, "Profiles": names are [a-zA-Z0-9][a-zA-Z0-9_.-]+). */
const profilesTextSchema = z.string().regex(/^[a-zA-Z0-9][a-zA-Z0-9_.-]*(,[a-zA-Z0-9][a-zA-Z0-9_.-]*)*$/, "must be profile names separated by commas, e.g. debug,test");

/** Why an architect or admin pushes past a blocking policy. */
const overrideReasonSchema = z.string().trim().min(10, "give a reason of at least 10 characters").max(1000);

/** Each query parameter of a push on its own (the upload form takes some of them). */
const pushQueryFields = z
  .object({
    dry_run: booleanParam.optional(),
    format: z.enum(IMPORT_FORMATS).optional(),
    source: sourceSchema.optional(),
    profiles: profilesTextSchema.transform((v) => v.split(",")).optional(),
    cluster_domain: z.string().max(253).optional().describe("kubernetes: the cluster's DNS domain (default cluster.local)"),
    team_key: z.string().max(317).optional().describe("kubernetes: label or annotation key naming the owning team (default team)"),
    teams: z
      .string()
      .max(8_192)
      .regex(/^[^,:]+:[^,:]+(,[^,:]+:[^,:]+)*$/, "must be namespace:team pairs separated by commas, e.g. shop:storefront,pay:payments")
      .optional()
      .describe("kubernetes: namespace:team pairs for this push, e.g. shop:storefront,pay:payments"),
    namespace_teams: booleanParam.optional().describe("kubernetes: a namespace's name is its team when nothing else names one"),
    aliases: booleanParam.optional().describe("kubernetes: offer Service names and app labels as component aliases (default true)"),
    impact: booleanParam.optional().describe("report what the change does to the failure points and the change policies' results"),
    impact_format: z.enum(IMPACT_FORMATS).optional().describe("json (default), markdown (a pull-request comment) or sarif (SARIF 2.1.0); implies impact=true"),
    file: z
      .string()
      .min(1)
      .max(1024)
      .refine((f) => [...f].every((c) => c.charCodeAt(0) >= 0x20 && c !== "\u007f"), "must be a file path without control characters")
      .optional()
      .describe("the pushed file's path in its repository, for SARIF locations and Markdown (default: a name for the format)"),
    override_reason: overrideReasonSchema
      .optional()
      .describe("architects and admins: why this change is pushed although a blocking policy refuses it (audited)"),
  })
  .strict();

export const pushQuerySchema = pushQueryFields.superRefine((q, ctx) => {
  if (q.override_reason !== undefined && q.dry_run) ctx.addIssue({ code: "custom", path: ["override_reason"], message: "a dry run stores nothing, so there is nothing to override" });
  if ((q.format ?? "pinchpoint") === "kubernetes") return;
  for (const p of KUBERNETES_PUSH_PARAMS) {
    if (q[p] !== undefined) ctx.addIssue({ code: "custom", path: [p], message: `${p} is read only with format=kubernetes` });
  }
});

/**
 * The upload form's settings (the imports screen): the push parameters a person chooses, as typed.
 * Every format but `pinchpoint` needs a source: a Pinchpoint file names its own.
 */
export const uploadSettingsSchema = z
  .object({
    format: z.enum(IMPORT_FORMATS),
    source: z.string().trim().optional(),
    profiles: z.string().trim().optional(),
  })
  .superRefine((v, ctx) => {
    if (v.format !== "pinchpoint") {
      const ok = sourceSchema.safeParse(v.source ?? "");
      if (!ok.success) ctx.addIssue({ code: "custom", path: ["source"], message: v.source ? (ok.error.issues[0]?.message ?? "not a source name") : "name the source this upload replaces" });
    }
    if (v.format === "compose" && v.profiles) {
      const ok = profilesTextSchema.safeParse(v.profiles);
      if (!ok.success) ctx.addIssue({ code: "custom", path: ["profiles"], message: ok.error.issues[0]?.message ?? "not a list of profiles" });
    }
  });
export type UploadSettings = z.infer<typeof uploadSettingsSchema>;

/** The override form under a blocked impact. */
export const overrideFormSchema = z.object({ override_reason: overrideReasonSchema });

/** The Kubernetes importer's settings from a parsed push query. */
export function kubernetesOptionsOf(q: z.infer<typeof pushQuerySchema>): KubernetesImportOptions | undefined {
  if (q.format !== "kubernetes") return undefined;
  return {
    ...(q.cluster_domain !== undefined ? { clusterDomain: q.cluster_domain } : {}),
    ...(q.team_key !== undefined ? { teamKey: q.team_key } : {}),
    ...(q.teams !== undefined ? { teams: Object.fromEntries(q.teams.split(",").map((pair) => pair.split(":").map((s) => s.trim()) as [string, string])) } : {}),
    ...(q.namespace_teams !== undefined ? { namespaceTeams: q.namespace_teams } : {}),
    ...(q.aliases !== undefined ? { aliases: q.aliases } : {}),
  };
}

// ---------------------------------------------------------------------------------------------
// Responses

const importNoteSchema = z.object({ kind: z.enum(IMPORT_NOTE_KINDS), component: z.string(), target: z.string().optional(), reason: z.string(), at: filePositionSchema.optional() });
export type ImportNote = z.infer<typeof importNoteSchema>;

const inferredNeedSchema = z.object({
  from: z.string(),
  /** one key, or the members of an any_of group */
  to: z.array(z.string()),
  strength: strengthSchema,
  via: z.string().nullable(),
  reason: z.string().nullable(),
  at: filePositionSchema.nullable(),
});
export type InferredNeed = z.infer<typeof inferredNeedSchema>;

const diffSummarySchema = snapshotDiffSchema.extend({
  counts: z.object({ componentsAdded: z.int(), componentsRemoved: z.int(), componentsChanged: z.int(), dependenciesAdded: z.int(), dependenciesRemoved: z.int() }),
});
export type DiffSummary = z.infer<typeof diffSummarySchema>;

/** POST …/inventory (JSON answer): what changed or would change. */
export const pushResultSchema = z.object({
  changed: z.boolean(),
  dryRun: z.boolean(),
  snapshot: z.object({ id: z.string(), number: z.int(), createdAt: instantSchema }).nullable(),
  diff: diffSummarySchema,
  warnings: z.array(issueSchema),
  /** what the importer inferred beyond what the files say, each with its reason */
  notes: z.array(importNoteSchema).optional(),
  /** trace files: distinct observed edges, spans read, calls counted, repeated spans skipped */
  observed: z.object({ edges: z.int(), spans: z.int(), calls: z.int(), duplicates: z.int() }).optional(),
  /** dry runs: needs inferred from configuration */
  inferred: z.object({ total: z.int(), needs: z.array(inferredNeedSchema) }).optional(),
  impact: impactReportSchema.optional(),
});
export type PushResult = z.infer<typeof pushResultSchema>;
