// Requests and answers about what happened to an environment over time: snapshots, the diff of
// any two, and the import history. Both lists grow with every push: paged on the server.
import { z } from "zod";
import { IMPORT_FORMATS } from "@/lib/inventory/types";
import { defineList, instantSchema, kindSchema, listQuery, pageOf, provenanceSchema, slugSchema, strengthSchema, tierSchema } from "./common";

export const diffParamsSchema = z.object({ env: slugSchema, a: z.coerce.number().int().min(1), b: z.coerce.number().int().min(1) });

export const SNAPSHOT_LIST = defineList({
  sorts: { number: "desc", components: "desc", dependencies: "desc", undeclared: "desc" },
  defaultSort: "number",
  defaultLimit: 50,
  maxLimit: 500,
});
/** `q`: part of the source or of who pushed. */
export const snapshotsQuerySchema = listQuery(SNAPSHOT_LIST).extend({ q: z.string().max(128).optional() }).strict();

export const IMPORT_LIST = defineList({
  sorts: { createdAt: "desc", source: "asc", actor: "asc", format: "asc" },
  defaultSort: "createdAt",
  defaultLimit: 50,
  maxLimit: 500,
});
export const importsQuerySchema = listQuery(IMPORT_LIST)
  .extend({
    /** part of the source or of who pushed */
    q: z.string().max(128).optional(),
    format: z.enum(IMPORT_FORMATS).optional(),
  })
  .strict();

// ---------------------------------------------------------------------------------------------
// Responses

const snapshotComponentSchema = z.object({
  key: z.string(),
  name: z.string(),
  kind: kindSchema,
  team: z.string().nullable(),
  tier: tierSchema,
  replicas: z.int(),
  zones: z.array(z.string()),
  tags: z.array(z.string()),
  links: z.record(z.string(), z.string()),
  source: z.string().nullable(),
  aliases: z.array(z.string()).optional(),
});

const snapshotDependencySchema = z.object({
  from: z.string(),
  to: z.string(),
  strength: strengthSchema,
  group: z.string().nullable(),
  via: z.string().nullable(),
  source: z.string().nullable(),
  provenance: z.array(provenanceSchema).optional(),
  written: z.string().optional(),
});
export type SnapshotDependency = z.infer<typeof snapshotDependencySchema>;

/** Before → after of one field; the values are whatever the field holds (text, number, list, map). */
const fieldChangeSchema = z.object({ before: z.unknown(), after: z.unknown() });

const componentChangeSchema = z.object({ key: z.string(), changes: z.record(z.string(), fieldChangeSchema.optional()) });
export type ComponentChange = z.infer<typeof componentChangeSchema>;
const dependencyChangeSchema = z.object({ from: z.string(), to: z.string(), group: z.string().nullable(), changes: z.record(z.string(), fieldChangeSchema.optional()) });
export type DependencyChange = z.infer<typeof dependencyChangeSchema>;

export const snapshotDiffSchema = z.object({
  componentsAdded: z.array(snapshotComponentSchema),
  componentsRemoved: z.array(snapshotComponentSchema),
  componentsChanged: z.array(componentChangeSchema),
  dependenciesAdded: z.array(snapshotDependencySchema),
  dependenciesRemoved: z.array(snapshotDependencySchema),
  dependenciesChanged: z.array(dependencyChangeSchema),
});

/** GET …/snapshots/{a}/diff/{b}. */
export const diffResponseSchema = snapshotDiffSchema.extend({ from: z.int(), to: z.int() });
export type DiffResponse = z.infer<typeof diffResponseSchema>;

const snapshotListItemSchema = z.object({
  id: z.string(),
  number: z.int(),
  createdAt: instantSchema,
  source: z.string().nullable(),
  format: z.string().nullable(),
  actor: z.string().nullable(),
  components: z.int(),
  dependencies: z.int(),
  undeclared: z.int(),
  /** status of its analysis; null when none was queued */
  analysis: z.string().nullable(),
});
export type SnapshotListItem = z.infer<typeof snapshotListItemSchema>;

/** GET …/snapshots. */
export const snapshotsResponseSchema = pageOf(snapshotListItemSchema);

const importRowSchema = z.object({
  id: z.string(),
  createdAt: instantSchema,
  source: z.string(),
  format: z.string(),
  actor: z.string(),
  changed: z.boolean(),
  snapshot: z.int().nullable(),
  /** counts of what changed (componentsAdded, dependenciesRemoved, observedEdges, …) */
  summary: z.record(z.string(), z.number()).nullable(),
  warnings: z.array(z.object({ path: z.string(), line: z.int().optional(), column: z.int().optional(), message: z.string() })).nullable(),
});
export type ImportRow = z.infer<typeof importRowSchema>;

/** GET …/imports. */
export const importsResponseSchema = pageOf(importRowSchema);
