"use client";
// The state of a list paged, sorted and filtered on the server, kept in the URL (so a view can
// be pasted), and turned into the API's query (lib/api/schemas/common.ts: limit, offset, sort,
// order and the list's filters). Two lists on one screen keep apart in the URL with a prefix
// (`unowned_sort`); a route that answers two lists at once (drift) takes the prefix too.
import type { SortingState } from "@tanstack/react-table";
import { useUrlState } from "@/components/ui/url-state";
import type { ListSpec, SortOrder } from "@/lib/api/schemas/common";
import { listQueryOf } from "./list-query";

export interface ListState<S extends string = string> {
  spec: ListSpec<S>;
  sort: S;
  order: SortOrder;
  /** 1-based */
  page: number;
  pageSize: number;
  sorting: SortingState;
  filters: Readonly<Record<string, string>>;
  /** the API's parameters (prefixed only with `prefixApi`), without the route's own path */
  query: URLSearchParams;
  /** a header was clicked: the same column flips its order, another starts with its own first order */
  toggleSort: (column: string) => void;
  setPage: (page: number) => void;
  setPageSize: (size: number) => void;
  /** a filter changed: back to the first page */
  setFilter: (name: string, value: string | null) => void;
  setFilters: (values: Record<string, string | null>) => void;
  clearFilters: () => void;
}

export function useListState<S extends string>(
  spec: ListSpec<S>,
  {
    filters: filterNames = [],
    prefix,
    prefixApi = false,
    pageSize: defaultSize = 25,
  }: { filters?: readonly string[]; prefix?: string; prefixApi?: boolean; pageSize?: number } = {},
): ListState<S> {
  const url = useUrlState();
  const name = (n: string) => (prefix ? `${prefix}_${n}` : n);
  const { sort, order, page, pageSize, filters, query } = listQueryOf(spec, (n) => url.get(n), { filters: filterNames, prefix, prefixApi, pageSize: defaultSize });
  const firstPage = { [name("page")]: null };
  return {
    spec,
    sort,
    order,
    page,
    pageSize,
    sorting: [{ id: sort, desc: order === "desc" }],
    filters,
    query,
    toggleSort: (column: string) => {
      if (!(column in spec.sorts)) return;
      const c = column as S;
      const next: SortOrder = c === sort ? (order === "asc" ? "desc" : "asc") : spec.sorts[c];
      url.set({ [name("sort")]: c, [name("order")]: next, ...firstPage });
    },
    setPage: (p: number) => url.set({ [name("page")]: p > 1 ? String(p) : null }),
    setPageSize: (size: number) => url.set({ [name("size")]: size === defaultSize ? null : String(size), ...firstPage }),
    setFilter: (f: string, v: string | null) => url.set({ [name(f)]: v, ...firstPage }),
    setFilters: (values: Record<string, string | null>) => url.set({ ...Object.fromEntries(Object.entries(values).map(([f, v]) => [name(f), v])), ...firstPage }),
    clearFilters: () => url.set({ ...Object.fromEntries(filterNames.map((f) => [name(f), null])), ...firstPage }),
  };
}
