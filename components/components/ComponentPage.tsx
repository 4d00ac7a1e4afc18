"use client";
// One component: what is declared about it, who owns it, what it needs and what needs it, its
// measures in plain words, and which snapshots changed it.
import Link from "next/link";
import { useState, type ReactNode } from "react";
import { z } from "zod";
import { ChainView } from "@/components/analysis/Chain";
import { ClaimOwner, ClaimUndo, ownerChoices, type Claim, type OwnerViewer } from "@/components/teams/ClaimOwner";
import { ApiForm, SubmitButton, useApiForm } from "@/components/ui/form/api-form";
import { InputField } from "@/components/ui/form/fields";
import { keySchema } from "@/lib/api/schemas/common";
import { ReviewBadge } from "@/components/reviews/ReviewBadge";
import { useReviews } from "@/components/reviews/useReviews";
import { dependencyChangeLine, dependencyLine, fieldChanges } from "@/components/history/diff-lines";
import { MEASURE_HELP } from "@/components/analysis/measures";
import { Badge } from "@/components/ui/Badge";
import { Card } from "@/components/ui/Card";
import { betweennessPct, convergedMeasure, dateTime, measure, NOT_CONVERGED, pinchScore, plural, safeHref, trafficLine } from "@/components/ui/format";
import { Notice } from "@/components/ui/Notice";
import { When } from "@/components/ui/When";
import {
  componentDetailResponseSchema,
  componentHistoryResponseSchema,
  type ComponentDetailResponse as DetailResponse,
  type ComponentEdge,
  type ComponentHistoryResponse as HistoryResponse,
  type ComponentMetrics as Metrics,
} from "@/lib/api/schemas/components";
import { componentsResponseSchema } from "@/lib/api/schemas/components";
import { useApi } from "@/lib/client/api";

function Field({ label, children }: { label: string; children: ReactNode }) {
  return (
    <div className="grid grid-cols-[8rem_1fr] gap-2 py-1 text-sm">
      <dt className="text-muted">{label}</dt>
      <dd className="text-ink">{children}</dd>
    </div>
  );
}

const STRENGTH_BADGE = {
  hard: { tone: "down", title: "down when this need is unmet" },
  soft: { tone: "degraded", title: "degraded, not down, when unmet" },
  startup: { tone: "muted", title: "needed only to start: orders the cold start, takes nothing down" },
} as const;

function EdgeList({ env, edges, empty }: { env: string; edges: ComponentEdge[]; empty: string }) {
  if (!edges.length) return <p className="text-sm text-muted">{empty}</p>;
  return (
    <ul className="space-y-1 text-sm">
      {edges.map((e) => (
        <li key={`${e.key}-${e.group ?? ""}`} className="flex flex-wrap items-center gap-1.5">
          <Link href={`/environments/${env}/components/${encodeURIComponent(e.key)}`} className="font-mono text-ink hover:underline">
            {e.key}
          </Link>
          {e.provenance?.length === 1 && e.provenance[0] === "observed" ? null : (
            <Badge tone={STRENGTH_BADGE[e.strength].tone} title={STRENGTH_BADGE[e.strength].title}>
              {e.strength === "startup" ? "start-up only" : e.strength}
            </Badge>
          )}
          {e.group && <Badge tone="info" title="Met while any one member of the group is up">any of</Badge>}
          {e.kind === "undeclared" && <Badge tone="undeclared" title="needed by something, declared by no source">undeclared</Badge>}
          {e.provenance?.includes("inferred") && (
            <Badge tone="muted" title={`a host name in configuration named it${e.origin?.line ? ` (${e.origin.file ? `${e.origin.file}:` : "line "}${e.origin.line})` : ""}${e.provenance.includes("declared") ? "; a file declares it too" : ""}`}>
              {e.provenance.includes("declared") ? "declared and inferred" : "inferred"}
            </Badge>
          )}
          {e.via && <span className="text-xs text-faint">via {e.via}</span>}
          {e.provenance?.includes("observed") &&
            (e.provenance.length === 1 ? (
              <Badge tone="info" title="Seen in traces; no inventory file declares it. It counts as the environment's settings say (soft unless they make observed-only needs hard)">traces only</Badge>
            ) : (
              <Badge tone="ok" title="Declared, and traces confirm it">seen in traces</Badge>
            ))}
          {e.traffic && (
            <span className="font-mono text-xs text-muted" data-testid="edge-traffic" title={`Over the trace window: ${e.traffic.calls.toLocaleString()} calls, ${e.traffic.errors.toLocaleString()} errors; p50 ${e.traffic.p50Ms?.toFixed(1) ?? "?"} ms, p95 ${e.traffic.p95Ms?.toFixed(1) ?? "?"} ms; last seen ${dateTime(e.traffic.lastSeenAt)}`}>
              {trafficLine(e.traffic)}
              {e.traffic.p95Ms !== null ? ` · p95 ${e.traffic.p95Ms < 10 ? e.traffic.p95Ms.toFixed(1) : Math.round(e.traffic.p95Ms)} ms` : ""}
            </span>
          )}
        </li>
      ))}
    </ul>
  );
}

