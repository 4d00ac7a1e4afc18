"use client";
// The live incident screen: what fires, the probable origin(s) in two readings, what will likely
// fail next, who to page in order, and a summary to paste. Polls the API (swr) so it follows the
// alerts without a reload; the caution that this is a probability, not a diagnosis, stays on top.
import { SummaryCopy } from "@/components/ui/SummaryCopy";
import Link from "next/link";
import { useState } from "react";
import { Badge } from "@/components/ui/Badge";
import { Button } from "@/components/ui/Button";
import { Card, Stat } from "@/components/ui/Card";
import { ApiForm, FormProblem, SubmitButton, submitWith, useApiForm } from "@/components/ui/form/api-form";
import { InputField } from "@/components/ui/form/fields";
import { Notice } from "@/components/ui/Notice";
import { ageFromSeconds, dateTime, plural } from "@/components/ui/format";
import { currentIncidentResponseSchema, resolvedIncidentSchema, resolveIncidentSchema, type PageEntry } from "@/lib/api/schemas/incidents";
import { sendJson, useApi } from "@/lib/client/api";
import { lift } from "@/lib/incidents/view";
import { AlertsTable } from "./AlertsTable";
import { IncidentHistory } from "./IncidentHistory";
import { INCIDENT_REFRESH_MS } from "./refresh";
import { WebhookHelp } from "./WebhookHelp";


const REASON_LABEL: Record<PageEntry["reasons"][number], string> = {
  origin: "owns the probable origin",
  silent: "owns a silent suspect",
  firing: "firing",
  predicted: "likely to fail next",
};

function KeyLink({ env, k, firing }: { env: string; k: string; firing?: boolean }) {
  return (
    <span className="inline-flex items-center gap-1">
      <Link href={`/environments/${env}/components/${encodeURIComponent(k)}`} className="font-mono text-ink hover:text-brass">
        {k}
      </Link>
      {firing === false && <Badge tone="info" title="No alert fires for it">not alerting</Badge>}
    </span>
  );
}

function KeyList({ env, keys, max = 24, firing }: { env: string; keys: string[]; max?: number; firing?: (k: string) => boolean }) {
  const [all, setAll] = useState(false);
  if (keys.length === 0) return <span className="text-faint">none</span>;
  const shown = all ? keys : keys.slice(0, max);
  return (
    <span className="inline-flex flex-wrap gap-x-2 gap-y-0.5 text-sm">
      {shown.map((k) => (
        <KeyLink key={k} env={env} k={k} firing={firing ? firing(k) : undefined} />
      ))}
      {keys.length > max && (
        <button type="button" className="text-xs text-brass hover:underline" onClick={() => setAll(!all)}>
          {all ? "fewer" : `and ${keys.length - max} more`}
        </button>
      )}
    </span>
  );
}

function PageList({ env, page }: { env: string; page: PageEntry[] }) {
  return (
    <ol className="space-y-2" data-testid="page-order">
      {page.map((p, i) => (
        <li key={p.team ?? "(none)"} className="flex gap-3 rounded-md border border-line px-3 py-2" data-testid="page-entry">
          <span className="w-5 text-right font-mono text-sm text-faint">{i + 1}</span>
          <div className="min-w-0 flex-1 text-sm">
            <div className="flex flex-wrap items-baseline gap-2">
              <span className="font-semibold">
                {p.team ? (
                  <Link href={`/teams/${p.team}`} className="hover:text-brass">
                    {p.contact?.name ?? p.team}
                  </Link>
                ) : (
                  <span className="text-degraded">Unowned — nobody is paged</span>
                )}
              </span>
              {p.reasons.map((r) => (
                <Badge key={r} tone={r === "origin" ? "down" : r === "silent" ? "info" : r === "firing" ? "degraded" : "muted"}>
                  {REASON_LABEL[r]}
                  {r === "firing" || r === "predicted" ? ` (${p[r].length})` : ""}
                </Badge>
              ))}
            </div>
            {p.team ? (
              <p className="text-muted">
                {p.contact?.oncall ? (
                  <>
                    On-call: <span className="text-ink">{p.contact.oncall}</span>
                  </>
                ) : (
                  "No on-call contact on file"
                )}
                {p.contact?.email && (
                  <>
                    {" · "}
                    <a href={`mailto:${p.contact.email}`} className="text-info hover:underline">
                      {p.contact.email}
                    </a>
                  </>
                )}
              </p>
            ) : (
              <p className="text-muted">Assign owners on the teams screen so that someone is paged for these.</p>
            )}
            {(p.origin.length > 0 || p.silent.length > 0) && (
              <p className="mt-1">
                <KeyList env={env} keys={[...p.origin, ...p.silent]} />
              </p>
            )}
          </div>
        </li>
      ))}
    </ol>
  );
}

