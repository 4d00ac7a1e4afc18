"use client";
// The ranked table: sorted and filtered on the server (the URL carries sort, order, filters, page),
// rendered with TanStack Table in manual mode so the server's order is the one shown.
import { createColumnHelper, flexRender, getCoreRowModel, useReactTable, type SortingState } from "@tanstack/react-table";
import Link from "next/link";
import { useMemo } from "react";
import { ReviewBadge } from "@/components/reviews/ReviewBadge";
import { useReviews } from "@/components/reviews/useReviews";
import type { ReviewSummary } from "@/lib/data/reviews";
import useSWR from "swr";
import { Badge } from "@/components/ui/Badge";
import { Button } from "@/components/ui/Button";
import { Card } from "@/components/ui/Card";
import { SelectField, TextField } from "@/components/ui/LabelledField";
import { betweennessPct, measure, NOT_CONVERGED, pinchScore, plural, rankLabel } from "@/components/ui/format";
import { Notice } from "@/components/ui/Notice";
import { useUrlState } from "@/components/ui/url-state";
import { fetchJson, type ApiError } from "@/lib/client/fetcher";
import { COMPONENT_KINDS } from "@/lib/inventory/types";
import type { RankingItem, RankingsResponse, RankTrendResponse } from "./api-types";
import type { TeamOverview } from "@/lib/data/team-admin";
import { MEASURE_HELP } from "./measures";
import { defaultRankingOrder, isRankingSort as isSort, type RankingSort } from "@/lib/api/ranking-sorts";
import { SnapshotMeta } from "./SnapshotMeta";
import { Sparkline } from "./Sparkline";

export const PAGE_SIZE = 25;

interface Row extends RankingItem {
  trend: Array<{ snapshot: number; rank: number | null }> | undefined;
  review: ReviewSummary | null;
}

const col = createColumnHelper<Row>();
const num = "text-right font-mono tabular-nums";

const filtered = (f: Record<string, string>): boolean => Object.values(f).some(Boolean);

/** A measure value, or the words saying it was withheld. */
function Converged({ value }: { value: number | null }) {
  return value === null ? <span className="text-xs text-degraded">{NOT_CONVERGED}</span> : <>{measure(value)}</>;
}

