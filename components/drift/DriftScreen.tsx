"use client";
// Drift: traced calls against declared needs. Two lists, each an action for someone: a call
// nobody declared belongs in the calling component's file; a declared need no trace shows is
// worth a second look, never an automatic removal.
import { createColumnHelper } from "@tanstack/react-table";
import Link from "next/link";
import { useState, type ReactNode } from "react";
import { Badge } from "@/components/ui/Badge";
import { Card, Stat } from "@/components/ui/Card";
import { DataTable, type Columns } from "@/components/ui/data-table/DataTable";
import { ListSearch } from "@/components/ui/data-table/filters";
import { useListState, type ListState } from "@/components/ui/data-table/list-state";
import { dateTime, plural, trafficLine } from "@/components/ui/format";
import { Notice } from "@/components/ui/Notice";
import { When } from "@/components/ui/When";
import { DRIFT_DECLARED_LIST, DRIFT_SEEN_LIST, driftResponseSchema, type AliasProposal, type DeclaredNotSeen, type DriftResponse, type SeenNotDeclared } from "@/lib/api/schemas/drift";
import { useApi } from "@/lib/client/api";

function ComponentRef({ env, componentKey, known }: { env: string; componentKey: string; known: boolean }) {
  // Every traced name is a component of the graph (known only from traces until a file declares it), so it has a page.
  return (
    <span className="inline-flex items-center gap-1.5">
      <Link href={`/environments/${env}/components/${encodeURIComponent(componentKey)}`} className="font-mono text-ink underline decoration-line underline-offset-2 hover:decoration-brass">
        {componentKey}
      </Link>
      {!known && (
        <Badge tone="undeclared" title="No inventory file declares a component with this key or alias; only traces know of it">
          not in any file
        </Badge>
      )}
    </span>
  );
}

function Edge({ env, from, to, fromKnown = true, toKnown = true }: { env: string; from: string; to: string; fromKnown?: boolean; toKnown?: boolean }) {
  return (
    <span className="inline-flex items-center gap-1.5 whitespace-nowrap">
      <ComponentRef env={env} componentKey={from} known={fromKnown} />
      <span aria-label="needs" className="text-faint">→</span>
      <ComponentRef env={env} componentKey={to} known={toKnown} />
    </span>
  );
}

function DeclareHint({ row }: { row: SeenNotDeclared }) {
  const lines: ReactNode[] = [];
  if (row.declareIn) {
    lines.push(
      <span key="in">
        Add <code className="font-mono text-ink">needs: [{row.to}]</code> to <span className="font-mono text-ink">{row.from}</span> in source{" "}
        <span className="font-mono text-ink">{row.declareIn.source}</span>
        {row.declareIn.team ? (
          <>
            {" "}
            (team <span className="font-mono text-ink">{row.declareIn.team}</span>)
          </>
        ) : (
          " (no team declared)"
        )}
      </span>,
    );
  } else {
    lines.push(
      <span key="in">
        No source declares <span className="font-mono text-ink">{row.from}</span>: whoever runs it should add it to their file, with this need.
      </span>,
    );
  }
  if (!row.toKnown) {
    lines.push(
      <span key="to" className="block">
        <span className="font-mono text-ink">{row.to}</span> matches no component key or alias{row.evidence.some((e) => e === "server.address" || e === "url.full" || e === "net.peer.name") ? " (named after a host address: if a declared component answers there, list the name in its aliases)" : ""}.
      </span>,
    );
  }
  if (row.tracedAs.length > 0) {
    lines.push(
      <span key="as" className="block">
        Traced as <span className="font-mono text-ink">{row.tracedAs.join(", ")}</span> (resolved through aliases).
      </span>,
    );
  }
  return <div className="space-y-0.5 text-xs text-muted">{lines}</div>;
}

/** One click: the format 1 snippet for the file that should hold the need (or the alias), ready to copy. */
function SnippetButton({ snippet, label, testId }: { snippet: string; label: string; testId: string }) {
  const [open, setOpen] = useState(false);
  const [copied, setCopied] = useState(false);
  const copy = async () => {
    try {
      await navigator.clipboard.writeText(snippet);
      setCopied(true);
    } catch {
      setCopied(false);
    }
  };
  return (
    <div className="mt-1.5">
      <button
        type="button"
        className="rounded-md border border-line bg-raised px-2 py-0.5 text-xs text-ink hover:border-brass"
        aria-expanded={open}
        onClick={() => {
          setOpen((v) => !v);
          if (!open) void copy();
        }}
        data-testid={testId}
      >
        {label}
      </button>
      {open && (
        <div className="mt-1.5 space-y-1">
          <pre tabIndex={0} className="max-w-xl overflow-x-auto rounded-md border border-line bg-raised px-2 py-1.5 font-mono text-xs text-ink" data-testid={`${testId}-snippet`}>
            {snippet}
          </pre>
          <p className="text-xs text-faint" role="status">
            {copied ? "Copied. " : ""}Paste it into the team&apos;s inventory file and push it the usual way (CI or Imports).
          </p>
        </div>
      )}
    </div>
  );
}

