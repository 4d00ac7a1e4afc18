"use client";
// The ranked table: sorted, filtered and paged on the server (the URL carries sort, order,
// filters and page), on the app's one DataTable.
import { createColumnHelper } from "@tanstack/react-table";
import Link from "next/link";
import { useMemo } from "react";
import { MEASURE_HELP } from "@/components/analysis/measures";
import { SnapshotMeta } from "@/components/analysis/SnapshotMeta";
import { ReviewBadge } from "@/components/reviews/ReviewBadge";
import { useReviews } from "@/components/reviews/useReviews";
import { Badge } from "@/components/ui/Badge";
import { Button } from "@/components/ui/Button";
import { Card } from "@/components/ui/Card";
import { DataTable } from "@/components/ui/data-table/DataTable";
import { ListSearch, ListSelect } from "@/components/ui/data-table/filters";
import { useListState } from "@/components/ui/data-table/list-state";
import { betweennessPct, measure, NOT_CONVERGED, pinchScore, plural, rankLabel } from "@/components/ui/format";
import { CheckField } from "@/components/ui/LabelledField";
import { Notice } from "@/components/ui/Notice";
import { useUrlState } from "@/components/ui/url-state";
import { RANKING_LIST, rankingsResponseSchema, rankTrendResponseSchema, type RankingItem } from "@/lib/api/schemas/analysis";
import type { ReviewSummary } from "@/lib/api/schemas/reviews";
import { teamsResponseSchema } from "@/lib/api/schemas/teams";
import { useApi } from "@/lib/client/api";
import { COMPONENT_KINDS } from "@/lib/inventory/types";
import { Sparkline } from "./Sparkline";

const FILTERS = ["q", "team", "tier", "kind"] as const;

interface Row extends RankingItem {
  trend: Array<{ snapshot: number; rank: number | null }> | undefined;
  review: ReviewSummary | null;
}

const col = createColumnHelper<Row>();

/** A measure value, or the words saying it was withheld. */
function Converged({ value }: { value: number | null }) {
  return value === null ? <span className="text-xs text-degraded">{NOT_CONVERGED}</span> : <>{measure(value)}</>;
}

/** Raw centrality fractions: for people who know the measures, behind "All measures". */
const EXPERT_COLUMNS = new Set(["pagerank", "eigenvector", "clustering", "dominatedAll", "kind"]);

