"use client";
// One incident as history keeps it: its alerts with their lifetimes and the origin ranking from
// when the most components fired.
import Link from "next/link";
import type { ReactNode } from "react";
import useSWR from "swr";
import { Badge } from "@/components/ui/Badge";
import { Card, Stat } from "@/components/ui/Card";
import { Notice } from "@/components/ui/Notice";
import { dateTime, safeHref } from "@/components/ui/format";
import { fetchJson, type ApiError } from "@/lib/client/fetcher";
import type { IncidentDetailResponse } from "@/lib/incidents/types";
import { lift } from "@/lib/incidents/view";

export function IncidentDetail({ env, number }: { env: string; number: number }) {
  const detail = useSWR<IncidentDetailResponse, ApiError>(`/api/v1/environments/${env}/incidents/${number}`, fetchJson, { refreshInterval: 30_000 });
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
            Opened {dateTime(d.incident.openedAt)} · {d.incident.resolvedAt ? `resolved ${dateTime(d.incident.resolvedAt)}${d.incident.resolvedBy ? ` (${d.incident.resolvedBy})` : ""}` : "still open"}
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
                    Computed {dateTime(r.computedAt)} on snapshot {r.snapshot ? `#${r.snapshot.number} (pushed ${dateTime(r.snapshot.createdAt)})` : "none"}.
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
            <div className="overflow-x-auto">
              <table className="w-full text-left text-sm" data-testid="incident-alerts">
                <thead className="text-xs uppercase tracking-wide text-faint">
                  <tr>
                    <th className="py-2 pr-4 font-medium">Component</th>
                    <th className="py-2 pr-4 font-medium">Alert</th>
                    <th className="py-2 pr-4 font-medium">Severity</th>
                    <th className="py-2 pr-4 font-medium">Started</th>
                    <th className="py-2 pr-4 font-medium">Ended</th>
                  </tr>
                </thead>
                <tbody className="divide-y divide-line">
                  {d.alerts.map((a) => {
                    const href = a.link ? safeHref(a.link) : null;
                    return (
                      <tr key={a.id}>
                        <td className="py-1.5 pr-4">{a.component ? link(a.component) : <Badge tone="degraded">unknown: {a.named?.value ?? "no label"}</Badge>}</td>
                        <td className="py-1.5 pr-4">{href ? <a href={href} className="text-info hover:underline" target="_blank" rel="noreferrer">{a.name ?? a.summary ?? a.fingerprint}</a> : (a.name ?? a.summary ?? a.fingerprint)}</td>
                        <td className="py-1.5 pr-4">{a.severity ?? "—"}</td>
                        <td className="py-1.5 pr-4 font-mono text-xs">{dateTime(a.startsAt)}</td>
                        <td className="py-1.5 pr-4 font-mono text-xs">{a.endsAt ? dateTime(a.endsAt) : <Badge tone="down">firing</Badge>}</td>
                      </tr>
                    );
                  })}
                </tbody>
              </table>
            </div>
          </Card>
        </>
      )}
    </div>
  );
}
