"use client";
// One incident as history keeps it: its alerts with their lifetimes and the origin ranking from
// when the most components fired.
import Link from "next/link";
import type { ReactNode } from "react";
import { Badge } from "@/components/ui/Badge";
import { Card, Stat } from "@/components/ui/Card";
import { Notice } from "@/components/ui/Notice";
import { When } from "@/components/ui/When";
import { incidentDetailResponseSchema } from "@/lib/api/schemas/incidents";
import { useApi } from "@/lib/client/api";
import { lift } from "@/lib/incidents/view";
import { AlertsTable } from "./AlertsTable";

export function IncidentDetail({ env, number }: { env: string; number: number }) {
  const detail = useApi(incidentDetailResponseSchema, `/api/v1/environments/${env}/incidents/${number}`, { refreshInterval: 30_000 });
  const d = detail.data;
  const r = d?.incident.ranking;
  const link = (k: string) => (
    <Link key={k} href={`/environments/${env}/components/${encodeURIComponent(k)}`} className="font-mono text-ink hover:text-brass">
      {k}
    </Link>
  );
  return (
    <div className="space-y-4">
      <div>
        <p className="text-sm">
          <Link href={`/environments/${env}/incidents`} className="text-brass hover:underline">
            ← Incidents
          </Link>
        </p>
        <h1 className="text-2xl font-semibold tracking-tight">Incident #{number}</h1>
        {d && (
          <p className="mt-1 text-sm text-muted" data-testid="incident-times">
            Opened <When at={d.incident.openedAt} /> ·{" "}
            {d.incident.resolvedAt ? (
              <>
                resolved <When at={d.incident.resolvedAt} />
                {d.incident.resolvedBy ? ` (${d.incident.resolvedBy})` : ""}
              </>
            ) : (
              "still open"
            )}
          </p>
        )}
      </div>
      <Notice tone="caution" title="A probability, not a diagnosis">
        {d?.caution ?? "The probable origin is a probability read from the declared dependency graph, not a diagnosis."}
      </Notice>
      {detail.error && (
        <Notice tone="error" title={detail.error.status === 404 ? "No such incident" : "Could not load the incident"}>
          {detail.error.message}
        </Notice>
      )}
      {d && (
        <>
          {d.incident.status === "open" && (
            <Notice title="This incident is still open">
              The live screen follows it: <Link href={`/environments/${env}/incidents`} className="text-brass hover:underline">Incidents</Link>.
            </Notice>
          )}
          <div className="grid grid-cols-2 gap-3 md:grid-cols-4">
            <Stat label="Alerts" value={d.incident.alertCount} />
            <Stat label="Peak firing" value={d.incident.peakFiring} hint="components at once" />
            <Stat label="Explained" value={r ? `${r.explainedCount} of ${r.firing.length}` : "—"} hint="by the probable origin(s) at the peak" />
            <Stat label="Predicted down" value={r?.predicted.down ?? "—"} hint="beyond what fired" />
          </div>
          {r && (
            <div className="grid gap-4 lg:grid-cols-2">
              <Card title="Origin ranking at the peak">
                <div className="space-y-2 text-sm" data-testid="stored-ranking">
                  <p className="text-xs text-muted">
                    Computed <When at={r.computedAt} /> on snapshot{" "}
                    {r.snapshot ? (
                      <>
                        #{r.snapshot.number} (pushed <When at={r.snapshot.createdAt} />)
                      </>
                    ) : (
                      "none"
                    )}
                    .
                  </p>
                  {r.origins.length === 0 && <p className="text-muted">No firing component&apos;s failure explained another one.</p>}
                  <ol className="space-y-1">
                    {r.origins.map((o) => (
                      <li key={o.key}>
                        {link(o.key)} <span className="text-muted">explains {o.explains} of {r.firing.length}{o.degraded ? ` (${o.degraded} only as degraded)` : ""}</span>
                      </li>
                    ))}
                  </ol>
                  {r.unexplained.length > 0 && <p className="text-muted">Not explained by anything firing: {r.unexplained.map(link).reduce<ReactNode[]>((a, x, i) => (i ? [...a, ", ", x] : [x]), [])}</p>}
                  {r.silent.length > 0 && (
                    <p className="text-muted">
                      Silent suspects: {r.silent.map((s) => `${s.kind === "zone" ? "zone " : ""}${s.key} (explains ${s.explains})`).join(", ")}
                    </p>
                  )}
                  {r.unknownAlerts.length > 0 && <p className="text-degraded">Alerts naming no known component: {r.unknownAlerts.map((u) => `${u.value ?? "no component label"} (${u.alerts})`).join(", ")}</p>}
                </div>
              </Card>
              <Card title="Walk along needs at the peak (personalised PageRank)">
                <ol className="space-y-1 text-sm">
                  {r.pagerank.map((p) => (
                    <li key={p.key} className="flex items-center gap-2">
                      {link(p.key)}
                      {!p.firing && <Badge tone="info">not alerting</Badge>}
                      <span className="ml-auto font-mono text-xs text-faint">{p.usual > 0 ? `${lift(p)} usual` : ""}</span>
                      <span className="w-14 text-right font-mono tabular-nums text-muted">{p.score.toFixed(3)}</span>
                    </li>
                  ))}
                </ol>
              </Card>
            </div>
          )}
          <Card title="Alerts and their lifetimes">
            <AlertsTable env={env} alerts={d.alerts} show="history" />
          </Card>
        </>
      )}
    </div>
  );
}
