// Drift (GET …/drift): traced calls against declared needs. Its two lists grow with the traced
// estate, so each is paged, sorted and filtered on the server with its own prefixed parameters
// (`seen_limit`, `seen_sort`, `seen_q`, …, `declared_limit`, …).
import { z } from "zod";
import { defineList, instantSchema, listQuery, pageOf, strengthSchema, type ListSpec } from "./common";
import { trafficSchema } from "./components";

export const DRIFT_SEEN_LIST = defineList({
  sorts: { calls: "desc", from: "asc", to: "asc", errorRate: "desc", p95Ms: "desc", lastSeenAt: "desc" },
  defaultSort: "calls",
  defaultLimit: 25,
  maxLimit: 500,
});

export const DRIFT_DECLARED_LIST = defineList({
  sorts: { from: "asc", to: "asc", strength: "asc", source: "asc" },
  defaultSort: "from",
  defaultLimit: 25,
  maxLimit: 500,
});

/** One list's parameters under a prefix: `limit` → `seen_limit`. */
function prefixedList<const P extends string, S extends string>(prefix: P, spec: ListSpec<S>) {
  const shape = listQuery(spec).extend({ q: z.string().max(128).optional() }).shape;
  return Object.fromEntries(Object.entries(shape).map(([k, v]) => [`${prefix}_${k}`, v])) as { [K in keyof typeof shape as `${P}_${K & string}`]: (typeof shape)[K] };
}

export const driftQuerySchema = z.object({ ...prefixedList("seen", DRIFT_SEEN_LIST), ...prefixedList("declared", DRIFT_DECLARED_LIST) }).strict();

// ---------------------------------------------------------------------------------------------
// Responses

const seenNotDeclaredSchema = trafficSchema.extend({
  from: z.string(),
  to: z.string(),
  /** calls within the window (the same as `calls`; kept for older clients) */
  count: z.int(),
  evidence: z.array(z.string()),
  via: z.string().nullable(),
  async: z.boolean(),
  /** the names traces used, when aliases resolved them */
  tracedAs: z.array(z.string()),
  fromKnown: z.boolean(),
  toKnown: z.boolean(),
  /** whose file should declare the need; null when no source declares the caller */
  declareIn: z.object({ source: z.string(), team: z.string().nullable() }).nullable(),
  suggestedStrength: strengthSchema,
  /** format 1 snippet that declares the need */
  snippet: z.string(),
});
export type SeenNotDeclared = z.infer<typeof seenNotDeclaredSchema>;

const declaredNotSeenSchema = z.object({
  from: z.string(),
  to: z.string(),
  strength: strengthSchema,
  source: z.string(),
  team: z.string().nullable(),
  /** one of several alternatives: an unused alternative is expected to be absent from traces */
  anyOf: z.boolean(),
});
export type DeclaredNotSeen = z.infer<typeof declaredNotSeenSchema>;

const aliasProposalSchema = z.object({ key: z.string(), alias: z.string(), reason: z.string(), source: z.string(), team: z.string().nullable(), snippet: z.string() });
export type AliasProposal = z.infer<typeof aliasProposalSchema>;

export const driftResponseSchema = z.object({
  window: z.object({ days: z.int(), since: instantSchema }),
  observedSources: z.array(z.object({ source: z.string(), lastSeenAt: instantSchema, edges: z.int() })),
  seenNotDeclared: pageOf(seenNotDeclaredSchema),
  declaredNotSeen: pageOf(declaredNotSeenSchema),
  /** declared pairs some trace confirmed */
  agreeing: z.int(),
  aliasProposals: z.array(aliasProposalSchema),
});
export type DriftResponse = z.infer<typeof driftResponseSchema>;
