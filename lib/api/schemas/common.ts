// Shared zod pieces for requests and responses: names, the shapes every list route shares (a page
// of items; paging, sorting and filters in the query string) and the small value types responses
// are made of. Pure, so the screens import the same definitions the route handlers parse with.
import { z } from "zod";
import { COMPONENT_KINDS, KEY_PATTERN, PROVENANCES, SLUG_PATTERN, SOURCE_PATTERN, STRENGTHS } from "@/lib/inventory/types";

/** What each name may look like, in words, for messages here and in the screens' hints. */
const PATTERN_WORDS = {
  slug: "1-63 characters of a-z, 0-9 and \"-\", starting with a letter or digit",
  key: "1-128 characters of a-z, 0-9, \".\", \"_\" or \"-\", starting with a letter or digit",
  source: "1-128 characters of a-z, 0-9, \".\", \"_\" or \"-\", starting with a letter or digit",
} as const;

export const slugSchema = z.string().regex(SLUG_PATTERN, `must be a slug: ${PATTERN_WORDS.slug}`);
export const keySchema = z.string().regex(KEY_PATTERN, `must be a component key: ${PATTERN_WORDS.key}`);
export const sourceSchema = z.string().regex(SOURCE_PATTERN, `must be a source name: ${PATTERN_WORDS.source}`);
export const kindSchema = z.enum([...COMPONENT_KINDS, "undeclared"]);
export const strengthSchema = z.enum(STRENGTHS);
export const provenanceSchema = z.enum(PROVENANCES);
export const tierSchema = z.literal([1, 2, 3, 4]);
/** `true`/`false`, and `1`/`0` as scripts often write them. */
export const booleanParam = z.enum(["true", "false", "1", "0"], { error: "must be true, false, 1 or 0" }).transform((v) => v === "true" || v === "1");

export const envParamsSchema = z.object({ env: slugSchema });
export const componentParamsSchema = z.object({ env: slugSchema, key: keySchema });

/** An instant as responses write it: ISO 8601 in UTC (`Date.prototype.toISOString`). */
export const instantSchema = z.iso.datetime({ offset: true });

/** Where something was written in a pushed file. */
export const filePositionSchema = z.object({ file: z.string().optional(), line: z.int().optional(), column: z.int().optional() });

/** One located problem (errors and warnings of a push, issues of any 4xx answer). */
export const issueSchema = z.object({ path: z.string(), file: z.string().optional(), line: z.int().optional(), column: z.int().optional(), message: z.string() });

export const errorBodySchema = z.object({ error: z.string(), message: z.string(), issues: z.array(issueSchema).optional() });

// ---------------------------------------------------------------------------------------------
// Lists that grow with the estate are paged, sorted and filtered on the server, all the same way:
// `?limit=&offset=&sort=&order=` plus the list's own filters, answered with `{ total, limit,
// offset, items }`. A list is described once (its sortable columns, which way each reads first,
// its page sizes) and both the route (to parse) and the screen (to ask) use the description.

export type SortOrder = "asc" | "desc";

export interface ListSpec<S extends string = string> {
  /** sortable column → the order it reads in first (text A→Z, measures biggest first) */
  sorts: Readonly<Record<S, SortOrder>>;
  defaultSort: S;
  defaultLimit: number;
  maxLimit: number;
}

export function defineList<const T extends Record<string, SortOrder>>(spec: { sorts: T; defaultSort: NoInfer<keyof T & string>; defaultLimit: number; maxLimit: number }): ListSpec<keyof T & string> {
  return spec;
}

const sortKeys = <S extends string>(spec: ListSpec<S>) => Object.keys(spec.sorts) as [S, ...S[]];

/** `limit`, `offset`, `sort` and `order` of one list; `order` defaults to the sort's own first order. */
export function listQuery<S extends string>(spec: ListSpec<S>) {
  return z.object({
    sort: z.enum(sortKeys(spec)).default(spec.defaultSort as never),
    order: z.enum(["asc", "desc"]).optional(),
    limit: z.coerce.number().int().min(1).max(spec.maxLimit).default(spec.defaultLimit),
    offset: z.coerce.number().int().min(0).default(0),
  });
}

/** The order a parsed list query asks for, with the sort's default filled in. */
export const orderOf = <S extends string>(spec: ListSpec<S>, q: { sort: S; order?: SortOrder }): SortOrder => q.order ?? spec.sorts[q.sort];

/** One page of a list: `total` counts every item that matches the filters, not only this page. */
export function pageOf<T extends z.ZodType>(item: T) {
  return z.object({ total: z.int(), limit: z.int(), offset: z.int(), items: z.array(item) });
}

