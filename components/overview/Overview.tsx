"use client";

// Environment health at a glance: counts, the top pinch points, cycles, the last push and the
// analysis status — each linking to the screen that says more.
import Link from "next/link";
import { IncidentBanner } from "@/components/incidents/IncidentBanner";
import { Badge } from "@/components/ui/Badge";
import { Card, Stat } from "@/components/ui/Card";
import { When } from "@/components/ui/When";
import { ageOf, betweennessPct, percent, pinchScore, rankLabel } from "@/components/ui/format";
import { bootCyclesResponseSchema, rankingsResponseSchema, type RankingItem } from "@/lib/api/schemas/analysis";
import { environmentResponseSchema, environmentsResponseSchema } from "@/lib/api/schemas/environments";
import { healthResponseSchema, type HealthResponse } from "@/lib/api/schemas/health";
import { importsResponseSchema } from "@/lib/api/schemas/history";
import { useApi, type ApiError } from "@/lib/client/api";


/** Analyses run in a separate worker process: say so when none has been heard from for a minute. */
function WorkerNotice({ health }: { health: HealthResponse | undefined }) {
  const worker = health?.worker;
  if (!worker || worker.status === "ok") return null;
  const queued = health.queue?.analysisQueued ?? 0;
  return (
    <p role="alert" data-testid="worker-missing" className="rounded-md border border-degraded/50 bg-degraded/10 px-3 py-2 text-sm">
      {worker.status === "never" ? "No analysis worker has ever reported" : `No analysis worker has been seen for ${ageOf(worker.lastSeenAt ?? new Date().toISOString()).replace(/ ago$/, "")}`}
      {`: new snapshots wait to be analysed${queued ? ` (${queued} waiting)` : ""}, and rankings stay as they are. `}
      <span className="text-muted">npm start runs a worker and restarts it when it stops; elsewhere start one with npx tsx scripts/analysis-worker.ts.</span>
    </p>
  );
}

function TopList({ env, title, items, error, value }: { env: string; title: string; items: RankingItem[] | undefined; error: ApiError | undefined; value: (i: RankingItem) => string }) {
  return (
    <Card title={title} action={<Link className="text-xs text-brass hover:underline" href={`/environments/${env}/pinch-points`}>All pinch points</Link>}>
      {error && !items ? (
        <p role="alert" className="text-sm text-down">
          {error.status === 404 ? "No ranking yet: " : "Could not load the ranking: "}
          {error.message}
        </p>
      ) : !items ? (
        <p className="text-sm text-muted">Waiting for the first analysis…</p>
      ) : (
        <ol className="space-y-1.5">
          {items.map((i) => (
            <li key={i.key} className="flex items-center gap-2 text-sm">
              <span className="w-7 text-right font-mono text-xs text-faint" title={i.position.tied > 1 ? `shares this rank with ${i.position.tied - 1} other(s)` : undefined}>
                {rankLabel(i.position)}
              </span>
              <Link href={`/environments/${env}/components/${i.key}`} className="font-mono text-ink hover:text-brass">
                {i.key}
              </Link>
              {i.articulation && <Badge tone="info" title="Removing it splits the graph into disconnected parts">splits the graph</Badge>}
              {i.inCycle && <Badge tone="cycle">in a cycle</Badge>}
              <span className="ml-auto font-mono tabular-nums text-muted">{value(i)}</span>
              <Link href={`/environments/${env}/drills?fail=${i.key}`} className="text-xs text-faint hover:text-brass" aria-label={`Blast radius of ${i.key}`}>
                blast radius
              </Link>
            </li>
          ))}
        </ol>
      )}
    </Card>
  );
}

