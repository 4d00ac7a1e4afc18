import { z } from "zod";
import { IMPORT_FORMATS, SOURCE_PATTERN, type KubernetesImportOptions } from "@/lib/inventory/types";
import { booleanParam, kindSchema, slugSchema } from "./common";

export const IMPACT_FORMATS = ["json", "markdown", "sarif"] as const;
export type ImpactFormat = (typeof IMPACT_FORMATS)[number];

/** Query parameters that only the `kubernetes` format reads (importers/README.md, Kubernetes). */
export const KUBERNETES_PUSH_PARAMS = ["cluster_domain", "team_key", "teams", "namespace_teams", "aliases"] as const;

export const pushQuerySchema = z
  .object({
    dry_run: booleanParam.optional(),
    format: z.enum(IMPORT_FORMATS).optional(),
    source: z
      .string()
      .regex(SOURCE_PATTERN, 'must be a source name: 1-128 characters of a-z, 0-9, ".", "_" or "-", starting with a letter or digit')
      .optional(),
    // Compose profiles to include (Compose Specification, "Profiles": names are [a-zA-Z0-9][a-zA-Z0-9_.-]+).
    profiles: z
      .string()
      .regex(/^[a-zA-Z0-9][a-zA-Z0-9_.-]*(,[a-zA-Z0-9][a-zA-Z0-9_.-]*)*$/, "must be profile names separated by commas, e.g. debug,test")
      .transform((v) => v.split(","))
      .optional(),
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
    override_reason: z
      .string()
      .trim()
      .min(10, "give a reason of at least 10 characters")
      .max(1000)
      .optional()
      .describe("architects and admins: why this change is pushed although a blocking policy refuses it (audited)"),
  })
  .strict()
  .superRefine((q, ctx) => {
    if (q.override_reason !== undefined && q.dry_run) ctx.addIssue({ code: "custom", path: ["override_reason"], message: "a dry run stores nothing, so there is nothing to override" });
    if ((q.format ?? "pinchpoint") === "kubernetes") return;
    for (const p of KUBERNETES_PUSH_PARAMS) {
      if (q[p] !== undefined) ctx.addIssue({ code: "custom", path: [p], message: `${p} is read only with format=kubernetes` });
    }
  });

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

export const componentsQuerySchema = z
  .object({
    team: slugSchema.optional(),
    kind: kindSchema.optional(),
    q: z.string().max(128).optional(),
    unowned: booleanParam.optional(),
  })
  .strict();
