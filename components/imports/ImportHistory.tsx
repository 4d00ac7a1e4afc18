"use client";
// Accepted pushes and uploads of one environment, newest first: paged, sorted and filtered on the
// server (the history grows with every CI run).
import { createColumnHelper } from "@tanstack/react-table";
import Link from "next/link";
import { Card } from "@/components/ui/Card";
import { DataTable } from "@/components/ui/data-table/DataTable";
import { ListSearch, ListSelect } from "@/components/ui/data-table/filters";
import { useListState } from "@/components/ui/data-table/list-state";
import { When } from "@/components/ui/When";
import { IMPORT_LIST, importsResponseSchema, type ImportRow } from "@/lib/api/schemas/history";
import { useApi } from "@/lib/client/api";
import { IMPORT_FORMATS } from "@/lib/inventory/types";

/** The history's API address for its first page: the imports screen refreshes every page of it after a push. */
export const importsKeyPrefix = (env: string) => `/api/v1/environments/${env}/imports`;

const col = createColumnHelper<ImportRow>();

function Counts({ s }: { s: NonNullable<ImportRow["summary"]> }) {
  const parts: [string, number | undefined, string][] = [
    ["+", s.componentsAdded, "text-ok"],
    ["−", s.componentsRemoved, "text-down"],
    ["~", s.componentsChanged, "text-degraded"],
  ];
  const deps = (s.dependenciesAdded ?? 0) + (s.dependenciesRemoved ?? 0);
  return (
    <span className="font-mono text-xs">
      {parts.map(([sign, n, cls]) =>
        n ? (
          <span key={sign} className={`mr-2 ${cls}`}>
            {sign}
            {n}
          </span>
        ) : null,
      )}
      {deps > 0 && <span className="text-muted">{deps} dependency changes</span>}
      {s.observedEdges ? <span className="text-muted">{s.observedEdges} observed edges</span> : null}
    </span>
  );
}

function columns(env: string) {
  return [
    col.accessor("createdAt", { header: "When", meta: { fixed: true }, cell: (i) => <When at={i.getValue()} seconds /> }),
    col.accessor("actor", { header: "Who" }),
    col.accessor("source", { header: "Source", cell: (i) => <span className="font-mono">{i.getValue()}</span> }),
    col.accessor("format", { header: "Format" }),
    col.display({
      id: "result",
      header: "Result",
      cell: (i) => {
        const row = i.row.original;
        return (
          <span className="whitespace-nowrap">
            {row.changed && row.snapshot !== null ? (
              <Link href={`/environments/${env}/history?snapshot=${row.snapshot}`} className="text-brass underline underline-offset-4">
                snapshot #{row.snapshot}
              </Link>
            ) : (
              <span className="text-muted">no change</span>
            )}
            {row.warnings && row.warnings.length > 0 && (
              <span className="ml-2 text-xs text-degraded">
                {row.warnings.length} warning{row.warnings.length === 1 ? "" : "s"}
              </span>
            )}
          </span>
        );
      },
    }),
    col.display({ id: "changes", header: "Changes", cell: (i) => (i.row.original.summary ? <Counts s={i.row.original.summary} /> : null) }),
  ];
}

export function ImportHistory({ env }: { env: string }) {
  const list = useListState(IMPORT_LIST, { filters: ["q", "format"], prefix: "imports", pageSize: 25 });
  const history = useApi(importsResponseSchema, `${importsKeyPrefix(env)}?${list.query}`, { keepPreviousData: true });
  return (
    <Card title="Import history">
      {history.error?.status === 404 ? (
        <p className="text-sm text-muted">
          Nothing has been pushed to <span className="font-mono text-ink">{env}</span> yet, so there is no history.
        </p>
      ) : (
        <>
          <p className="mb-3 text-xs text-muted">Accepted pushes and uploads, newest first. Rejected files write nothing, so they are not listed.</p>
          <DataTable
            id="import-history"
            caption="Import history"
            columns={columns(env)}
            data={history.data?.items}
            rowKey={(r) => r.id}
            rowTestId={() => "history-row"}
            error={history.error}
            paging={{ mode: "server", list, total: history.data?.total }}
            noun={["import", "imports"]}
            empty={Object.keys(list.filters).length ? "No import matches these filters." : "No imports yet."}
            filters={
              <>
                <ListSearch list={list} label="Source or who" placeholder="e.g. storefront-repo" />
                <ListSelect list={list} name="format" label="Format" all="Every format" options={IMPORT_FORMATS.map((f) => ({ value: f, label: f }))} />
              </>
            }
          />
        </>
      )}
    </Card>
  );
}
