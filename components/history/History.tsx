"use client";
// Snapshots newest first; pick any two to compare (?from=&to= in the URL); the top ranks over time.
import Link from "next/link";
import type { ReactNode } from "react";
import useSWR from "swr";
import type { RankTrendResponse } from "@/components/rankings/api-types";
import { Badge } from "@/components/ui/Badge";
import { Card } from "@/components/ui/Card";
import { dateTime, ageOf } from "@/components/ui/format";
import { Notice } from "@/components/ui/Notice";
import { useUrlState } from "@/components/ui/url-state";
import { fetchJson, type ApiError } from "@/lib/client/fetcher";
import type { SnapshotListItem } from "@/lib/data/snapshots";
import type { SnapshotDiff } from "@/lib/inventory/snapshot";
import { dependencyChangeLine, dependencyLine, fieldChanges } from "./diff-lines";
import { RankChart } from "./RankChart";

interface SnapshotsResponse {
  total: number;
  items: SnapshotListItem[];
}
type DiffResponse = SnapshotDiff & { from: number; to: number };

const STATUS_TONE = { done: "ok", running: "info", queued: "muted", failed: "down" } as const;

export function History({ env }: { env: string }) {
  const url = useUrlState();
  const snapshots = useSWR<SnapshotsResponse, ApiError>(`/api/v1/environments/${env}/snapshots?limit=100`, fetchJson, { refreshInterval: 15_000 });
  const trend = useSWR<RankTrendResponse, ApiError>(`/api/v1/environments/${env}/rankings/history?top=8&count=30`, fetchJson);
  const items = snapshots.data?.items ?? [];
  // ?snapshot=N (linked from the import history) shows what that snapshot changed: N−1 → N.
  const single = Number(url.get("snapshot") ?? 0);
  const from = Number(url.get("from") ?? (single ? single - 1 : (items[1]?.number ?? 0)));
  const to = Number(url.get("to") ?? (single || (items[0]?.number ?? 0)));
  const canDiff = from > 0 && to > 0 && from !== to;
  const diff = useSWR<DiffResponse, ApiError>(canDiff ? `/api/v1/environments/${env}/snapshots/${from}/diff/${to}` : null, fetchJson);

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
      {snapshots.data && items.length === 0 && <Notice title="No snapshot yet">Nothing has been pushed to this environment. The first push makes snapshot #1.</Notice>}

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
          <div className="max-h-[32rem] overflow-auto">
            <table className="w-full text-sm" data-testid="snapshots-table">
              <caption className="sr-only">Snapshots, newest first; choose the two to compare in the From and To columns</caption>
              <thead className="sticky top-0 bg-surface text-left text-xs text-muted">
                <tr>
                  <th scope="col" className="px-1.5 py-1.5 font-medium">From</th>
                  <th scope="col" className="px-1.5 py-1.5 font-medium">To</th>
                  <th scope="col" className="px-1.5 py-1.5 font-medium">#</th>
                  <th scope="col" className="px-1.5 py-1.5 font-medium">When</th>
                  <th scope="col" className="px-1.5 py-1.5 font-medium">Who · source · format</th>
                  <th scope="col" className="px-1.5 py-1.5 text-right font-medium">Components</th>
                  <th scope="col" className="px-1.5 py-1.5 text-right font-medium">Deps</th>
                  <th scope="col" className="px-1.5 py-1.5 font-medium">Analysis</th>
                </tr>
              </thead>
              <tbody>
                {items.map((s) => (
                  <tr key={s.id} className={`border-t border-line/60 ${s.number === from || s.number === to ? "bg-raised/70" : ""}`}>
                    <td className="px-1.5 py-1">
                      <input type="radio" name="diff-from" aria-label={`Compare from snapshot #${s.number}`} checked={s.number === from} onChange={() => url.set({ from: String(s.number), to: String(to) })} className="accent-[var(--color-brass)]" />
                    </td>
                    <td className="px-1.5 py-1">
                      <input type="radio" name="diff-to" aria-label={`Compare to snapshot #${s.number}`} checked={s.number === to} onChange={() => url.set({ to: String(s.number), from: String(from) })} className="accent-[var(--color-brass)]" />
                    </td>
                    <td className="px-1.5 py-1 font-mono">#{s.number}</td>
                    <td className="px-1.5 py-1 whitespace-nowrap text-muted" title={dateTime(s.createdAt)}>{ageOf(s.createdAt)}</td>
                    <td className="px-1.5 py-1 text-xs text-muted">
                      {s.actor ?? "unknown"} · <span className="font-mono">{s.source ?? "—"}</span> · {s.format ?? "—"}
                    </td>
                    <td className="px-1.5 py-1 text-right font-mono tabular-nums">
                      {s.components}
                      {s.undeclared > 0 && <span className="text-xs text-muted" title="needed by something, declared by no source"> ({s.undeclared} undeclared)</span>}
                    </td>
                    <td className="px-1.5 py-1 text-right font-mono tabular-nums">{s.dependencies}</td>
                    <td className="px-1.5 py-1">
                      <Badge tone={s.analysis && s.analysis in STATUS_TONE ? STATUS_TONE[s.analysis as keyof typeof STATUS_TONE] : "muted"}>{s.analysis ?? "not queued"}</Badge>
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
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
        <ul className="max-h-48 space-y-0.5 overflow-auto">
          {diff.componentsAdded.map((c) => (
            <li key={c.key}>
              + {link(c.key)} <span className="text-xs text-muted">{c.kind === "undeclared" ? "undeclared" : `${c.kind}, ${c.team ?? "unowned"}, tier ${c.tier}`}</span>
            </li>
          ))}
        </ul>
      </Section>
      <Section title="Components removed" count={diff.componentsRemoved.length} tone="text-down">
        <ul className="max-h-48 space-y-0.5 overflow-auto">
          {diff.componentsRemoved.map((c) => (
            <li key={c.key}>
              − <span className="font-mono">{c.key}</span> <span className="text-xs text-muted">{c.kind}, {c.team ?? "unowned"}</span>
            </li>
          ))}
        </ul>
      </Section>
      <Section title="Components changed" count={diff.componentsChanged.length} tone="text-info">
        <ul className="max-h-48 space-y-1 overflow-auto">
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
          <ul className="max-h-48 space-y-0.5 overflow-auto font-mono text-xs text-muted">
            {lines.map((l) => (
              <li key={l}>{l}</li>
            ))}
          </ul>
        </Section>
      ))}
    </div>
  );
}