const ms = (v: number | null): string => (v === null ? "—" : v < 10 ? v.toFixed(1) : Math.round(v).toLocaleString());

const seenCol = createColumnHelper<SeenNotDeclared>();

function seenColumns(env: string) {
  return [
    seenCol.accessor("from", {
      header: "Caller → called",
      meta: { fixed: true },
      cell: (i) => <Edge env={env} from={i.row.original.from} to={i.row.original.to} fromKnown={i.row.original.fromKnown} toKnown={i.row.original.toKnown} />,
    }),
    seenCol.accessor("to", { header: "Called", meta: { hidden: true, className: "font-mono" } }),
    seenCol.accessor("calls", {
      header: "Traffic",
      meta: { numeric: true, help: "Calls over the trace window, and calls per minute since the window opened or the call was first seen" },
      cell: (i) => (
        <span data-testid="drift-traffic">
          <span className="block text-ink">{i.getValue().toLocaleString()}</span>
          <span className={`block text-xs ${i.row.original.errorRate >= 0.01 ? "text-degraded" : "text-muted"}`}>{trafficLine(i.row.original)}</span>
        </span>
      ),
    }),
    seenCol.accessor("errorRate", { header: "Errors", meta: { numeric: true, hidden: true }, cell: (i) => `${(i.getValue() * 100).toFixed(1)}%` }),
    seenCol.accessor("p95Ms", {
      header: "p50 / p95 ms",
      meta: { numeric: true, help: "Duration the caller saw, median and 95th percentile, in milliseconds" },
      cell: (i) => (
        <span className="whitespace-nowrap text-xs text-muted">
          {ms(i.row.original.p50Ms)} / {ms(i.row.original.p95Ms)}
        </span>
      ),
    }),
    seenCol.display({
      id: "evidence",
      header: "Evidence",
      cell: (i) => (
        <span className="flex flex-wrap gap-1">
          {i.row.original.evidence.map((e) => (
            <Badge key={e}>{e}</Badge>
          ))}
          {i.row.original.async && (
            <Badge tone="info" title="A message hand-off: the producer needs the destination, never the consumer">
              asynchronous
            </Badge>
          )}
        </span>
      ),
    }),
    seenCol.accessor("lastSeenAt", {
      header: "First / last seen",
      meta: { help: "First and last time a span of this call arrived (UTC)", className: "font-mono text-xs text-muted" },
      cell: (i) => (
        <>
          <span className="block">
            <When at={i.row.original.firstSeenAt} />
          </span>
          <span className="block">
            <When at={i.row.original.lastSeenAt} />
          </span>
        </>
      ),
    }),
    seenCol.display({
      id: "declare",
      header: "Who should declare it",
      cell: (i) => (
        <>
          <DeclareHint row={i.row.original} />
          <SnippetButton snippet={i.row.original.snippet} label="Declare this need" testId="declare-need" />
        </>
      ),
    }),
  ];
}

const declaredCol = createColumnHelper<DeclaredNotSeen>();

function declaredColumns(env: string) {
  return [
    declaredCol.accessor("from", {
      header: "Dependent → needs",
      meta: { fixed: true },
      cell: (i) => (
        <span className="inline-flex flex-wrap items-center gap-1.5">
          <Edge env={env} from={i.row.original.from} to={i.row.original.to} />
          {i.row.original.anyOf && (
            <Badge tone="info" title="One of several alternatives: an alternative not in use is expected to be missing from traces">
              any of
            </Badge>
          )}
        </span>
      ),
    }),
    declaredCol.accessor("to", { header: "Needs", meta: { hidden: true, className: "font-mono" } }),
    declaredCol.accessor("strength", { header: "Strength", cell: (i) => <Badge tone="muted">{i.getValue()}</Badge> }),
    declaredCol.accessor("source", {
      header: "Declared by",
      cell: (i) => (
        <span className="text-xs text-muted">
          source <span className="font-mono text-ink">{i.getValue()}</span>
          {i.row.original.team && (
            <>
              {" "}
              · team <span className="font-mono text-ink">{i.row.original.team}</span>
            </>
          )}
        </span>
      ),
    }),
  ];
}

const aliasCol = createColumnHelper<AliasProposal>();