export function Overview({ env }: { env: string }) {
  const refresh = { refreshInterval: 15_000 };
  // One light request for the counts and the latest snapshot; the full list only to suggest names.
  const environment = useApi(environmentResponseSchema, `/api/v1/environments/${env}`, refresh);
  const missing = environment.error?.status === 404;
  const environments = useApi(environmentsResponseSchema, missing ? "/api/v1/environments" : null);
  const byPinch = useApi(rankingsResponseSchema, `/api/v1/environments/${env}/rankings?sort=pinchScore&limit=5`, refresh);
  const byBetweenness = useApi(rankingsResponseSchema, `/api/v1/environments/${env}/rankings?sort=betweenness&limit=5`, refresh);
  const boot = useApi(bootCyclesResponseSchema, `/api/v1/environments/${env}/boot-order?stages=false`, refresh);
  const imports = useApi(importsResponseSchema, `/api/v1/environments/${env}/imports?limit=1`, refresh);
  const health = useApi(healthResponseSchema, "/api/health", refresh);
  const summary = environment.data;
  const counts = summary?.counts;
  const ranked = byPinch.data;

  if (missing) {
    const known = environments.data?.items ?? [];
    return (
      <Card title={`No environment called “${env}”`}>
        <p className="text-muted">
          Nothing has been pushed to <span className="font-mono text-ink">{env}</span>. Check the spelling; an admin creates a new environment with its first push.
        </p>
        {known.length > 0 && (
          <p className="mt-2 text-sm text-muted">
            Environments that exist:{" "}
            {known.map((e, n) => (
              <span key={e.slug}>
                {n > 0 && ", "}
                <Link href={`/environments/${e.slug}`} className="font-mono text-brass hover:underline">
                  {e.slug}
                </Link>
              </span>
            ))}
          </p>
        )}
      </Card>
    );
  }

  const lastPush = imports.data?.items[0];
  const cycles = boot.data?.cycles ?? [];
  return (
    <div className="space-y-6">
      <IncidentBanner env={env} />
      <div>
        <h1 className="text-2xl font-semibold tracking-tight">
          <span className="font-mono">{env}</span> at a glance
        </h1>
        <p className="mt-1 text-sm text-muted" data-testid="snapshot-line">
          {summary?.latestSnapshot ? (
            <>
              Snapshot #{summary.latestSnapshot.number}, pushed <When at={summary.latestSnapshot.createdAt} />
            </>
          ) : environment.isLoading ? (
            "Loading…"
          ) : (
            "No snapshot yet"
          )}
          {summary?.analysis && ` · analysis ${summary.analysis.status}${summary.analysis.status === "running" ? ` (${Math.round(summary.analysis.progress * 100)}%)` : ""}`}
          {lastPush && (
            <>
              {` · last push by ${lastPush.actor} from ${lastPush.source}, `}
              <When at={lastPush.createdAt} />
              {lastPush.changed ? "" : " (no change)"}
            </>
          )}
        </p>
        {ranked?.latest && (
          <p className="mt-1 text-sm text-degraded" role="status">
            Rankings below are from snapshot #{ranked.snapshot.number}; snapshot #{ranked.latest.number} is {ranked.latest.status}
            {ranked.latest.status === "running" ? ` (${Math.round(ranked.latest.progress * 100)}%, ${ranked.latest.phase})` : ""}.
          </p>
        )}
      </div>
      <WorkerNotice health={health.data} />
      {environment.error && !missing && (
        <p role="alert" className="rounded-md border border-down/50 bg-down/10 px-3 py-2 text-sm">
          Could not load this environment: {environment.error.message}
        </p>
      )}
      <div className="grid grid-cols-2 gap-3 md:grid-cols-5" aria-busy={environment.isLoading}>
        <Stat label="Components" value={counts?.components ?? "—"} hint={counts ? `${counts.dependencies} dependencies` : undefined} />
        <Stat label="Teams" value={counts?.teams ?? "—"} hint="owning at least one component" />
        <Link href={`/teams?unowned_environment=${env}#unowned`} className="rounded-lg hover:ring-1 hover:ring-brass" data-testid="unowned-tile">
          <Stat label="Unowned" value={counts?.unowned ?? "—"} tone={counts && counts.unowned > 0 ? "degraded" : "ink"} hint={<>declared with no team: nobody to page. <span className="text-brass underline">Claim them</span></>} />
        </Link>
        <Stat label="Undeclared" value={counts?.undeclared ?? "—"} tone={counts && counts.undeclared > 0 ? "degraded" : "ink"} hint="needed by something, declared by no source" />
        <Stat label="Cycles" value={boot.data ? cycles.length : "—"} tone={cycles.length ? "down" : "ink"} hint="cannot cold-start unaided" />
      </div>
      <div className="grid gap-4 lg:grid-cols-2">
        <TopList env={env} title="Top 5 by pinch score" items={ranked?.items} error={byPinch.error} value={(i) => pinchScore(i.pinchScore)} />
        <TopList env={env} title="Top 5 by betweenness (most paths through it)" items={byBetweenness.data?.items} error={byBetweenness.error} value={(i) => betweennessPct(i.betweenness)} />
      </div>
      {cycles.length > 0 && (
        <Card title="Dependency cycles" action={<Link className="text-xs text-brass hover:underline" href={`/environments/${env}/boot-order`}>Cold start</Link>}>
          <ul className="space-y-1 text-sm">
            {cycles.slice(0, 10).map(({ members: c }) => (
              <li key={c.join(">")} className="font-mono">
                {c.length === 2 ? c.join(" ⇄ ") : c.length <= 6 ? `${c.length} components: ${c.join(", ")}` : `${c.length} components: ${c.slice(0, 5).join(", ")}, …`}
              </li>
            ))}
            {cycles.length > 10 && <li className="text-muted">and {cycles.length - 10} more</li>}
          </ul>
          <p className="mt-2 text-xs text-muted">Each member waits on another: after a full outage none of them can start without manual help. The cold-start screen says which needs to break first.</p>
        </Card>
      )}
      <p className="text-xs text-muted">
        Pinchpoint knows only what the inventory declares: rankings and drills are as good as the files pushed to it
        {ranked ? `, and ${percent(ranked.snapshot.undeclaredShare)} of these components are undeclared (needed by something, declared by no source)` : ""}. A drill is not a guarantee;
        changes to production follow your own change and incident processes.
      </p>
    </div>
  );
}
