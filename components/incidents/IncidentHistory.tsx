"use client";
// Every incident kept with its origin ranking, and beside the history: which components actually
// caused incidents next to the ones the measures rank highest.
import { createColumnHelper } from "@tanstack/react-table";
import Link from "next/link";
import { Badge } from "@/components/ui/Badge";
import { Card } from "@/components/ui/Card";
import { DataTable } from "@/components/ui/data-table/DataTable";
import { ListSelect } from "@/components/ui/data-table/filters";
import { useListState } from "@/components/ui/data-table/list-state";
import { pinchScore } from "@/components/ui/format";
import { When } from "@/components/ui/When";
import { INCIDENT_LIST, incidentHistoryResponseSchema, type IncidentRow } from "@/lib/api/schemas/incidents";
import { useApi } from "@/lib/client/api";
import { INCIDENT_REFRESH_MS } from "./refresh";

const col = createColumnHelper<IncidentRow>();

function duration(row: IncidentRow): string {
  const end = row.resolvedAt ? Date.parse(row.resolvedAt) : Date.now();
  const minutes = Math.max(0, Math.round((end - Date.parse(row.openedAt)) / 60_000));
  return minutes < 60 ? `${minutes} min` : `${Math.floor(minutes / 60)} h ${minutes % 60} min`;
}

function columns(env: string, link: (k: string) => React.ReactNode) {
  return [
    col.accessor("number", {
      header: "#",
      meta: { fixed: true },
      cell: (i) => (
        <Link href={`/environments/${env}/incidents/${i.getValue()}`} className="font-mono text-brass hover:underline">
          #{i.getValue()}
        </Link>
      ),
    }),
    col.accessor("openedAt", { header: "Opened", cell: (i) => <When at={i.getValue()} /> }),
    col.display({ id: "lasted", header: "Lasted", cell: (i) => (i.row.original.status === "open" ? <Badge tone="down">open, {duration(i.row.original)}</Badge> : duration(i.row.original)) }),
    col.accessor("peakFiring", { header: "Peak", meta: { numeric: true, help: "Most components firing at once" }, cell: (i) => `${i.getValue()} firing` }),
    col.accessor("alertCount", { header: "Alerts", meta: { numeric: true } }),
    col.display({
      id: "origin",
      header: "Probable origin",
      cell: (i) => {
        const r = i.row.original.ranking;
        const origin = r?.origins[0];
        if (!origin) return <span className="text-faint">none found</span>;
        return (
          <>
            {link(origin.key)} <span className="text-muted">explains {origin.explains} of {r.firing.length}</span>
            {r.origins.length > 1 && <span className="text-muted"> (+{r.origins.length - 1} more)</span>}
          </>
        );
      },
    }),
    col.display({ id: "snapshot", header: "Snapshot", cell: (i) => <span className="font-mono text-xs">{i.row.original.ranking?.snapshot ? `#${i.row.original.ranking.snapshot.number}` : "—"}</span> }),
    col.accessor("resolvedBy", { header: "Closed by", meta: { hidden: true }, cell: (i) => i.getValue() ?? <span className="text-faint">its alerts</span> }),
  ];
}

export function IncidentHistory({ env }: { env: string }) {
  const list = useListState(INCIDENT_LIST, { filters: ["status"], prefix: "history", pageSize: 25 });
  const history = useApi(incidentHistoryResponseSchema, `/api/v1/environments/${env}/incidents?${list.query}`, { refreshInterval: INCIDENT_REFRESH_MS, keepPreviousData: true });
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
                      {c.incidents} incident{c.incidents === 1 ? "" : "s"}, last <When at={c.lastAt} />
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
      <DataTable
        id="incident-history"
        caption="Incidents"
        columns={columns(env, link)}
        data={data?.items}
        rowKey={(i) => String(i.number)}
        error={history.error}
        paging={{ mode: "server", list, total: data?.total }}
        noun={["incident", "incidents"]}
        empty={list.filters.status ? "No incident with this status." : "No incident yet: one opens with the first alert and closes when the last one resolves."}
        filters={
          <ListSelect
            list={list}
            name="status"
            label="Status"
            all="Open and resolved"
            options={[
              { value: "open", label: "Open" },
              { value: "resolved", label: "Resolved" },
            ]}
          />
        }
      />
    </section>
  );
}