export function PinchPoints({ env, canDecide = false }: { env: string; canDecide?: boolean }) {
  const list = useListState(RANKING_LIST, { filters: FILTERS, pageSize: 25 });
  const url = useUrlState();
  const allMeasures = url.get("measures") === "all";
  const exportQuery = new URLSearchParams(list.query);
  exportQuery.delete("limit");
  exportQuery.delete("offset");
  const exportHref = `/api/v1/environments/${env}/rankings/export?${exportQuery}`;

  const rankings = useApi(rankingsResponseSchema, `/api/v1/environments/${env}/rankings?${list.query}`, { keepPreviousData: true, refreshInterval: 30_000 });
  // Team names for the filter; the rows themselves carry everything the table shows.
  const teamList = useApi(teamsResponseSchema, "/api/v1/teams");
  const keys = rankings.data?.items.map((i) => i.key) ?? [];
  const trends = useApi(rankTrendResponseSchema, keys.length ? `/api/v1/environments/${env}/rankings/history?count=12&keys=${keys.join(",")}` : null, { keepPreviousData: true });

  const teams = useMemo(() => (teamList.data?.items ?? []).map((t) => ({ value: t.slug, label: t.name })), [teamList.data]);
  const reviews = useReviews(env);
  const trendByKey = useMemo(() => new Map(trends.data?.series.map((s) => [s.key, s.points]) ?? []), [trends.data]);

  const rows: Row[] | undefined = useMemo(
    () => rankings.data?.items.map((item) => ({ ...item, trend: trendByKey.get(item.key), review: reviews.byKey[item.key] ?? null })),
    [rankings.data, trendByKey, reviews.byKey],
  );

  // "#" is the position in the current sort: the measure's rank (ties shared) when the sort is a
  // ranked measure, else the row's place in the list.
  const rankedSort = rankings.data?.rankBy === list.sort;
  const offset = (list.page - 1) * list.pageSize;
  const columns = useMemo(
    () => [
      col.accessor((r) => r.position, {
        id: "rank",
        header: "#",
        cell: (i) => {
          const p = rankedSort ? i.getValue() : { rank: offset + i.row.index + 1, tied: 1 };
          return (
            <span title={p.tied > 1 ? `Shares rank ${p.rank} with ${p.tied - 1} other component${p.tied > 2 ? "s" : ""} of equal value` : undefined} data-testid="rank">
              {rankLabel(p)}
            </span>
          );
        },
        meta: { numeric: true, className: "w-10", label: "Position in this sort", help: "Position in the current sort; equal values share a rank" },
      }),
      col.accessor("key", {
        header: "Component",
        meta: { fixed: true },
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
                {canDecide && (
                  <Link
                    href={`/environments/${env}/reviews?decide=${encodeURIComponent(r.key)}#decide`}
                    className="whitespace-nowrap text-xs text-info hover:underline"
                    aria-label={`decide on ${r.key}`}
                    title="Record a risk decision on it"
                  >
                    decide →
                  </Link>
                )}
              </div>
            </div>
          );
        },
      }),
      col.accessor("team", { header: "Team", cell: (i) => <span className="whitespace-nowrap">{i.getValue() ?? <Badge tone="degraded">unowned</Badge>}</span> }),
      col.accessor("tier", { header: "Tier", meta: { numeric: true } }),
      col.accessor("pinchScore", { header: MEASURE_HELP.pinchScore.label, cell: (i) => pinchScore(i.getValue()), meta: { numeric: true, help: MEASURE_HELP.pinchScore.short } }),
      col.accessor("kind", { header: "Kind", cell: (i) => <span className="text-muted">{i.getValue()}</span> }),
      col.accessor("betweenness", { header: "Betweenness", cell: (i) => betweennessPct(i.getValue()), meta: { numeric: true, help: MEASURE_HELP.betweenness.short } }),
      col.accessor("pagerank", { header: "PageRank", cell: (i) => <Converged value={i.getValue()} />, meta: { numeric: true, help: MEASURE_HELP.pagerank.short } }),
      col.accessor("eigenvector", { header: "Eigenvector", cell: (i) => <Converged value={i.getValue()} />, meta: { numeric: true, help: MEASURE_HELP.eigenvector.short } }),
      col.accessor("clustering", { header: "Clustering", cell: (i) => measure(i.getValue()), meta: { numeric: true, help: MEASURE_HELP.clustering.short } }),
      col.accessor((r) => r.blastRadius.down, { id: "blastDown", header: MEASURE_HELP.blastDown.label, meta: { numeric: true, help: MEASURE_HELP.blastDown.short } }),
      col.accessor((r) => r.blastRadius.degraded, { id: "blastDegraded", header: "Degraded", meta: { numeric: true, help: MEASURE_HELP.blastDegraded.short } }),
      col.accessor("entriesDominated", {
        header: MEASURE_HELP.entriesDominated.label,
        cell: (i) => i.getValue() ?? "—",
        meta: { numeric: true, help: MEASURE_HELP.entriesDominated.short },
      }),
      col.accessor("articulation", { header: MEASURE_HELP.articulation.label, cell: (i) => (i.getValue() ? <Badge tone="info">splits the graph</Badge> : null), meta: { help: MEASURE_HELP.articulation.short } }),
      col.accessor("inCycle", { header: "Cycle", cell: (i) => (i.getValue() ? <Badge tone="cycle">in a cycle</Badge> : null), meta: { help: MEASURE_HELP.inCycle.short } }),
      col.accessor((r) => r.dominatedAll, { id: "dominatedAll", header: "Dominates", cell: (i) => i.getValue() ?? "—", meta: { numeric: true, hidden: true, help: "Components every path from any entry point passes through it to reach" } }),
      col.display({ id: "trend", header: "Trend", cell: (i) => (i.row.original.trend ? <Sparkline points={i.row.original.trend} /> : <span className="text-xs text-faint">…</span>) }),
    ],
    [env, canDecide, rankedSort, offset],
  );
  const shownColumns = useMemo(() => (allMeasures ? columns : columns.filter((c) => !EXPERT_COLUMNS.has(c.id ?? ("accessorKey" in c ? String(c.accessorKey) : "")))), [columns, allMeasures]);

  const total = rankings.data?.total ?? 0;
  const error = rankings.error;
  const measures = rankings.data?.analysis.measures;
  const items = rankings.data?.items ?? [];
  const anyTie = items.some((i) => i.position.tied > 1);
  // Every component equal in the measure ranked by (an estate where nothing lies between two others):
  // all share rank 1, and the order shown is only by key.
  const allTied = items.length > 0 && items[0]!.position.rank === 1 && items[0]!.position.tied >= total && Object.keys(list.filters).length === 0;
  const rankByLabel = rankings.data ? (MEASURE_HELP[rankings.data.rankBy as keyof typeof MEASURE_HELP]?.label ?? rankings.data.rankBy) : "";

  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h1 className="text-2xl font-semibold tracking-tight">Pinch points</h1>
          <p className="mt-1 text-sm text-muted">
            Components whose failure takes the most of the estate with them, ranked by pinch score: what a failure takes down, weighed with how much runs through it.{" "}
            <Link href={`/environments/${env}/reviews#weights`} className="text-brass underline">
              Pinch-score weights
            </Link>
          </p>
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

      <DataTable
        id="pinch-points"
        testId="rankings-table"
        caption="Pinch-point ranking"
        columns={shownColumns}
        data={rows}
        rowKey={(r) => r.key}
        error={error}
        loading={rankings.isLoading || rankings.isValidating}
        paging={{ mode: "server", list, total: rankings.data?.total }}
        noun={["component", "components"]}
        empty="No component matches these filters."
        filters={
          <form role="search" aria-label="Filter the ranking" className="flex flex-wrap items-end gap-3" onSubmit={(e) => e.preventDefault()}>
            <ListSearch list={list} label="Search key or name" placeholder="e.g. session" />
            <ListSelect list={list} name="team" label="Team" all="All teams" options={teams} />
            <ListSelect list={list} name="tier" label="Tier" all="All tiers" options={[1, 2, 3, 4].map((t) => ({ value: String(t), label: `Tier ${t}` }))} />
            <ListSelect list={list} name="kind" label="Kind" all="All kinds" options={[...COMPONENT_KINDS, "undeclared"].map((k) => ({ value: k, label: k }))} />
            <CheckField label="All measures (PageRank, eigenvector, clustering)" checked={allMeasures} onChange={(e) => url.set({ measures: e.target.checked ? "all" : null })} />
            {Object.keys(list.filters).length > 0 && (
              <Button type="button" variant="ghost" onClick={list.clearFilters}>
                Clear filters
              </Button>
            )}
          </form>
        }
      />

      {anyTie && !allTied && (
        <p className="text-xs text-muted" data-testid="ties-note">
          Equal values share a rank (standard competition ranking: 1, 2, 2, 4); “=4” marks a rank shared with others. The # column ranks by {rankByLabel.toLowerCase()}.
        </p>
      )}
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