export function PinchPoints({ env }: { env: string }) {
  const url = useUrlState();
  const sortParam = url.get("sort");
  const sort: RankingSort = isSort(sortParam) ? sortParam : "betweenness";
  const orderParam = url.get("order");
  const order: "asc" | "desc" = orderParam === "asc" || orderParam === "desc" ? orderParam : defaultRankingOrder(sort);
  const page = Math.max(1, Number(url.get("page") ?? 1) || 1);
  const filters = { team: url.get("team") ?? "", tier: url.get("tier") ?? "", kind: url.get("kind") ?? "", q: url.get("q") ?? "" };

  const query = new URLSearchParams({ sort, order });
  for (const [k, v] of Object.entries(filters)) if (v) query.set(k, v);
  const exportHref = `/api/v1/environments/${env}/rankings/export?${query}`;
  query.set("limit", String(PAGE_SIZE));
  query.set("offset", String((page - 1) * PAGE_SIZE));

  const rankings = useSWR<RankingsResponse, ApiError>(`/api/v1/environments/${env}/rankings?${query}`, fetchJson, { keepPreviousData: true, refreshInterval: 30_000 });
  // Team names for the filter; the rows themselves carry everything the table shows.
  const teamList = useSWR<{ items: TeamOverview[] }, ApiError>("/api/v1/teams", fetchJson);
  const keys = rankings.data?.items.map((i) => i.key) ?? [];
  const trends = useSWR<RankTrendResponse, ApiError>(keys.length ? `/api/v1/environments/${env}/rankings/history?count=12&keys=${keys.join(",")}` : null, fetchJson, { keepPreviousData: true });

  const teams = useMemo(() => (teamList.data?.items ?? []).map((t) => ({ value: t.slug, label: t.name })), [teamList.data]);
  const reviews = useReviews(env);
  const trendByKey = useMemo(() => new Map(trends.data?.series.map((s) => [s.key, s.points]) ?? []), [trends.data]);

  const rows: Row[] = useMemo(
    () =>
      (rankings.data?.items ?? []).map((item) => ({ ...item, trend: trendByKey.get(item.key), review: reviews.byKey[item.key] ?? null })),
    [rankings.data, trendByKey, reviews.byKey],
  );

  const columns = useMemo(
    () => [
      col.accessor((r) => r.position, {
        id: "rank",
        header: "#",
        cell: (i) => {
          const p = i.getValue();
          return (
            <span title={p.tied > 1 ? `Shares rank ${p.rank} with ${p.tied - 1} other component${p.tied > 2 ? "s" : ""} of equal value` : undefined} data-testid="rank">
              {rankLabel(p)}
            </span>
          );
        },
        meta: { className: `${num} w-10` },
      }),
      col.accessor("key", {
        header: "Component",
        cell: (info) => {
          const r = info.row.original;
          return (
            <div className="min-w-44">
              <Link href={`/environments/${env}/components/${encodeURIComponent(r.key)}`} className="font-mono text-ink underline decoration-line underline-offset-2 hover:decoration-brass">
                {r.key}
              </Link>
              <div className="mt-0.5 flex flex-wrap items-center gap-1">
                {r.name !== r.key && <span className="mr-1 text-xs text-faint">{r.name}</span>}
                {r.kind === "undeclared" && <Badge tone="undeclared" title="needed by something, declared by no source">undeclared</Badge>}
                {r.singlePoint && r.kind !== "undeclared" && <Badge tone="degraded" title={MEASURE_HELP.single.short}>single</Badge>}
                <ReviewBadge review={r.review} compact />
                <Link
                  href={`/environments/${env}/drills?fail=${encodeURIComponent(r.key)}`}
                  className="whitespace-nowrap text-xs text-info hover:underline"
                  aria-label={`Blast radius of ${r.key}`}
                >
                  blast radius →
                </Link>
              </div>
            </div>
          );
        },
      }),
      col.accessor("team", { header: "Team", cell: (i) => <span className="whitespace-nowrap">{i.getValue() ?? <Badge tone="degraded">unowned</Badge>}</span> }),
      col.accessor("tier", { header: "Tier", meta: { className: num } }),
      col.accessor("kind", { header: "Kind", cell: (i) => <span className="text-muted">{i.getValue()}</span> }),
      col.accessor("betweenness", { header: "Betweenness", cell: (i) => betweennessPct(i.getValue()), meta: { className: num, help: MEASURE_HELP.betweenness.short } }),
      col.accessor("pagerank", { header: "PageRank", cell: (i) => <Converged value={i.getValue()} />, meta: { className: num, help: MEASURE_HELP.pagerank.short } }),
      col.accessor("eigenvector", { header: "Eigenvector", cell: (i) => <Converged value={i.getValue()} />, meta: { className: num, help: MEASURE_HELP.eigenvector.short } }),
      col.accessor("clustering", { header: "Clustering", cell: (i) => measure(i.getValue()), meta: { className: num, help: MEASURE_HELP.clustering.short } }),
      col.accessor((r) => r.blastRadius.down, { id: "blastDown", header: MEASURE_HELP.blastDown.label, meta: { className: num, help: MEASURE_HELP.blastDown.short } }),
      col.accessor((r) => r.blastRadius.degraded, { id: "blastDegraded", header: "Degraded", meta: { className: num, help: MEASURE_HELP.blastDegraded.short } }),
      col.accessor("entriesDominated", {
        header: MEASURE_HELP.entriesDominated.label,
        cell: (i) => i.getValue() ?? "—",
        meta: { className: num, help: MEASURE_HELP.entriesDominated.short },
      }),
      col.accessor("pinchScore", { header: MEASURE_HELP.pinchScore.label, cell: (i) => pinchScore(i.getValue()), meta: { className: num, help: MEASURE_HELP.pinchScore.short } }),
      col.accessor("articulation", { header: MEASURE_HELP.articulation.label, cell: (i) => (i.getValue() ? <Badge tone="info">splits the graph</Badge> : null), meta: { help: MEASURE_HELP.articulation.short } }),
      col.accessor("inCycle", { header: "Cycle", cell: (i) => (i.getValue() ? <Badge tone="cycle">in a cycle</Badge> : null), meta: { help: MEASURE_HELP.inCycle.short } }),
      col.display({ id: "trend", header: "Trend", cell: (i) => (i.row.original.trend ? <Sparkline points={i.row.original.trend} /> : <span className="text-xs text-faint">…</span>) }),
    ],
    [env],
  );

  const sorting: SortingState = [{ id: sort, desc: order === "desc" }];
  const table = useReactTable({ data: rows, columns, state: { sorting }, manualSorting: true, manualPagination: true, getCoreRowModel: getCoreRowModel(), getRowId: (r) => r.key });

  const toggleSort = (id: string) => {
    if (!isSort(id)) return;
    const nextOrder = id === sort ? (order === "asc" ? "desc" : "asc") : defaultRankingOrder(id);
    url.set({ sort: id, order: nextOrder, page: null });
  };

  const total = rankings.data?.total ?? 0;
  const pages = Math.max(1, Math.ceil(total / PAGE_SIZE));
  const error = rankings.error;
  const measures = rankings.data?.analysis.measures;
  const items = rankings.data?.items ?? [];
  const anyTie = items.some((i) => i.position.tied > 1);
  // Every component equal in the measure ranked by (an estate where nothing lies between two others):
  // all share rank 1, and the order shown is only by key.
  const allTied = items.length > 0 && items[0]!.position.rank === 1 && items[0]!.position.tied >= total && !filtered(filters);
  const rankByLabel = rankings.data ? (MEASURE_HELP[rankings.data.rankBy as keyof typeof MEASURE_HELP]?.label ?? rankings.data.rankBy) : "";

  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h1 className="text-2xl font-semibold tracking-tight">Pinch points</h1>
          <p className="mt-1 text-sm text-muted">Components whose failure takes the most of the estate with them, betweenness first.</p>
        </div>
        <a href={exportHref} download className="rounded-md border border-line bg-raised px-3 py-1.5 text-sm text-ink hover:border-brass" data-testid="csv-export">
          Export CSV ({total} rows)
        </a>
      </div>
      {rankings.data && <SnapshotMeta meta={rankings.data} />}
      {measures?.eigenvector?.converged === false && (
        <Notice tone="caution" title="Eigenvector centrality did not converge in this analysis">
          {measures.eigenvector.reason ?? NOT_CONVERGED}. The column says “{NOT_CONVERGED}” instead of showing a number that would be wrong.
        </Notice>
      )}
      {measures?.pagerank?.converged === false && (
        <Notice tone="caution" title="PageRank did not converge in this analysis">
          {measures.pagerank.reason ?? NOT_CONVERGED}. The column says “{NOT_CONVERGED}” instead of a number.
        </Notice>
      )}
      {measures?.dominators && !measures.dominators.complete && (
        <Notice tone="info" title="Entry points: not every one was analysed">
          Per-entry dominators cover {measures.dominators.entriesAnalysed} of {measures.dominators.entries} entry points (the analysis&apos; work limit): the “{MEASURE_HELP.entriesDominated.label}” counts are at least these.
        </Notice>
      )}
      {allTied && (
        <div data-testid="all-tied">
        <Notice tone="info" title={`Every component shares rank 1 by ${rankByLabel.toLowerCase()}`}>
          All {plural(items[0]!.position.tied, "component")} have the same {rankByLabel.toLowerCase()} ({rankings.data?.rankBy === "betweenness" ? betweennessPct(items[0]!.betweenness) : "equal values"}), so they share rank 1 and the order below is by key only. Sort by another column to tell them apart.
        </Notice>
        </div>
      )}
      {error && (
        <Notice tone={error.status === 404 ? "info" : "error"} title={error.status === 404 ? "No ranking to show yet" : "Could not load the ranking"}>
          {error.message}
        </Notice>
      )}

      <form role="search" aria-label="Filter the ranking" className="flex flex-wrap items-end gap-3" onSubmit={(e) => e.preventDefault()}>
        <TextField
          label="Search key or name"
          type="search"
          defaultValue={filters.q}
          placeholder="e.g. session"
          onChange={(e) => url.set({ q: e.target.value.trim() || null, page: null })}
          className="w-56"
        />
        <SelectField label="Team" value={filters.team} onChange={(e) => url.set({ team: e.target.value || null, page: null })} options={[{ value: "", label: "All teams" }, ...teams]} />
        <SelectField label="Tier" value={filters.tier} onChange={(e) => url.set({ tier: e.target.value || null, page: null })} options={[{ value: "", label: "All tiers" }, ...[1, 2, 3, 4].map((t) => ({ value: String(t), label: `Tier ${t}` }))]} />
        <SelectField label="Kind" value={filters.kind} onChange={(e) => url.set({ kind: e.target.value || null, page: null })} options={[{ value: "", label: "All kinds" }, ...[...COMPONENT_KINDS, "undeclared"].map((k) => ({ value: k, label: k }))]} />
        {(filters.q || filters.team || filters.tier || filters.kind) && (
          <Button type="button" variant="ghost" onClick={() => url.set({ q: null, team: null, tier: null, kind: null, page: null })}>
            Clear filters
          </Button>
        )}
      </form>

      <div className="overflow-x-auto rounded-lg border border-line bg-surface" aria-busy={rankings.isLoading || rankings.isValidating}>
        <table className="w-full text-sm" data-testid="rankings-table">
          <caption className="sr-only">Pinch-point ranking sorted by {sort}, {order === "asc" ? "ascending" : "descending"}</caption>
          <thead className="border-b border-line bg-raised text-xs text-muted">
            {table.getHeaderGroups().map((group) => (
              <tr key={group.id}>
                {group.headers.map((header) => {
                  const meta = header.column.columnDef.meta as { className?: string; help?: string } | undefined;
                  const sortable = isSort(header.column.id);
                  const active = header.column.id === sort;
                  return (
                    <th
                      key={header.id}
                      scope="col"
                      aria-sort={active ? (order === "asc" ? "ascending" : "descending") : undefined}
                      className={`px-1.5 py-2 font-medium ${meta?.className?.includes("text-right") ? "text-right" : "text-left"}`}
                      title={meta?.help}
                    >
                      {sortable ? (
                        <button type="button" onClick={() => toggleSort(header.column.id)} className={`inline-flex items-center gap-1 rounded hover:text-ink focus-visible:outline-2 focus-visible:outline-brass ${active ? "text-ink" : ""}`}>
                          {flexRender(header.column.columnDef.header, header.getContext())}
                          <span aria-hidden className={active ? "text-brass" : "text-faint"}>
                            {active ? (order === "asc" ? "▲" : "▼") : "↕"}
                          </span>
                        </button>
                      ) : (
                        flexRender(header.column.columnDef.header, header.getContext())
                      )}
                    </th>
                  );
                })}
              </tr>
            ))}
          </thead>
          <tbody>
            {table.getRowModel().rows.map((row) => (
              <tr key={row.id} className="border-b border-line/60 last:border-0 hover:bg-raised/60">
                {row.getVisibleCells().map((cell) => {
                  const meta = cell.column.columnDef.meta as { className?: string } | undefined;
                  return (
                    <td key={cell.id} className={`px-1.5 py-1.5 align-top ${meta?.className ?? ""}`}>
                      {flexRender(cell.column.columnDef.cell, cell.getContext())}
                    </td>
                  );
                })}
              </tr>
            ))}
            {rankings.data && rows.length === 0 && (
              <tr>
                <td colSpan={columns.length} className="px-3 py-6 text-center text-muted">
                  No component matches these filters.
                </td>
              </tr>
            )}
            {!rankings.data && !error && (
              <tr>
                <td colSpan={columns.length} className="px-3 py-6 text-center text-muted">
                  Loading the ranking…
                </td>
              </tr>
            )}
          </tbody>
        </table>
      </div>

      {anyTie && !allTied && (
        <p className="text-xs text-muted" data-testid="ties-note">
          Equal values share a rank (standard competition ranking: 1, 2, 2, 4); “=4” marks a rank shared with others. The # column ranks by {rankByLabel.toLowerCase()}.
        </p>
      )}
      <nav aria-label="Pages" className="flex items-center justify-between gap-3 text-sm text-muted">
        <span data-testid="page-status">
          {total ? `${(page - 1) * PAGE_SIZE + 1}–${Math.min(page * PAGE_SIZE, total)} of ${total}` : "0 components"} · page {page} of {pages}
        </span>
        <div className="flex gap-2">
          <Button type="button" disabled={page <= 1} onClick={() => url.set({ page: page - 1 > 1 ? String(page - 1) : null })}>
            Previous page
          </Button>
          <Button type="button" disabled={page >= pages} onClick={() => url.set({ page: String(page + 1) })}>
            Next page
          </Button>
        </div>
      </nav>

      <Card title="What the columns mean">
        <dl className="grid gap-x-6 gap-y-2 text-sm md:grid-cols-2">
          {Object.values(MEASURE_HELP).map((m) => (
            <div key={m.label}>
              <dt className="font-medium text-ink">{m.label}</dt>
              <dd className="text-muted">{m.short}</dd>
            </div>
          ))}
        </dl>
      </Card>
    </div>
  );
}
