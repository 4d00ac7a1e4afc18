"use client";
// Snapshots newest first; pick any two to compare (?from=&to= in the URL); the top ranks over time.
import { createColumnHelper } from "@tanstack/react-table";
import Link from "next/link";
import type { ReactNode } from "react";
import { Badge } from "@/components/ui/Badge";
import { Card } from "@/components/ui/Card";
import { DataTable } from "@/components/ui/data-table/DataTable";
import { ListSearch } from "@/components/ui/data-table/filters";
import { useListState } from "@/components/ui/data-table/list-state";
import { Notice } from "@/components/ui/Notice";
import { useUrlState } from "@/components/ui/url-state";
import { When } from "@/components/ui/When";
import { rankTrendResponseSchema } from "@/lib/api/schemas/analysis";
import { diffResponseSchema, SNAPSHOT_LIST, snapshotsResponseSchema, type DiffResponse, type SnapshotListItem } from "@/lib/api/schemas/history";
import { useApi } from "@/lib/client/api";
import { dependencyChangeLine, dependencyLine, fieldChanges } from "./diff-lines";
import { RankChart } from "./RankChart";

const col = createColumnHelper<SnapshotListItem>();

const STATUS_TONE = { done: "ok", running: "info", queued: "muted", failed: "down" } as const;

