// A server-paged list's view read from the URL's parameters and turned into the API's query: the
// same on the server (a page that renders the first answer with its HTML) as in the browser
// (list-state.ts), so both ask for, and cache under, the same URL.
import type { ListSpec, SortOrder } from "@/lib/api/schemas/common";

export const PAGE_SIZES = [25, 50, 100] as const;

export interface ListQueryOptions {
  filters?: readonly string[];
  /** two lists on one screen keep apart in the URL with a prefix (`unowned_sort`) */
  prefix?: string;
  /** the API takes the prefix too (a route that answers two lists at once) */
  prefixApi?: boolean;
  pageSize?: number;
}

export function listQueryOf<S extends string>(spec: ListSpec<S>, get: (name: string) => string | null, { filters: filterNames = [], prefix, prefixApi = false, pageSize: defaultSize = 25 }: ListQueryOptions = {}) {
  const name = (n: string) => (prefix ? `${prefix}_${n}` : n);
  const api = (n: string) => (prefixApi ? name(n) : n);
  const sortParam = get(name("sort"));
  const sort = sortParam !== null && sortParam in spec.sorts ? (sortParam as S) : spec.defaultSort;
  const orderParam = get(name("order"));
  const order: SortOrder = orderParam === "asc" || orderParam === "desc" ? orderParam : spec.sorts[sort];
  const page = Math.max(1, Math.floor(Number(get(name("page")) ?? 1)) || 1);
  const sizeParam = Number(get(name("size")));
  const pageSize = (PAGE_SIZES as readonly number[]).includes(sizeParam) ? Math.min(sizeParam, spec.maxLimit) : defaultSize;
  const filters: Record<string, string> = {};
  for (const f of filterNames) {
    const v = get(name(f));
    if (v) filters[f] = v;
  }
  const query = new URLSearchParams();
  query.set(api("sort"), sort);
  query.set(api("order"), order);
  query.set(api("limit"), String(pageSize));
  query.set(api("offset"), String((page - 1) * pageSize));
  for (const [f, v] of Object.entries(filters)) query.set(api(f), v);
  return { sort, order, page, pageSize, filters, query };
}
