"use client";
// Drift: traced calls against declared needs. Two lists, each an action for someone: a call
// nobody declared belongs in the calling component's file; a declared need no trace shows is
// worth a second look, never an automatic removal.
import Link from "next/link";
import { useState, type ReactNode } from "react";
import useSWR from "swr";
import { Badge } from "@/components/ui/Badge";
import { Card, Stat } from "@/components/ui/Card";
import { dateTime, plural, trafficLine } from "@/components/ui/format";
import { Notice } from "@/components/ui/Notice";
import { fetchJson, type ApiError } from "@/lib/client/fetcher";
import type { AliasProposalRow, DeclaredNotSeen, Drift, SeenNotDeclared } from "@/lib/data/drift";

const th = "whitespace-nowrap px-2 py-1.5 font-medium";
const td = "px-2 py-1.5 align-top";

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
          <pre className="max-w-xl overflow-x-auto rounded-md border border-line bg-raised px-2 py-1.5 font-mono text-xs text-ink" data-testid={`${testId}-snippet`}>
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

function SeenNotDeclaredTable({ env, rows }: { env: string; rows: SeenNotDeclared[] }) {
  if (rows.length === 0) return <p className="text-sm text-muted">None: every call the traces show is declared.</p>;
  return (
    <div className="overflow-x-auto">
      <table className="w-full text-sm" data-testid="seen-not-declared">
        <caption className="sr-only">Calls seen in traces that no inventory declares, most calls first</caption>
        <thead className="text-left text-xs text-muted">
          <tr>
            <th scope="col" className={th}>Caller → called</th>
            <th scope="col" className={`${th} text-right`} title="Calls over the trace window, and calls per minute since the window opened or the call was first seen">Traffic</th>
            <th scope="col" className={`${th} text-right`} title="Duration the caller saw, median and 95th percentile, in milliseconds">p50 / p95 ms</th>
            <th scope="col" className={th}>Evidence</th>
            <th scope="col" className={th} title="First and last time a span of this call arrived (UTC)">First / last seen</th>
            <th scope="col" className={th}>Who should declare it</th>
          </tr>
        </thead>
        <tbody>
          {rows.map((r) => (
            <tr key={`${r.from}→${r.to}`} className="border-t border-line/60" data-testid="seen-not-declared-row">
              <td className={td}>
                <Edge env={env} from={r.from} to={r.to} fromKnown={r.fromKnown} toKnown={r.toKnown} />
              </td>
              <td className={`${td} text-right font-mono tabular-nums`} data-testid="drift-traffic">
                <span className="block text-ink">{r.calls.toLocaleString()}</span>
                <span className={`block text-xs ${r.errorRate >= 0.01 ? "text-degraded" : "text-muted"}`}>{trafficLine(r)}</span>
              </td>
              <td className={`${td} whitespace-nowrap text-right font-mono text-xs tabular-nums text-muted`}>
                {ms(r.p50Ms)} / {ms(r.p95Ms)}
              </td>
              <td className={td}>
                <span className="flex flex-wrap gap-1">
                  {r.evidence.map((e) => (
                    <Badge key={e}>{e}</Badge>
                  ))}
                  {r.async && (
                    <Badge tone="info" title="A message hand-off: the producer needs the destination, never the consumer">
                      asynchronous
                    </Badge>
                  )}
                </span>
              </td>
              <td className={`${td} whitespace-nowrap font-mono text-xs text-muted`}>
                <span className="block">{dateTime(r.firstSeenAt)}</span>
                <span className="block">{dateTime(r.lastSeenAt)}</span>
              </td>
              <td className={td}>
                <DeclareHint row={r} />
                <SnippetButton snippet={r.snippet} label="Declare this need" testId="declare-need" />
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

function DeclaredNotSeenTable({ env, rows }: { env: string; rows: DeclaredNotSeen[] }) {
  if (rows.length === 0) return <p className="text-sm text-muted">None: every declared need of a traced caller appeared in the traces.</p>;
  return (
    <div className="overflow-x-auto">
      <table className="w-full text-sm" data-testid="declared-not-seen">
        <caption className="sr-only">Declared needs of traced callers that no trace shows</caption>
        <thead className="text-left text-xs text-muted">
          <tr>
            <th scope="col" className={th}>Dependent → needs</th>
            <th scope="col" className={th}>Strength</th>
            <th scope="col" className={th}>Declared by</th>
          </tr>
        </thead>
        <tbody>
          {rows.map((r) => (
            <tr key={`${r.from}→${r.to}`} className="border-t border-line/60" data-testid="declared-not-seen-row">
              <td className={td}>
                <span className="inline-flex flex-wrap items-center gap-1.5">
                  <Edge env={env} from={r.from} to={r.to} />
                  {r.anyOf && (
                    <Badge tone="info" title="One of several alternatives: an alternative not in use is expected to be missing from traces">
                      any of
                    </Badge>
                  )}
                </span>
              </td>
              <td className={td}>
                <Badge tone="muted">{r.strength}</Badge>
              </td>
              <td className={`${td} text-xs text-muted`}>
                source <span className="font-mono text-ink">{r.source}</span>
                {r.team && (
                  <>
                    {" "}
                    · team <span className="font-mono text-ink">{r.team}</span>
                  </>
                )}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

function AliasProposals({ env, rows }: { env: string; rows: AliasProposalRow[] }) {
  if (rows.length === 0) return null;
  return (
    <Card title={`Names that look like a component (${rows.length})`}>
      <p className="mb-3 text-sm text-muted">
        Traces call these by a name that is neither a key nor an alias, but it looks like exactly one declared component. Once the component lists it as an alias,
        its calls count on that component. A guess from naming habits: confirm with the owning team.
      </p>
      <table className="w-full text-sm" data-testid="alias-proposals">
        <caption className="sr-only">Proposed aliases: a trace name and the declared component it looks like</caption>
        <thead className="text-left text-xs text-muted">
          <tr>
            <th scope="col" className={th}>Traced as</th>
            <th scope="col" className={th}>Looks like</th>
            <th scope="col" className={th}>Why</th>
          </tr>
        </thead>
        <tbody>
          {rows.map((r) => (
            <tr key={`${r.alias}→${r.key}`} className="border-t border-line/60" data-testid="alias-proposal-row">
              <td className={`${td} font-mono`}>{r.alias}</td>
              <td className={td}>
                <ComponentRef env={env} componentKey={r.key} known />
                <span className="block text-xs text-muted">
                  source <span className="font-mono text-ink">{r.source}</span>
                  {r.team ? ` · team ${r.team}` : ""}
                </span>
              </td>
              <td className={`${td} text-xs text-muted`}>
                {r.reason}
                <SnippetButton snippet={r.snippet} label="Add this alias" testId="add-alias" />
              </td>
            </tr>
          ))}
        </tbody>
      </table>
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
        <pre className="overflow-x-auto rounded-md border border-line bg-raised px-3 py-2 font-mono text-xs text-ink">
          {`exporters:
  otlphttp/pinchpoint:
    endpoint: <this server>/api/v1/environments/${env}/otlp
    headers:
      Authorization: "Bearer \${env:PINCHPOINT_TOKEN}"`}
        </pre>
        <p>Or push a trace file (OTLP/JSON, or JSON Lines as the Collector&apos;s file exporter writes them) under a source name of your choice:</p>
        <pre className="overflow-x-auto rounded-md border border-line bg-raised px-3 py-2 font-mono text-xs text-ink">
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

export function DriftScreen({ env }: { env: string }) {
  const drift = useSWR<Drift, ApiError>(`/api/v1/environments/${env}/drift`, fetchJson);
  const data = drift.data;
  const traced = data !== undefined && data.observedSources.length > 0;

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
            <Stat label="Seen, not declared" value={data.seenNotDeclared.length} tone={data.seenNotDeclared.length > 0 ? "degraded" : "ok"} hint="traced calls missing from the inventory" />
            <Stat label="Declared, not seen" value={data.declaredNotSeen.length} hint="needs of traced callers absent from traces" />
            <Stat label="Agreeing" value={data.agreeing} tone="ok" hint="declared needs the traces confirm" />
            <Stat label="Trace sources" value={data.observedSources.length} hint={`newest ${dateTime(newest(data.observedSources.map((s) => s.lastSeenAt)))}; window ${plural(data.window.days, "day")}`} />
          </div>

          <Card title={`Seen in traces, never declared (${data.seenNotDeclared.length})`}>
            <p className="mb-3 text-sm text-muted">
              Each call is a need no file declares: it counts only in the views that include traces, and only as soft unless the environment&apos;s settings say
              otherwise. A need is declared on the calling component, in the file of the source that declares it.
            </p>
            <SeenNotDeclaredTable env={env} rows={data.seenNotDeclared} />
          </Card>

          <AliasProposals env={env} rows={data.aliasProposals} />

          <Card title={`Declared, never seen in traces (${data.declaredNotSeen.length})`}>
            <p className="mb-3 text-sm text-muted">
              Listed only for components that the traces show calling something: a component no trace starts from tells us nothing about its needs. Check with
              the owning team before removing anything; the call may simply not have happened while traces were recorded.
            </p>
            <DeclaredNotSeenTable env={env} rows={data.declaredNotSeen} />
          </Card>

          <Card title={`Trace sources (${data.observedSources.length})`}>
            <table className="w-full text-sm" data-testid="observed-sources">
              <caption className="sr-only">Sources of traces with the time a span of theirs last arrived</caption>
              <thead className="text-left text-xs text-muted">
                <tr>
                  <th scope="col" className={th}>Source</th>
                  <th scope="col" className={`${th} text-right`}>Caller → called pairs</th>
                  <th scope="col" className={th}>Last seen</th>
                </tr>
              </thead>
              <tbody>
                {data.observedSources.map((s) => (
                  <tr key={s.source} className="border-t border-line/60">
                    <td className={`${td} font-mono`}>{s.source}</td>
                    <td className={`${td} text-right font-mono tabular-nums`}>{plural(s.edges, "pair")}</td>
                    <td className={`${td} font-mono text-xs text-muted`}>{dateTime(s.lastSeenAt)}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </Card>
        </>
      )}
    </div>
  );
}

function newest(isos: string[]): string {
  return isos.reduce((a, b) => (b > a ? b : a));
}
