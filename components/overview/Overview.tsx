"use client";

import useSWR from "swr";
import { Card, Stat } from "@/components/ui/Card";
import { fetchJson, type ApiError } from "@/lib/client/fetcher";
import type { EnvironmentCounts } from "@/lib/data/components";
import type { EnvironmentSummary } from "@/lib/data/environments";

interface ComponentsResponse {
  environment: string;
  counts: EnvironmentCounts;
}

function age(iso: string): string {
  const minutes = Math.round((Date.now() - new Date(iso).getTime()) / 60_000);
  if (minutes < 1) return "just now";
  if (minutes < 60) return `${minutes} min ago`;
  const hours = Math.round(minutes / 60);
  if (hours < 48) return `${hours} h ago`;
  return `${Math.round(hours / 24)} days ago`;
}

export function Overview({ env }: { env: string }) {
  const components = useSWR<ComponentsResponse, ApiError>(`/api/v1/environments/${env}/components`, fetchJson, {
    refreshInterval: 30_000,
  });
  const environments = useSWR<{ items: EnvironmentSummary[] }, ApiError>("/api/v1/environments", fetchJson, {
    refreshInterval: 30_000,
  });
  const summary = environments.data?.items.find((e) => e.slug === env);
  const counts = components.data?.counts;

  if (components.error?.status === 404) {
    return (
      <Card title="No such environment">
        <p className="text-muted">
          Nothing has been pushed to <span className="font-mono text-ink">{env}</span> yet. An admin creates it with its first push.
        </p>
      </Card>
    );
  }

  return (
    <div className="space-y-6">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h1 className="text-2xl font-semibold tracking-tight">
            <span className="font-mono">{env}</span> at a glance
          </h1>
          <p className="mt-1 text-sm text-muted" data-testid="snapshot-line">
            {summary?.latestSnapshot
              ? `Snapshot #${summary.latestSnapshot.number}, pushed ${age(summary.latestSnapshot.createdAt)}`
              : environments.isLoading
                ? "Loading…"
                : "No snapshot yet"}
            {summary?.analysis && ` · analysis ${summary.analysis.status}`}
          </p>
        </div>
      </div>
      {components.error && components.error.status !== 404 && (
        <p role="alert" className="rounded-md border border-down/50 bg-down/10 px-3 py-2 text-sm">
          Could not load the components: {components.error.message}
        </p>
      )}
      <div className="grid grid-cols-2 gap-3 md:grid-cols-4" aria-busy={components.isLoading}>
        <Stat label="Components" value={counts?.components ?? "—"} hint={counts ? `${counts.dependencies} dependencies` : undefined} />
        <Stat label="Teams" value={counts?.teams ?? "—"} hint="owning at least one component" />
        <Stat
          label="Unowned"
          value={counts?.unowned ?? "—"}
          tone={counts && counts.unowned > 0 ? "degraded" : "ink"}
          hint="declared with no team: nobody to page"
        />
        <Stat
          label="Undeclared"
          value={counts?.undeclared ?? "—"}
          tone={counts && counts.undeclared > 0 ? "degraded" : "ink"}
          hint="needed by something, declared by no source"
        />
      </div>
      <p className="text-xs text-faint">
        Pinchpoint knows only what the inventory declares: rankings and drills are as good as the files pushed to it.
      </p>
    </div>
  );
}