function columns(from: number, to: number, pick: (which: "from" | "to", n: number) => void) {
  return [
    col.display({
      id: "from",
      header: "From",
      meta: { fixed: true },
      cell: (i) => (
        <input type="radio" name="diff-from" aria-label={`Compare from snapshot #${i.row.original.number}`} checked={i.row.original.number === from} onChange={() => pick("from", i.row.original.number)} className="accent-[var(--color-brass)]" />
      ),
    }),
    col.display({
      id: "to",
      header: "To",
      meta: { fixed: true },
      cell: (i) => (
        <input type="radio" name="diff-to" aria-label={`Compare to snapshot #${i.row.original.number}`} checked={i.row.original.number === to} onChange={() => pick("to", i.row.original.number)} className="accent-[var(--color-brass)]" />
      ),
    }),
    col.accessor("number", { header: "#", meta: { fixed: true }, cell: (i) => <span className="font-mono">#{i.getValue()}</span> }),
    col.accessor("createdAt", { header: "When", cell: (i) => <When at={i.getValue()} /> }),
    col.display({
      id: "who",
      header: "Who · source · format",
      cell: (i) => (
        <span className="text-xs text-muted">
          {i.row.original.actor ?? "unknown"} · <span className="font-mono">{i.row.original.source ?? "—"}</span> · {i.row.original.format ?? "—"}
        </span>
      ),
    }),
    col.accessor("components", {
      header: "Components",
      meta: { numeric: true },
      cell: (i) => (
        <>
          {i.getValue()}
          {i.row.original.undeclared > 0 && (
            <span className="text-xs text-muted" title="needed by something, declared by no source">
              {" "}
              ({i.row.original.undeclared} undeclared)
            </span>
          )}
        </>
      ),
    }),
    col.accessor("undeclared", { header: "Undeclared", meta: { numeric: true, hidden: true } }),
    col.accessor("dependencies", { header: "Deps", meta: { numeric: true } }),
    col.accessor("analysis", {
      header: "Analysis",
      enableSorting: false,
      cell: (i) => {
        const a = i.getValue();
        return <Badge tone={a && a in STATUS_TONE ? STATUS_TONE[a as keyof typeof STATUS_TONE] : "muted"}>{a ?? "not queued"}</Badge>;
      },
    }),
  ];
}

export function History({ env }: { env: string }) {
  const url = useUrlState();
  const list = useListState(SNAPSHOT_LIST, { filters: ["q"], pageSize: 25 });
  const snapshots = useApi(snapshotsResponseSchema, `/api/v1/environments/${env}/snapshots?${list.query}`, { refreshInterval: 15_000, keepPreviousData: true });
  // The two newest snapshots, whatever the table shows: the comparison the screen opens on.
  const newest = useApi(snapshotsResponseSchema, `/api/v1/environments/${env}/snapshots?limit=2`, { refreshInterval: 15_000 });
  const trend = useApi(rankTrendResponseSchema, `/api/v1/environments/${env}/rankings/history?top=8&count=30`);
  const items = newest.data?.items ?? [];
  // ?snapshot=N (linked from the import history) shows what that snapshot changed: N−1 → N.
  const single = Number(url.get("snapshot") ?? 0);
  const from = Number(url.get("from") ?? (single ? single - 1 : (items[1]?.number ?? 0)));
  const to = Number(url.get("to") ?? (single || (items[0]?.number ?? 0)));
  const canDiff = from > 0 && to > 0 && from !== to;
  const diff = useApi(diffResponseSchema, canDiff ? `/api/v1/environments/${env}/snapshots/${from}/diff/${to}` : null);
  const pick = (which: "from" | "to", n: number) => url.set(which === "from" ? { from: String(n), to: String(to), snapshot: null } : { to: String(n), from: String(from), snapshot: null });

  return (
    <div className="space-y-4">
      <div>
        <h1 className="text-2xl font-semibold tracking-tight">History</h1>
        <p className="mt-1 text-sm text-muted">Every push that changed the graph made a numbered snapshot. Pick two to see what changed between them.</p>
      </div>
      {snapshots.error && (
        <Notice tone={snapshots.error.status === 404 ? "info" : "error"} title={snapshots.error.status === 404 ? "No such environment" : "Could not load the snapshots"}>
          {snapshots.error.message}
        </Notice>
      )}
      {newest.data && items.length === 0 && <Notice title="No snapshot yet">Nothing has been pushed to this environment. The first push makes snapshot #1.</Notice>}

      <Card title="Top 8 by betweenness: rank over time">
        {trend.data ? (
          trend.data.snapshots.length > 1 ? (
            <RankChart trend={trend.data} />
          ) : (
            <p className="text-sm text-muted">Only one analysed snapshot so far: the chart needs two.</p>
          )
        ) : trend.error ? (
          <p className="text-sm text-muted">{trend.error.message}</p>
        ) : (
          <p className="text-sm text-muted">Loading…</p>
        )}
      </Card>

      <div className="grid gap-4 xl:grid-cols-[minmax(0,3fr)_minmax(0,2fr)]">
        <Card title={`Snapshots (${snapshots.data?.total ?? "…"})`}>
          <DataTable
            id="snapshots"
            testId="snapshots-table"
            caption="Snapshots, newest first; choose the two to compare in the From and To columns"
            columns={columns(from, to, pick)}
            data={snapshots.data?.items}
            rowKey={(s) => s.id}
            rowClassName={(s) => (s.number === from || s.number === to ? "bg-raised/70" : "")}
            error={snapshots.error}
            paging={{ mode: "server", list, total: snapshots.data?.total }}
            noun={["snapshot", "snapshots"]}
            empty={list.filters.q ? "No snapshot pushed by that source or person." : "No snapshot yet."}
            filters={<ListSearch list={list} label="Source or who" placeholder="e.g. storefront-repo" />}
          />
        </Card>

        <Card title={canDiff ? `From #${from} to #${to}` : "Compare two snapshots"}>
          {!canDiff && <p className="text-sm text-muted">Pick a From and a different To snapshot in the table.</p>}
          {diff.error && <Notice tone="error" title="Could not compare">{diff.error.message}</Notice>}
          {canDiff && !diff.data && !diff.error && <p className="text-sm text-muted">Comparing…</p>}
          {diff.data && <DiffView env={env} diff={diff.data} />}
        </Card>
      </div>
    </div>
  );
}

function Section({ title, count, tone, children }: { title: string; count: number; tone: string; children: ReactNode }) {
  if (!count) return null;
  return (
    <section className="space-y-1">
      <h3 className={`text-xs font-semibold uppercase tracking-wide ${tone}`}>
        {title} ({count})
      </h3>
      {children}
    </section>
  );
}

function DiffView({ env, diff }: { env: string; diff: DiffResponse }) {
  const empty = !diff.componentsAdded.length && !diff.componentsRemoved.length && !diff.componentsChanged.length && !diff.dependenciesAdded.length && !diff.dependenciesRemoved.length && !diff.dependenciesChanged.length;
  const link = (k: string) => (
    <Link href={`/environments/${env}/components/${encodeURIComponent(k)}`} className="font-mono text-ink hover:underline">
      {k}
    </Link>
  );
  return (
    <div className="space-y-3 text-sm" data-testid="diff">
      <p className="text-muted" data-testid="diff-summary">
        {diff.componentsAdded.length} added, {diff.componentsRemoved.length} removed, {diff.componentsChanged.length} changed components; {diff.dependenciesAdded.length} dependencies added, {diff.dependenciesRemoved.length} removed, {diff.dependenciesChanged.length} changed.
      </p>
      {empty && <p className="text-muted">The two snapshots hold the same graph.</p>}
      <Section title="Components added" count={diff.componentsAdded.length} tone="text-ok">
        <ul tabIndex={0} aria-label="Components added" className="max-h-48 space-y-0.5 overflow-auto">
          {diff.componentsAdded.map((c) => (
            <li key={c.key}>
              + {link(c.key)} <span className="text-xs text-muted">{c.kind === "undeclared" ? "undeclared" : `${c.kind}, ${c.team ?? "unowned"}, tier ${c.tier}`}</span>
            </li>
          ))}
        </ul>
      </Section>
      <Section title="Components removed" count={diff.componentsRemoved.length} tone="text-down">
        <ul tabIndex={0} aria-label="Components removed" className="max-h-48 space-y-0.5 overflow-auto">
          {diff.componentsRemoved.map((c) => (
            <li key={c.key}>
              − <span className="font-mono">{c.key}</span> <span className="text-xs text-muted">{c.kind}, {c.team ?? "unowned"}</span>
            </li>
          ))}
        </ul>
      </Section>
      <Section title="Components changed" count={diff.componentsChanged.length} tone="text-info">
        <ul tabIndex={0} aria-label="Components changed" className="max-h-48 space-y-1 overflow-auto">
          {diff.componentsChanged.map((c) => (
            <li key={c.key}>
              ~ {link(c.key)}
              <ul className="ml-4 font-mono text-xs text-muted">
                {fieldChanges(c).map((l) => (
                  <li key={l}>{l}</li>
                ))}
              </ul>
            </li>
          ))}
        </ul>
      </Section>
      {(
        [
          ["Dependencies added", diff.dependenciesAdded.map((d) => `+ ${dependencyLine(d)}`), "text-ok"],
          ["Dependencies removed", diff.dependenciesRemoved.map((d) => `− ${dependencyLine(d)}`), "text-down"],
          ["Dependencies changed", diff.dependenciesChanged.map((d) => `~ ${dependencyChangeLine(d)}`), "text-info"],
        ] as const
      ).map(([title, lines, tone]) => (
        <Section key={title} title={title} count={lines.length} tone={tone}>
          <ul tabIndex={0} aria-label={title} className="max-h-48 space-y-0.5 overflow-auto font-mono text-xs text-muted">
            {lines.map((l) => (
              <li key={l}>{l}</li>
            ))}
          </ul>
        </Section>
      ))}
    </div>
  );
}