function AliasProposals({ env, rows }: { env: string; rows: AliasProposal[] }) {
  if (rows.length === 0) return null;
  const columns = [
    aliasCol.accessor("alias", { header: "Traced as", meta: { fixed: true, className: "font-mono" } }),
    aliasCol.accessor("key", {
      header: "Looks like",
      cell: (i) => (
        <>
          <ComponentRef env={env} componentKey={i.getValue()} known />
          <span className="block text-xs text-muted">
            source <span className="font-mono text-ink">{i.row.original.source}</span>
            {i.row.original.team ? ` · team ${i.row.original.team}` : ""}
          </span>
        </>
      ),
    }),
    aliasCol.accessor("reason", {
      header: "Why",
      cell: (i) => (
        <span className="text-xs text-muted">
          {i.getValue()}
          <SnippetButton snippet={i.row.original.snippet} label="Add this alias" testId="add-alias" />
        </span>
      ),
    }),
  ];
  return (
    <Card title={`Names that look like a component (${rows.length})`}>
      <p className="mb-3 text-sm text-muted">
        Traces call these by a name that is neither a key nor an alias, but it looks like exactly one declared component. Once the component lists it as an alias,
        its calls count on that component. A guess from naming habits: confirm with the owning team.
      </p>
      <DataTable
        id="alias-proposals"
        caption="Proposed aliases: a trace name and the declared component it looks like"
        columns={columns}
        data={rows}
        rowKey={(r) => `${r.alias}>${r.key}`}
        rowTestId={() => "alias-proposal-row"}
        paging={{ mode: "client", pageSize: 25, search: { label: "Find a name", placeholder: "alias or key" } }}
        noun={["proposal", "proposals"]}
        empty="None matches."
      />
    </Card>
  );
}

function NoTraces({ env }: { env: string }) {
  return (
    <Card title="No traces pushed yet">
      <div className="space-y-3 text-sm text-muted" data-testid="drift-no-traces">
        <p>
          Nothing to compare: this environment has seen no traced calls. Point an OpenTelemetry Collector&apos;s <span className="font-mono">otlphttp</span> exporter (or an
          SDK&apos;s OTLP/HTTP exporter) at this environment, with an API token that has inventory:write (Admin → Tokens). It sends protobuf or JSON, gzip or not; spans
          are folded into calls between components as they arrive and never stored.
        </p>
        <pre tabIndex={0} className="overflow-x-auto rounded-md border border-line bg-raised px-3 py-2 font-mono text-xs text-ink">
          {`exporters:
  otlphttp/pinchpoint:
    endpoint: <this server>/api/v1/environments/${env}/otlp
    headers:
      Authorization: "Bearer \${env:PINCHPOINT_TOKEN}"`}
        </pre>
        <p>Or push a trace file (OTLP/JSON, or JSON Lines as the Collector&apos;s file exporter writes them) under a source name of your choice:</p>
        <pre tabIndex={0} className="overflow-x-auto rounded-md border border-line bg-raised px-3 py-2 font-mono text-xs text-ink">
          {`curl -X POST \
  -H "Authorization: Bearer $PINCHPOINT_TOKEN" \
  -H "Content-Type: application/json" \
  --data-binary @traces.jsonl \
  "<this server>/api/v1/environments/${env}/inventory?format=otlp&source=<name>"`}
        </pre>
        <p>
          Or upload the file on the{" "}
          <Link href={`/environments/${env}/imports`} className="text-ink underline decoration-line underline-offset-2 hover:decoration-brass">
            Imports
          </Link>{" "}
          screen (format “OpenTelemetry traces”, with a source name). A new file from the same source replaces its earlier one; the receiver adds up.
        </p>
      </div>
    </Card>
  );
}

type Source = DriftResponse["observedSources"][number];
const sourceCol = createColumnHelper<Source>();
const SOURCE_COLUMNS = [
  sourceCol.accessor("source", { header: "Source", meta: { fixed: true, className: "font-mono" } }),
  sourceCol.accessor("edges", { header: "Caller → called pairs", meta: { numeric: true }, cell: (i) => plural(i.getValue(), "pair") }),
  sourceCol.accessor("lastSeenAt", { header: "Last seen", cell: (i) => <When at={i.getValue()} /> }),
];

function ListOf<T>({ id, list, caption, data, total, columns, rowKey, rowTestId, empty, search }: { id: string; list: ListState; caption: string; data: T[] | undefined; total: number | undefined; columns: Columns<T>; rowKey: (r: T) => string; rowTestId: string; empty: string; search: string }) {
  return (
    <DataTable
      id={id}
      caption={caption}
      columns={columns}
      data={data}
      rowKey={rowKey}
      rowTestId={() => rowTestId}
      paging={{ mode: "server", list, total }}
      noun={["need", "needs"]}
      empty={list.filters.q ? "None matches." : empty}
      filters={<ListSearch list={list} label="Find" placeholder={search} />}
    />
  );
}