export function ComponentPage({ env, componentKey, viewer, canDecide = false }: { env: string; componentKey: string; viewer?: OwnerViewer; canDecide?: boolean }) {
  const base = `/api/v1/environments/${env}/components/${encodeURIComponent(componentKey)}`;
  const detail = useApi(componentDetailResponseSchema, base);
  const [claim, setClaim] = useState<Claim | null>(null);
  const history = useApi(componentHistoryResponseSchema, `${base}/history`);
  const reviews = useReviews(env);
  const d = detail.data;

  if (detail.error) {
    return (
      <div className="space-y-3">
        <h1 className="font-mono text-2xl font-semibold">{componentKey}</h1>
        <Notice tone={detail.error.status === 404 ? "info" : "error"} title={detail.error.status === 404 ? "No such component in the current inventory" : "Could not load the component"}>
          {detail.error.message}. <Link href={`/environments/${env}/components`} className="text-info underline">All components</Link>
        </Notice>
        {history.data && <HistoryCard env={env} data={history.data} />}
      </div>
    );
  }
  if (!d) return <p className="text-muted">Loading {componentKey}…</p>;
  const m = d.metrics;
  const links = Object.entries(d.links);

  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <p className="text-sm text-muted">
            <Link href={`/environments/${env}/components`} className="hover:underline">Components</Link> /
          </p>
          <h1 className="flex flex-wrap items-center gap-2 text-2xl font-semibold tracking-tight">
            <span className="font-mono">{d.key}</span>
            {d.kind === "undeclared" && <Badge tone="undeclared" title="needed by something, declared by no source">undeclared</Badge>}
            {m?.articulation && <Badge tone="info" title={MEASURE_HELP.articulation.short}>splits the graph</Badge>}
            {m?.inCycle && <Badge tone="cycle" title={MEASURE_HELP.inCycle.short}>in a cycle</Badge>}
            {d.kind !== "undeclared" && d.singlePoint && <Badge tone="degraded">single</Badge>}
            <ReviewBadge review={reviews.byKey[d.key]} />
          </h1>
          {d.name !== d.key && <p className="text-muted">{d.name}</p>}
        </div>
        <div className="flex flex-wrap gap-2">
          {canDecide && (
            <Link href={`/environments/${env}/reviews?decide=${encodeURIComponent(d.key)}#decide`} className="rounded-md border border-line bg-raised px-3 py-1.5 text-sm text-ink hover:border-brass">
              Record a risk decision
            </Link>
          )}
          <Link href={`/environments/${env}/drills?fail=${encodeURIComponent(d.key)}`} className="rounded-md bg-brass px-3 py-1.5 text-sm font-semibold text-on-brass hover:bg-brass-strong">
            Blast radius
          </Link>
          <Link href={`/environments/${env}/map?focus=${encodeURIComponent(d.key)}`} className="rounded-md border border-line bg-raised px-3 py-1.5 text-sm text-ink hover:border-brass">
            Show on map
          </Link>
        </div>
      </div>

      <div className="grid gap-4 lg:grid-cols-2">
        <Card title="What is declared">
          <dl>
            <Field label="Kind">{d.kind}</Field>
            <Field label="Tier">{d.tier} <span className="text-xs text-muted">(1 most critical … 4 least)</span></Field>
            <Field label="Replicas">{d.replicas}</Field>
            <Field label="Zones">{d.zones.length ? <span className="font-mono">{d.zones.join(", ")}</span> : <span className="text-degraded">none declared</span>}</Field>
            <Field label="Tags">{d.tags.length ? d.tags.map((t) => <span key={t} className="mr-1"><Badge>{t}</Badge></span>) : "—"}</Field>
            <Field label="Links">
              {links.length
                ? links.map(([name, href]) => {
                    const safe = safeHref(href);
                    return (
                      <span key={name} className="mr-3">
                        {safe ? (
                          <a href={safe} target="_blank" rel="noreferrer noopener" className="text-info underline">
                            {name}
                          </a>
                        ) : (
                          <span title="not an http(s) address, so not clickable">{name}: {href}</span>
                        )}
                      </span>
                    );
                  })
                : "—"}
            </Field>
            <Field label="Source">
              {d.source === "(traces)" ? (
                <span title="No inventory file declares it; traces show it calling or being called">seen in traces only</span>
              ) : d.source ? (
                <span className="font-mono">{d.source}</span>
              ) : (
                <span className="text-muted">no source (undeclared)</span>
              )}
            </Field>
          </dl>
        </Card>
        <Card title="Ownership">
          <dl>
            <Field label="Owner">{d.team ? <Link href={`/teams/${d.team}`} className="text-info underline">{d.team}</Link> : <Badge tone="degraded">unowned</Badge>}</Field>
            <Field label="Declared team">{d.declaredTeam ?? "—"} {d.team !== d.declaredTeam && d.team && <span className="text-xs text-muted">(assigned in Pinchpoint)</span>}</Field>
            <Field label="Notes">{d.notes ? <span className="whitespace-pre-wrap">{d.notes}</span> : <span className="text-muted">none</span>}</Field>
            {d.annotationUpdatedAt && (
              <Field label="Updated">
                <When at={d.annotationUpdatedAt} />
              </Field>
            )}
          </dl>
          <ClaimUndo
            claim={claim}
            onUndone={() => {
              setClaim(null);
              void detail.mutate();
            }}
          />
          {!d.team && d.kind !== "undeclared" && viewer && ownerChoices(viewer).length > 0 && (
            <div className="mt-2" data-testid="claim-owner">
              <ClaimOwner
                env={env}
                componentKey={d.key}
                viewer={viewer}
                onClaimed={(c) => {
                  setClaim(c);
                  void detail.mutate();
                }}
              />
            </div>
          )}
          <p className="mt-2 text-xs text-muted">Owners and notes are edited in the map&apos;s inspector or on the team screen.</p>
        </Card>
      </div>

      <Card
        title={
          d.snapshot ? (
            <>
              Measures (snapshot #{d.snapshot.number}, pushed <When at={d.snapshot.createdAt} />)
            </>
          ) : (
            "Measures"
          )
        }
      >
        {m ? (
          <ul className="grid gap-2 text-sm md:grid-cols-2" data-testid="measures">
            <li>
              {/* The one ranking of every screen: by pinch score, as the overview and the pinch-points table. */}
              <span className="font-medium" data-testid="pinch-rank">
                Rank #{m.ranks.pinchScore.rank ?? "—"}
              </span>{" "}
              <span className="text-muted">
                by pinch score in this environment{m.ranks.pinchScore.tied > 1 ? `, shared with ${plural(m.ranks.pinchScore.tied - 1, "other component")} of equal value (equal values share a rank: 1, 2, 2, 4)` : ""}; #{m.rank} by betweenness.
              </span>
            </li>
            <li><span className="font-medium">Betweenness {betweennessPct(m.betweenness)}</span> <span className="text-muted">— that share of the shortest dependency paths between other components run through it.</span></li>
            <li><span className="font-medium">{MEASURE_HELP.blastDown.label}: {plural(m.blastRadius.down, "component")}</span> <span className="text-muted">— go down if it fails alone, itself not counted; {m.blastRadius.degraded} more degrade.</span></li>
            <li><span className="font-medium">Pinch score {pinchScore(m.pinchScore)}</span> <span className="text-muted">of 100 — {MEASURE_HELP.pinchScore.short}</span></li>
            <li>
              <span className="font-medium">PageRank {convergedMeasure(m.pagerank)}</span>{" "}
              <span className="text-muted">— {m.pagerank === null ? (d.measures.pagerank?.reason ?? NOT_CONVERGED) : MEASURE_HELP.pagerank.short}</span>
            </li>
            <li>
              <span className="font-medium">Eigenvector {convergedMeasure(m.eigenvector)}</span>{" "}
              <span className="text-muted">— {m.eigenvector === null ? (d.measures.eigenvector?.reason ?? NOT_CONVERGED) : MEASURE_HELP.eigenvector.short}</span>
            </li>
            <li><span className="font-medium">Clustering {measure(m.clustering)}</span> <span className="text-muted">— {MEASURE_HELP.clustering.short}</span></li>
            <li>
              <span className="font-medium">{m.articulation ? "Splits the graph" : "Does not split the graph"}</span>{" "}
              <span className="text-muted">— {m.articulation ? "removing it leaves parts of the estate with no path to each other (an articulation point)." : "the graph stays in one piece without it."}</span>
            </li>
            <li>
              <span className="font-medium">{m.inCycle ? "In a cycle" : "Not in a cycle"}</span>{" "}
              <span className="text-muted">— {m.inCycle ? "it and others need each other, so none of them can cold-start alone." : "it can be started once its needs are up."}</span>
            </li>
          </ul>
        ) : (
          <p className="text-sm text-muted">No finished analysis includes this component yet.</p>
        )}
        <p className="mt-3 text-xs text-muted">Measures are only as good as the inventory and the traces behind it: a dependency nobody declared and no trace caught is not counted.</p>
      </Card>

      {m && <DominatorsCard env={env} d={d} m={m} />}

      <WhyCard env={env} from={d.key} />

      <div className="grid gap-4 lg:grid-cols-2">
        <Card title={`Needs (${d.needs.length})`}>
          <EdgeList env={env} edges={d.needs} empty="Needs nothing that is declared." />
        </Card>
        <Card title={`Needed by (${d.dependents.length})`}>
          <EdgeList env={env} edges={d.dependents} empty="Nothing declares a need for it." />
        </Card>
      </div>

      {history.data ? <HistoryCard env={env} data={history.data} /> : history.error ? <Notice tone="error" title="Could not load the history">{history.error.message}</Notice> : null}
    </div>
  );
}