function ResolveByHand({ env, number, onDone }: { env: string; number: number; onDone(): void }) {
  const [open, setOpen] = useState(false);
  const form = useApiForm(resolveIncidentSchema, { reason: "" });
  if (!open)
    return (
      <Button type="button" variant="ghost" onClick={() => setOpen(true)}>
        Close by hand…
      </Button>
    );
  const onSubmit = submitWith(
    form,
    (values) => sendJson(resolvedIncidentSchema, `/api/v1/environments/${env}/incidents/${number}/resolve`, "POST", values),
    () => {
      setOpen(false);
      onDone();
    },
  );
  return (
    <ApiForm form={form} onSubmit={onSubmit} label="Close the incident by hand" className="flex flex-wrap items-start gap-2">
      <InputField name="reason" label="Why is it over?" hint="its firing alerts end now; audited" placeholder="the monitor never sends resolved alerts" className="min-w-64 flex-1" />
      <div className="flex gap-2 pt-5">
        <SubmitButton variant="danger" working="Closing…">
          Close incident
        </SubmitButton>
        <Button type="button" variant="ghost" onClick={() => setOpen(false)}>
          Cancel
        </Button>
      </div>
      <FormProblem className="basis-full" />
    </ApiForm>
  );
}

export function IncidentScreen({ env, canWrite }: { env: string; canWrite: boolean }) {
  const current = useApi(currentIncidentResponseSchema, `/api/v1/environments/${env}/incidents/current`, { refreshInterval: INCIDENT_REFRESH_MS });
  const data = current.data;
  const r = data?.result;
  const firingSet = new Set(r?.firing ?? []);
  const firingCount = r?.firing.length ?? 0;
  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-start justify-between gap-3">
        <div>
          <h1 className="text-2xl font-semibold tracking-tight">Incidents</h1>
          <p className="mt-1 text-sm text-muted" data-testid="incident-status">
            {data?.incident
              ? `Incident #${data.incident.number} open since ${dateTime(data.incident.openedAt)} · ${plural(data.firingAlerts.length, "alert")} firing`
              : data
                ? "No alerts firing."
                : current.isLoading
                  ? "Loading…"
                  : ""}
            {data && ` · refreshed ${dateTime(data.computedAt, { seconds: true })}`}
          </p>
        </div>
        {data?.incident && (
          <Link href={`/environments/${env}/map?incident=current`} className="rounded-md border border-line px-3 py-1.5 text-sm hover:border-brass">
            Show on the map
          </Link>
        )}
      </div>

      <Notice tone="caution" title="A probability, not a diagnosis">
        <span data-testid="incident-caution">
          {data?.caution ?? "The probable origin is a probability read from the declared dependency graph, not a diagnosis."} It is only as good as the inventory:
          a dependency nobody declared is invisible here.
        </span>
      </Notice>

      {current.error && (
        <Notice tone="error" title="Could not load the incident">
          {current.error.message}
        </Notice>
      )}

      {data && !data.incident && (
        <>
          <Card title="Nothing fires">
            <p className="text-sm text-muted">
              When alerts arrive on this environment&apos;s webhook, this screen shows what fires, the probable origin and who to page, and follows the alerts as they come and go.
            </p>
          </Card>
          <WebhookHelp env={env} />
        </>
      )}

      {data?.incident && r && (
        <div className="space-y-4" data-testid="incident-live">
          <p className="text-sm text-muted" data-testid="incident-snapshot">
            {data.snapshot ? (
              <>
                Read against snapshot <span className="font-mono text-ink">#{data.snapshot.number}</span>, pushed {dateTime(data.snapshot.createdAt)} ({ageFromSeconds(data.snapshot.ageSeconds)}).
              </>
            ) : (
              "Nothing has been pushed to this environment: no component can be recognised."
            )}
          </p>
          <div className="grid grid-cols-2 gap-3 md:grid-cols-5">
            <Stat label="Firing alerts" value={data.firingAlerts.length} tone="down" />
            <Stat label="Firing components" value={firingCount} tone="down" />
            <Stat label="Explained" value={<span data-testid="explained">{`${r.explainedCount} of ${firingCount}`}</span>} hint="by the probable origin(s)" />
            <Stat label="Likely next" value={data.predictedTotal.down} tone={data.predictedTotal.down ? "degraded" : "ink"} hint={`down, not firing yet; ${data.predictedTotal.degraded} degraded`} />
            <Stat label="Unknown" value={data.unknownAlerts.reduce((a, u) => a + u.alerts, 0) + r.unknown.length} tone={data.unknownAlerts.length ? "degraded" : "ink"} hint="alerts naming no known component" />
          </div>

          <div className="grid gap-4 lg:grid-cols-2">
            <Card title="Probable origin: what explains the most firing components">
              <div className="space-y-3 text-sm" data-testid="origins">
                {r.origins.length === 0 && <p className="text-muted">No firing component&apos;s failure explains another firing one: each may be its own fault.</p>}
                {r.origins.map((o, i) => {
                  const notExplained = r.firing.filter((k) => !o.explains.includes(k));
                  return (
                    <div key={o.key} className="rounded-md border border-line p-3" data-testid="origin">
                      <div className="flex flex-wrap items-baseline gap-2">
                        <span className="text-xs uppercase tracking-wide text-faint">{i === 0 ? "most likely" : "also"}</span>
                        <KeyLink env={env} k={o.key} />
                        <span className="font-semibold text-down">
                          explains {o.explains.length} of {firingCount} firing
                        </span>
                        {o.degraded.length > 0 && <span className="text-xs text-degraded">({o.degraded.length} only as degraded)</span>}
                      </div>
                      <p className="mt-1 text-muted">
                        Explains: <KeyList env={env} keys={o.explains.filter((k) => k !== o.key)} max={12} />
                      </p>
                      <p className="mt-1 text-muted" data-testid="not-explained">
                        Does not explain: <KeyList env={env} keys={notExplained} max={12} />
                      </p>
                    </div>
                  );
                })}
                {r.origins.length > 0 && (
                  <p className="text-muted">
                    Together: <span className="text-ink">{r.explainedCount} of {firingCount}</span> firing components explained. Greedy set cover over each firing component&apos;s blast radius, within H(d) ≤ ln d + 1 of the fewest origins that explain as much (Chvátal 1979).
                  </p>
                )}
                {r.jointly.length > 0 && (
                  <div>
                    <h3 className="text-xs font-medium uppercase tracking-wide text-faint">Explained only together</h3>
                    <ul className="mt-1 space-y-0.5">
                      {r.jointly.map((j) => (
                        <li key={j.key}>
                          <KeyLink env={env} k={j.key} /> <span className="text-muted">is down only because all of</span> <KeyList env={env} keys={j.by} /> <span className="text-muted">are</span>
                        </li>
                      ))}
                    </ul>
                  </div>
                )}
                {r.unexplained.length > 0 && (
                  <div data-testid="unexplained">
                    <h3 className="text-xs font-medium uppercase tracking-wide text-faint">Not explained by anything firing</h3>
                    <p className="mt-1 text-muted">
                      <KeyList env={env} keys={r.unexplained} /> — a separate fault, or a dependency the inventory does not declare.
                    </p>
                  </div>
                )}
                {r.silent.length > 0 && (
                  <div data-testid="silent">
                    <h3 className="text-xs font-medium uppercase tracking-wide text-faint">Silent suspects: not alerting, yet they explain more</h3>
                    <ul className="mt-1 space-y-0.5">
                      {r.silent.map((s) => (
                        <li key={`${s.kind}:${s.key}`}>
                          {s.kind === "zone" ? <span className="font-mono text-ink">zone {s.key}</span> : <KeyLink env={env} k={s.key} firing={false} />}{" "}
                          <span className="text-muted">
                            — its failure alone would explain {s.explains.length} of {firingCount} firing: check that it is really up.
                          </span>
                        </li>
                      ))}
                    </ul>
                  </div>
                )}
              </div>
            </Card>
            <Card title="Where a walk along needs settles">
              <p className="mb-2 text-xs text-muted">
                Personalised PageRank seeded by the firing components, walking from each to what it needs (in the manner of MonitorRank, Kim, Sumbaly &amp; Shah 2013): what many firing components share collects the most. Shared
                infrastructure collects much in any incident; &ldquo;×N usual&rdquo; compares with its share under plain PageRank.
              </p>
              <ol className="space-y-1 text-sm" data-testid="pagerank">
                {r.pagerank.slice(0, 10).map((p, i) => (
                  <li key={p.key} className="flex items-center gap-2">
                    <span className="w-5 text-right font-mono text-xs text-faint">{i + 1}</span>
                    <KeyLink env={env} k={p.key} firing={p.firing} />
                    <span className="ml-auto font-mono text-xs tabular-nums text-faint" title="This incident's share against the component's share under plain PageRank">
                      {p.usual > 0 ? `${lift(p)} usual` : ""}
                    </span>
                    <span className="w-14 text-right font-mono tabular-nums text-muted">{p.score.toFixed(3)}</span>
                  </li>
                ))}
              </ol>
            </Card>
          </div>

          {data.unknownAlerts.length + r.unknown.length > 0 && (
            <Notice tone="caution" title="Alerts naming no known component">
              <span data-testid="unknown-alerts">
                {data.unknownAlerts.map((u) => `${u.value ? `${u.label ? `${u.label}=` : ""}${u.value}` : "no component label"} (${plural(u.alerts, "alert")})`).join(", ")}
                {r.unknown.length > 0 && `${data.unknownAlerts.length ? "; " : ""}outside the analysed graph: ${r.unknown.join(", ")}`}. They are kept and count as firing alerts, but no origin can be read for them: add the name as an alias of its component, or name the right labels in the{" "}
                <Link href={`/environments/${env}/reviews`} className="text-brass hover:underline">
                  environment&apos;s settings
                </Link>{" "}
                (&ldquo;Alert labels that name a component&rdquo;).
              </span>
            </Notice>
          )}

          <div className="grid gap-4 lg:grid-cols-2">
            <Card title="Who to page, in order">
              <p className="mb-2 text-xs text-muted">The probable origin&apos;s owners first, then silent suspects&apos; owners, then the teams whose components fire, then those whose components will likely fail next.</p>
              <PageList env={env} page={data.page} />
            </Card>
            <Card title="Likely to fail next (not firing yet)">
              <div className="space-y-2 text-sm" data-testid="predicted">
                <p>
                  <span className="font-semibold text-down">{data.predictedTotal.down} down</span> <span className="text-muted">— most critical tier first:</span>{" "}
                  <KeyList env={env} keys={r.predicted.down} max={30} />
                </p>
                <p>
                  <span className="font-semibold text-degraded">{data.predictedTotal.degraded} degraded:</span> <KeyList env={env} keys={r.predicted.degraded} max={30} />
                </p>
                <p className="text-xs text-muted">What the probable origins&apos; failure takes with it under the declared needs, beyond what already fires.</p>
              </div>
            </Card>
          </div>

          <SummaryCopy summary={data.summary}>
            {canWrite && <ResolveByHand env={env} number={data.incident.number} onDone={() => void current.mutate()} />}
          </SummaryCopy>

          <Card title={`Firing alerts (${data.firingAlerts.length})`}>
            <AlertsTable env={env} alerts={data.firingAlerts} show="firing" />
          </Card>
          {data.resolvedAlerts.length > 0 && (
            <Card title={`Resolved during this incident (${data.resolvedAlerts.length})`}>
              <AlertsTable env={env} alerts={data.resolvedAlerts} show="resolved" />
            </Card>
          )}
          {firingSet.size === 0 && <p className="text-sm text-muted">Every firing alert names a component this environment does not know.</p>}
        </div>
      )}

      <IncidentHistory env={env} />
    </div>
  );
}
