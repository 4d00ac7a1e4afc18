"use client";
// Every incident kept with its origin ranking, and beside the history: which components actually
// caused incidents next to the ones the measures rank highest.
import Link from "next/link";
import { useState } from "react";
import useSWR from "swr";
import { Badge } from "@/components/ui/Badge";
import { Button } from "@/components/ui/Button";
import { Card } from "@/components/ui/Card";
import { dateTime, pinchScore } from "@/components/ui/format";
import { fetchJson, type ApiError } from "@/lib/client/fetcher";
import type { IncidentHistoryResponse, IncidentRow } from "@/lib/incidents/types";
import { INCIDENT_REFRESH_MS } from "./refresh";

const PAGE = 20;

function duration(row: IncidentRow): string {
  const end = row.resolvedAt ? Date.parse(row.resolvedAt) : Date.now();
  const minutes = Math.max(0, Math.round((end - Date.parse(row.openedAt)) / 60_000));
  return minutes < 60 ? `${minutes} min` : `${Math.floor(minutes / 60)} h ${minutes % 60} min`;
}

export function IncidentHistory({ env }: { env: string }) {
  const [offset, setOffset] = useState(0);
  const history = useSWR<IncidentHistoryResponse, ApiError>(`/api/v1/environments/${env}/incidents?limit=${PAGE}&offset=${offset}`, fetchJson, { refreshInterval: INCIDENT_REFRESH_MS, keepPreviousData: true });
  const data = history.data;
  const link = (k: string) => (
    <Link href={`/environments/${env}/components/${encodeURIComponent(k)}`} className="font-mono text-ink hover:text-brass">
      {k}
    </Link>
  );
  return (
    <section className="space-y-4" aria-labelledby="incident-history">
      <h2 id="incident-history" className="pt-2 text-lg font-semibold">
        History
      </h2>
      {history.error && <p role="alert" className="text-sm text-down">Could not load the history: {history.error.message}</p>}
      {data && data.causes.length + data.predicted.length > 0 && (
        <div className="grid gap-4 lg:grid-cols-2">
          <Card title="What caused incidents">
            <p className="mb-2 text-xs text-muted">The first probable origin of each incident, at its peak, with the component&apos;s rank among today&apos;s pinch points (betweenness first, as on the pinch-points screen).</p>
            {data.causes.length === 0 ? (
              <p className="text-sm text-muted">No incident had a probable origin yet.</p>
            ) : (
              <ol className="space-y-1 text-sm" data-testid="causes">
                {data.causes.map((c) => (
                  <li key={c.key} className="flex items-center gap-2">
                    {link(c.key)}
                    <span className="text-muted">
                      {c.incidents} incident{c.incidents === 1 ? "" : "s"}, last {dateTime(c.lastAt)}
                    </span>
                    <span className="ml-auto">
                      {c.pinchRank !== null ? <Badge tone={c.pinchRank <= 10 ? "info" : "muted"}>rank {c.pinchRank}</Badge> : <Badge tone="degraded">not in today&apos;s ranking</Badge>}
                    </span>
                  </li>
                ))}
              </ol>
            )}
          </Card>
          <Card title="What the measures predict">
            <p className="mb-2 text-xs text-muted">The top ten of the pinch-point ranking (betweenness first), and how many incidents each was the probable origin of.</p>
            <ol className="space-y-1 text-sm" data-testid="predicted-pinch-points">
              {data.predicted.map((p) => (
                <li key={p.key} className="flex items-center gap-2">
                  <span className="w-5 text-right font-mono text-xs text-faint">{p.pinchRank}</span>
                  {link(p.key)}
                  <span className="font-mono text-xs text-muted">pinch score {pinchScore(p.pinchScore)}</span>
                  <span className="ml-auto">{p.incidents > 0 ? <Badge tone="down">caused {p.incidents}</Badge> : <span className="text-xs text-faint">no incident</span>}</span>
                </li>
              ))}
            </ol>
          </Card>
        </div>
      )}
      <Card title="Incidents" action={data && data.total > 0 ? <span className="text-xs text-muted">{offset + 1}–{Math.min(offset + PAGE, data.total)} of {data.total}</span> : undefined}>
        {!data ? (
          <p className="text-sm text-muted">Loading…</p>
        ) : data.items.length === 0 ? (
          <p className="text-sm text-muted">No incident yet: one opens with the first alert and closes when the last one resolves.</p>
        ) : (
          <div className="overflow-x-auto">
            <table className="w-full text-left text-sm" data-testid="incident-history">
              <thead className="text-xs uppercase tracking-wide text-faint">
                <tr>
                  <th className="py-2 pr-4 font-medium">#</th>
                  <th className="py-2 pr-4 font-medium">Opened</th>
                  <th className="py-2 pr-4 font-medium">Lasted</th>
                  <th className="py-2 pr-4 font-medium">Peak</th>
                  <th className="py-2 pr-4 font-medium">Probable origin</th>
                  <th className="py-2 pr-4 font-medium">Snapshot</th>
                </tr>
              </thead>
              <tbody className="divide-y divide-line">
                {data.items.map((i) => {
                  const origin = i.ranking?.origins[0];
                  const firing = i.ranking?.firing.length ?? 0;
                  return (
                    <tr key={i.number}>
                      <td className="py-1.5 pr-4">
                        <Link href={`/environments/${env}/incidents/${i.number}`} className="font-mono text-brass hover:underline">
                          #{i.number}
                        </Link>
                      </td>
                      <td className="py-1.5 pr-4 font-mono text-xs">{dateTime(i.openedAt)}</td>
                      <td className="py-1.5 pr-4">{i.status === "open" ? <Badge tone="down">open, {duration(i)}</Badge> : duration(i)}</td>
                      <td className="py-1.5 pr-4">{i.peakFiring} firing</td>
                      <td className="py-1.5 pr-4">
                        {origin ? (
                          <>
                            {link(origin.key)} <span className="text-muted">explains {origin.explains} of {firing}</span>
                            {(i.ranking?.origins.length ?? 0) > 1 && <span className="text-muted"> (+{(i.ranking?.origins.length ?? 1) - 1} more)</span>}
                          </>
                        ) : (
                          <span className="text-faint">none found</span>
                        )}
                      </td>
                      <td className="py-1.5 pr-4 font-mono text-xs">{i.ranking?.snapshot ? `#${i.ranking.snapshot.number}` : "—"}</td>
                    </tr>
                  );
                })}
              </tbody>
            </table>
          </div>
        )}
        {data && data.total > PAGE && (
          <div className="mt-3 flex gap-2">
            <Button type="button" disabled={offset === 0} onClick={() => setOffset(Math.max(0, offset - PAGE))}>
              Newer
            </Button>
            <Button type="button" disabled={offset + PAGE >= data.total} onClick={() => setOffset(offset + PAGE)}>
              Older
            </Button>
          </div>
        )}
      </Card>
    </section>
  );
}