const whySchema = z.object({ to: keySchema });

/** "Why does this depend on …?": the chain of needs to any other component, asked by key. */
function WhyCard({ env, from }: { env: string; from: string }) {
  const [to, setTo] = useState<string | null>(null);
  const form = useApiForm(whySchema, { to: "" });
  const typed = form.watch("to");
  const matches = useApi(componentsResponseSchema, typed && typed.length >= 2 ? `/api/v1/environments/${env}/components?${new URLSearchParams({ q: typed, limit: "8" })}` : null, { keepPreviousData: true });
  return (
    <Card title={`Why does ${from} depend on …?`}>
      <ApiForm form={form} onSubmit={form.handleSubmit((v) => setTo(v.to))} label={`Why does ${from} depend on another component`} className="flex flex-wrap items-end gap-2">
        <InputField name="to" label="Another component" list="why-options" autoComplete="off" placeholder="e.g. dns-resolver" controlClassName="font-mono w-64" />
        <datalist id="why-options">
          {matches.data?.items.map((c) => (
            <option key={c.key} value={c.key}>
              {c.name}
            </option>
          ))}
        </datalist>
        <SubmitButton variant="secondary">Show the chain</SubmitButton>
      </ApiForm>
      {to && (
        <div className="mt-3">
          <ChainView env={env} from={from} to={to} />
        </div>
      )}
    </Card>
  );
}