export function DriftScreen({ env }: { env: string }) {
  const seen = useListState(DRIFT_SEEN_LIST, { prefix: "seen", prefixApi: true, filters: ["q"], pageSize: 25 });
  const declared = useListState(DRIFT_DECLARED_LIST, { prefix: "declared", prefixApi: true, filters: ["q"], pageSize: 25 });
  const drift = useApi(driftResponseSchema, `/api/v1/environments/${env}/drift?${seen.query}&${declared.query}`, { keepPreviousData: true });
  const data = drift.data;
  const traced = data !== undefined && data.observedSources.length > 0;
  // What each list holds (after its own search, when one is typed).
  const seenTotal = data?.seenNotDeclared.total ?? 0;
  const declaredTotal = data?.declaredNotSeen.total ?? 0;

  return (
    <div className="space-y-4">
      <div className="space-y-2">
        <h1 className="text-2xl font-semibold tracking-tight">Drift</h1>
        <p className="max-w-3xl text-sm text-muted">
          Drift is where the declared inventory and the running system disagree: calls that traces show but no file declares, and declared needs that no trace
          shows. Traces only show what was called while they were recorded; a need used at night, on failover or once a month can be missing from them, so
          absence is not proof that a need is gone. Calls seen only in traces already take part in the analysis (as soft needs unless the environment&apos;s settings
          say otherwise, and only in the views that include traces); declaring them in the files makes them part of every view, with the strength the team knows.
        </p>
      </div>

      {drift.error && (
        <Notice tone={drift.error.status === 404 ? "info" : "error"} title={drift.error.status === 404 ? "No such environment" : "Could not load drift"}>
          {drift.error.message}
        </Notice>
      )}
      {!data && !drift.error && <p className="text-sm text-muted">Loading…</p>}
      {data && !traced && <NoTraces env={env} />}

      {data && traced && (
        <>
          <div className="grid gap-3 sm:grid-cols-2 lg:grid-cols-4">
            <Stat label="Seen, not declared" value={seenTotal} tone={seenTotal > 0 ? "degraded" : "ok"} hint="traced calls missing from the inventory" />
            <Stat label="Declared, not seen" value={declaredTotal} hint="needs of traced callers absent from traces" />
            <Stat label="Agreeing" value={data.agreeing} tone="ok" hint="declared needs the traces confirm" />
            <Stat label="Trace sources" value={data.observedSources.length} hint={`newest ${dateTime(newest(data.observedSources.map((s) => s.lastSeenAt)))}; window ${plural(data.window.days, "day")}`} />
          </div>

          <Card title={`Seen in traces, never declared (${seenTotal})`}>
            <p className="mb-3 text-sm text-muted">
              Each call is a need no file declares: it counts only in the views that include traces, and only as soft unless the environment&apos;s settings say
              otherwise. A need is declared on the calling component, in the file of the source that declares it.
            </p>
            <ListOf
              id="seen-not-declared"
              list={seen}
              caption="Calls seen in traces that no inventory declares"
              data={data.seenNotDeclared.items}
              total={data.seenNotDeclared.total}
              columns={seenColumns(env)}
              rowKey={(r) => `${r.from}→${r.to}`}
              rowTestId="seen-not-declared-row"
              empty="None: every call the traces show is declared."
              search="caller, callee or evidence"
            />
          </Card>

          <AliasProposals env={env} rows={data.aliasProposals} />

          <Card title={`Declared, never seen in traces (${declaredTotal})`}>
            <p className="mb-3 text-sm text-muted">
              Listed only for components that the traces show calling something: a component no trace starts from tells us nothing about its needs. Check with
              the owning team before removing anything; the call may simply not have happened while traces were recorded.
            </p>
            <ListOf
              id="declared-not-seen"
              list={declared}
              caption="Declared needs of traced callers that no trace shows"
              data={data.declaredNotSeen.items}
              total={data.declaredNotSeen.total}
              columns={declaredColumns(env)}
              rowKey={(r) => `${r.from}→${r.to}`}
              rowTestId="declared-not-seen-row"
              empty="None: every declared need of a traced caller appeared in the traces."
              search="component, source or team"
            />
          </Card>

          <Card title={`Trace sources (${data.observedSources.length})`}>
            <DataTable
              id="observed-sources"
              caption="Sources of traces with the time a span of theirs last arrived"
              columns={SOURCE_COLUMNS}
              data={data.observedSources}
              rowKey={(r) => r.source}
              paging={{ mode: "client", pageSize: 25 }}
              noun={["source", "sources"]}
              empty="None."
            />
          </Card>
        </>
      )}
    </div>
  );
}

function newest(isos: string[]): string {
  return isos.reduce((a, b) => (b > a ? b : a));
}
