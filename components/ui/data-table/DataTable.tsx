"use client";
// The one table of the app, on TanStack Table: sorting, paging, filtering and column visibility
// the same on every screen. A list that grows with the estate is paged, sorted and filtered on the
// server (`paging.mode: "server"`, state in the URL through useListState, TanStack in manual
// mode so the server's order is the one shown); a short list that a screen already holds (a
// preview, the admin lists) is sorted and paged in the browser (`mode: "client"`), with a search
// box once it has more than a page. Tables of five columns or more let the reader hide columns.
import {
  flexRender,
  getCoreRowModel,
  getFilteredRowModel,
  getPaginationRowModel,
  getSortedRowModel,
  useReactTable,
  type ColumnDef,
  type PaginationState,
  type RowData,
  type SortingState,
  type VisibilityState,
} from "@tanstack/react-table";
import { useEffect, useState, type ReactNode } from "react";
import { TextField } from "@/components/ui/LabelledField";
import type { ApiError } from "@/lib/client/api";
import { ColumnsMenu } from "./ColumnsMenu";
import type { ListState } from "./list-state";
import { Pager } from "./Pager";

declare module "@tanstack/react-table" {
  // The generic names must match TanStack's own declaration to merge with it.
  // eslint-disable-next-line @typescript-eslint/no-unused-vars
  interface ColumnMeta<TData extends RowData, TValue> {
    /** numbers: right-aligned, tabular figures */
    numeric?: boolean;
    /** extra classes of the column's cells */
    className?: string;
    /** what the column means, shown on its header */
    help?: string;
    /** the column's name in the Columns menu when its header is not plain text */
    label?: string;
    /** hidden until the reader shows it */
    hidden?: boolean;
    /** always shown (the column that names the row) */
    fixed?: boolean;
  }
}

// Columns of any value type in one list: TanStack's own typing needs `any` for the value here.
// eslint-disable-next-line @typescript-eslint/no-explicit-any
export type Columns<T> = Array<ColumnDef<T, any>>;

type Paging =
  | { mode: "server"; list: ListState; total: number | undefined }
  | { mode: "client"; pageSize?: number; initialSort?: SortingState; search?: { label: string; placeholder?: string } };

export interface DataTableProps<T> {
  /** names the table's saved column choices and, unless `testId` says otherwise, its test id */
  id: string;
  /** read by screen readers before the table */
  caption: string;
  columns: Columns<T>;
  /** undefined while loading */
  data: readonly T[] | undefined;
  rowKey: (row: T) => string;
  paging: Paging;
  /** the screen's filter controls (server lists: bound to `list.filters`) */
  filters?: ReactNode;
  /** shown instead of rows when nothing matches */
  empty: ReactNode;
  error?: ApiError | null;
  loading?: boolean;
  testId?: string;
  rowTestId?: (row: T) => string | undefined;
  rowClassName?: (row: T) => string;
  /** the pager's words for a row ("component", "event") */
  noun?: [string, string];
}

const STORE = (id: string) => `pinchpoint.table.${id}.hidden`;

function initialVisibility<T>(columns: Columns<T>): VisibilityState {
  const out: VisibilityState = {};
  for (const c of columns) {
    // An accessor column made from a key (col.accessor("name", …)) has no id of its own: TanStack
    // names it after the key.
    const columnId = c.id ?? ("accessorKey" in c && typeof c.accessorKey === "string" ? c.accessorKey : undefined);
    if (columnId && c.meta?.hidden) out[columnId] = false;
  }
  return out;
}