function ComponentLink({ env, k }: { env: string; k: string }) {
  return (
    <Link href={`/environments/${env}/components/${encodeURIComponent(k)}`} className="font-mono text-ink underline decoration-line underline-offset-2 hover:decoration-brass">
      {k}
    </Link>
  );
}

/** Dominators in words: which entry points' every path runs through this component, and from an entry, what they all run through. */
function DominatorsCard({ env, d, m }: { env: string; d: DetailResponse; m: Metrics }) {
  const dom = m.dominators;
  const status = d.measures.dominators;
  if (dom.entriesDominated === null) {
    return (
      <Card title="Every path passes through">
        <p className="text-sm text-muted">This analysis predates dominators; the next push or re-analysis adds them.</p>
      </Card>
    );
  }
  const listed = dom.fromEntries;
  const more = dom.entriesDominated - listed.length;
  return (
    <Card title="Every path passes through" action={<Link href={`/environments/${env}/map?focus=${encodeURIComponent(d.key)}&colour=entriesDominated`} className="text-xs text-brass hover:underline">Entry points on the map</Link>}>
      <div className="space-y-3 text-sm" data-testid="dominators">
        {d.fromHere && (
          <div>
            <p>
              <Badge tone="info" title="Tier 1 and nothing depends on it: where requests come in">entry point</Badge>{" "}
              {d.fromHere.total === 0 ? (
                <span>No single component lies on every path from {d.key} to the {plural(d.fromHere.reached, "component")} it reaches.</span>
              ) : (
                <span>
                  Every path from <span className="font-mono">{d.key}</span> to what follows passes through {plural(d.fromHere.total, "component")}; each one&apos;s loss cuts {d.key} off from the components listed with it.
                </span>
              )}
            </p>
            {d.fromHere.through.length > 0 && (
              <ol className="mt-1 space-y-0.5" data-testid="passes-through">
                {d.fromHere.through.map((t) => (
                  <li key={t.key}>
                    <ComponentLink env={env} k={t.key} /> <span className="text-muted">— every path from {d.key} to {plural(t.dominated, "component")} passes through it</span>
                  </li>
                ))}
              </ol>
            )}
          </div>
        )}
        {listed.length > 0 ? (
          <div>
            <p>
              For {dom.entriesDominated} of the {plural(dom.entriesReaching ?? 0, "entry point")} that reach it, every path to something beyond passes through <span className="font-mono">{d.key}</span>:
            </p>
            <ul className="mt-1 space-y-0.5" data-testid="dominated-from">
              {listed.map((e) => (
                <li key={e.entry}>
                  every path from <ComponentLink env={env} k={e.entry} /> passes through this <span className="text-muted">to reach {plural(e.dominated, "component")}</span>
                </li>
              ))}
              {more > 0 && <li className="text-muted">and from {plural(more, "more entry point")}.</li>}
            </ul>
          </div>
        ) : (
          !m.entry && (
            <p className="text-muted">
              {dom.entriesReaching ? `Reached from ${plural(dom.entriesReaching, "entry point")}, each of which has another way around it.` : "No entry point (tier 1, nothing depends on it) reaches it."}
            </p>
          )
        )}
        <p>
          {dom.dominatedAll ? (
            <span>
              From all entry points together, every path to {plural(dom.dominatedAll, "component")} passes through it.
            </span>
          ) : (
            <span className="text-muted">From all entry points together, nothing depends on it alone.</span>
          )}{" "}
          {dom.idomAll && (
            <span className="text-muted">
              Every path from any entry point to it passes through <ComponentLink env={env} k={dom.idomAll} />.
            </span>
          )}
        </p>
        {status && !status.complete && (
          <Notice tone="info" title="Not every entry point was analysed">
            Per-entry dominators cover {status.entriesAnalysed} of {status.entries} entry points (the analysis&apos; work limit); the counts above are at least these.
          </Notice>
        )}
      </div>
    </Card>
  );
}

