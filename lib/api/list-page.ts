// Paging, sorting and filtering of a list that is worked out in memory (drift, computed from the
// current graph and the trace aggregates), the same way the SQL-backed lists do it: filter, sort
// with a stable tie-break, then the page. Pure.
import type { SortOrder } from "./schemas/common";

export interface InMemoryList<T, S extends string> {
  /** the value a column sorts by (strings compare by code point, so the order is the same everywhere) */
  value: (item: T, sort: S) => string | number | null;
  /** the text `q` is looked for in, any case */
  text: (item: T) => string;
}

const cmp = (a: string | number | null, b: string | number | null): number => {
  if (a === b) return 0;
  if (a === null) return 1;
  if (b === null) return -1;
  return a < b ? -1 : 1;
};

export function pageInMemory<T, S extends string>(
  items: readonly T[],
  q: { sort: S; order: SortOrder; limit: number; offset: number; q?: string },
  list: InMemoryList<T, S>,
): { total: number; limit: number; offset: number; items: T[] } {
  const needle = q.q?.trim().toLowerCase();
  const kept = needle ? items.filter((i) => list.text(i).toLowerCase().includes(needle)) : [...items];
  // Nulls last whichever way; the original order breaks ties, so equal values keep the server's order.
  const sign = q.order === "asc" ? 1 : -1;
  const sorted = kept
    .map((item, i) => ({ item, i, v: list.value(item, q.sort) }))
    .sort((a, b) => (a.v === null || b.v === null ? cmp(a.v, b.v) : sign * cmp(a.v, b.v)) || a.i - b.i)
    .map((x) => x.item);
  return { total: sorted.length, limit: q.limit, offset: q.offset, items: sorted.slice(q.offset, q.offset + q.limit) };
}