export function DataTable<T>({ id, caption, columns, data, rowKey, paging, filters, empty, error, loading, testId, rowTestId, rowClassName, noun = ["row", "rows"] }: DataTableProps<T>) {
  const server = paging.mode === "server" ? paging : null;
  const client = paging.mode === "client" ? paging : null;
  const [visibility, setVisibility] = useState<VisibilityState>(() => initialVisibility(columns));
  const [sorting, setSorting] = useState<SortingState>(client?.initialSort ?? []);
  const [pagination, setPagination] = useState<PaginationState>({ pageIndex: 0, pageSize: client?.pageSize ?? 25 });
  const [globalFilter, setGlobalFilter] = useState("");

  // Saved column choices are read after the first render: the server renders every default column.
  useEffect(() => {
    try {
      const saved = JSON.parse(window.localStorage.getItem(STORE(id)) ?? "null") as unknown;
      if (saved && typeof saved === "object") setVisibility((v) => ({ ...v, ...(saved as VisibilityState) }));
    } catch {
      // unreadable storage: keep the defaults
    }
  }, [id]);

  const table = useReactTable<T>({
    data: (data ?? []) as T[],
    columns,
    getRowId: (row) => rowKey(row),
    initialState: { columnVisibility: initialVisibility(columns) },
    state: {
      columnVisibility: visibility,
      sorting: server ? server.list.sorting : sorting,
      ...(client ? { pagination, globalFilter } : {}),
    },
    onColumnVisibilityChange: (updater) =>
      setVisibility((old) => {
        const next = typeof updater === "function" ? updater(old) : updater;
        try {
          window.localStorage.setItem(STORE(id), JSON.stringify(next));
        } catch {
          // storage refused (private window): the choice lasts for this page only
        }
        return next;
      }),
    getCoreRowModel: getCoreRowModel(),
    ...(server
      ? { manualSorting: true, manualPagination: true, manualFiltering: true, enableSortingRemoval: false }
      : {
          onSortingChange: setSorting,
          onPaginationChange: setPagination,
          onGlobalFilterChange: setGlobalFilter,
          getSortedRowModel: getSortedRowModel(),
          getFilteredRowModel: getFilteredRowModel(),
          getPaginationRowModel: getPaginationRowModel(),
          autoResetPageIndex: true,
        }),
  });

  const canSort = (columnId: string, clientCan: boolean) => (server ? columnId in server.list.spec.sorts : clientCan);
  const sortOf = (columnId: string): "asc" | "desc" | null => {
    if (server) return server.list.sort === columnId ? server.list.order : null;
    const s = sorting.find((x) => x.id === columnId);
    return s ? (s.desc ? "desc" : "asc") : null;
  };
  const toggle = (columnId: string) => {
    if (server) server.list.toggleSort(columnId);
    else table.getColumn(columnId)?.toggleSorting();
  };

  const rows = table.getRowModel().rows;
  const visible = table.getVisibleLeafColumns().length;
  const total = server ? server.total : table.getFilteredRowModel().rows.length;
  const page = server ? server.list.page : pagination.pageIndex + 1;
  const pageSize = server ? server.list.pageSize : pagination.pageSize;
  const busy = loading ?? (data === undefined && !error);
  // A narrow table has nothing to hide; a short client list nothing to search.
  const hideable = columns.length >= 5 ? table.getAllLeafColumns().filter((c) => !c.columnDef.meta?.fixed && c.getCanHide()) : [];
  const search = client?.search && (data?.length ?? 0) > pageSize ? client.search : null;

  return (
    <div className="space-y-2">
      {(filters || search || hideable.length > 1) && (
        <div className="flex flex-wrap items-end gap-3">
          {search && (
            <TextField
              label={search.label}
              type="search"
              value={globalFilter}
              placeholder={search.placeholder}
              onChange={(e) => setGlobalFilter(e.target.value)}
              className="w-56"
            />
          )}
          {filters}
          {hideable.length > 1 && (
            <div className="ml-auto">
              <ColumnsMenu table={table} columns={hideable} caption={caption} />
            </div>
          )}
        </div>
      )}
      <div className="overflow-x-auto rounded-lg border border-line bg-surface" aria-busy={busy}>
        <table className="w-full text-sm" data-testid={testId ?? id}>
          <caption className="sr-only">
            {caption}
            {sortOf(table.getState().sorting[0]?.id ?? "") ? `, sorted by ${table.getState().sorting[0]?.id} ${sortOf(table.getState().sorting[0]?.id ?? "") === "asc" ? "ascending" : "descending"}` : ""}
          </caption>
          <thead className="border-b border-line bg-raised text-xs text-muted">
            {table.getHeaderGroups().map((group) => (
              <tr key={group.id}>
                {group.headers.map((header) => {
                  const meta = header.column.columnDef.meta;
                  const sortable = canSort(header.column.id, header.column.getCanSort());
                  const active = sortOf(header.column.id);
                  const content = header.isPlaceholder ? null : flexRender(header.column.columnDef.header, header.getContext());
                  return (
                    <th
                      key={header.id}
                      scope="col"
                      aria-sort={active ? (active === "asc" ? "ascending" : "descending") : undefined}
                      title={meta?.help}
                      className={`whitespace-nowrap px-2 py-2 font-medium ${meta?.numeric ? "text-right" : "text-left"}`}
                    >
                      {sortable ? (
                        <button
                          type="button"
                          onClick={() => toggle(header.column.id)}
                          className={`inline-flex items-center gap-1 rounded hover:text-ink focus-visible:outline-2 focus-visible:outline-brass ${active ? "text-ink" : ""}`}
                        >
                          {content}
                          <span aria-hidden className={active ? "text-brass" : "text-faint"}>
                            {active === "asc" ? "▲" : active === "desc" ? "▼" : "↕"}
                          </span>
                        </button>
                      ) : (
                        content
                      )}
                    </th>
                  );
                })}
              </tr>
            ))}
          </thead>
          <tbody>
            {rows.map((row) => (
              <tr key={row.id} data-testid={rowTestId?.(row.original)} className={`border-b border-line/60 align-top last:border-0 hover:bg-raised/60 ${rowClassName?.(row.original) ?? ""}`}>
                {row.getVisibleCells().map((cell) => {
                  const meta = cell.column.columnDef.meta;
                  return (
                    <td key={cell.id} className={`px-2 py-1.5 ${meta?.numeric ? "text-right font-mono tabular-nums" : ""} ${meta?.className ?? ""}`}>
                      {flexRender(cell.column.columnDef.cell, cell.getContext())}
                    </td>
                  );
                })}
              </tr>
            ))}
            {data !== undefined && rows.length === 0 && (
              <tr>
                <td colSpan={visible} className="px-3 py-6 text-center text-muted">
                  {empty}
                </td>
              </tr>
            )}
            {data === undefined && (
              <tr>
                <td colSpan={visible} className={`px-3 py-6 text-center ${error ? "text-down" : "text-muted"}`}>
                  {error ? `Could not load: ${error.message}` : "Loading…"}
                </td>
              </tr>
            )}
          </tbody>
        </table>
      </div>
      {(server || (total ?? 0) > pageSize) && (
        <Pager
          label={caption}
          page={page}
          pageSize={pageSize}
          total={total}
          noun={noun}
          onPage={(p) => (server ? server.list.setPage(p) : setPagination((x) => ({ ...x, pageIndex: p - 1 })))}
          onPageSize={server ? (n) => server.list.setPageSize(n) : (n) => setPagination({ pageIndex: 0, pageSize: n })}
          maxPageSize={server?.list.spec.maxLimit}
          testId={`${testId ?? id}-pages`}
        />
      )}
    </div>
  );
}