function HistoryCard({ env, data }: { env: string; data: HistoryResponse }) {
  return (
    <Card title={`Changes in the last ${data.scanned} snapshots`}>
      {data.items.length === 0 ? (
        <p className="text-sm text-muted">No snapshot in that range touched it.</p>
      ) : (
        <ol className="space-y-3 text-sm" data-testid="component-history">
          {data.items.map((h) => (
            <li key={h.number} className="border-l-2 border-line pl-3">
              <p>
                <Badge tone={h.change === "added" ? "ok" : h.change === "removed" ? "down" : "info"}>{h.change}</Badge>{" "}
                {h.diff.componentsChanged.some((c) => c.changes.kind?.before === "undeclared") && <Badge tone="ok" title="Until this snapshot it was undeclared: needed by something, declared by no source">now declared</Badge>}{" "}
                {h.diff.componentsAdded.some((c) => c.kind === "undeclared") && <Badge tone="undeclared" title="needed by something, declared by no source">as undeclared</Badge>}{" "}
                <Link href={`/environments/${env}/history?from=${h.number - 1}&to=${h.number}`} className="font-mono text-ink hover:underline">
                  snapshot #{h.number}
                </Link>{" "}
                <span className="text-muted">
                  <When at={h.createdAt} /> · {h.source ?? "?"} · {h.actor ?? "unknown"}
                </span>
              </p>
              <ul className="mt-1 space-y-0.5 font-mono text-xs text-muted">
                {h.diff.componentsChanged.flatMap(fieldChanges).map((l) => <li key={l}>{l}</li>)}
                {h.diff.dependenciesAdded.map((x) => <li key={`+${dependencyLine(x)}`}>+ {dependencyLine(x)}</li>)}
                {h.diff.dependenciesRemoved.map((x) => <li key={`-${dependencyLine(x)}`}>− {dependencyLine(x)}</li>)}
                {h.diff.dependenciesChanged.map((x) => <li key={dependencyChangeLine(x)}>~ {dependencyChangeLine(x)}</li>)}
              </ul>
            </li>
          ))}
        </ol>
      )}
    </Card>
  );
}
