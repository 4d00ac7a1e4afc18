"use client";
// A what-if failure: pick components and/or zones, see what goes down or degraded, who to page.
// The chosen set lives in the URL (?fail=a,b&zones=z) so the exact drill can be shared.
import { SummaryCopy } from "@/components/ui/SummaryCopy";
import Link from "next/link";
import { useMemo, useState } from "react";
import useSWR from "swr";
import { SnapshotMeta } from "@/components/analysis/SnapshotMeta";
import { Badge } from "@/components/ui/Badge";
import { Button } from "@/components/ui/Button";
import { Card, Stat } from "@/components/ui/Card";
import { CheckField } from "@/components/ui/LabelledField";
import { MultiSelect } from "@/components/ui/MultiSelect";
import { Notice } from "@/components/ui/Notice";
import { useUrlState } from "@/components/ui/url-state";
import { drillResponseSchema, type DrillResponse } from "@/lib/api/schemas/analysis";
import { componentsResponseSchema } from "@/lib/api/schemas/components";
import { environmentResponseSchema } from "@/lib/api/schemas/environments";
import { mapGraphSchema } from "@/lib/api/schemas/map";
import { fetchJson, useApi, type ApiError } from "@/lib/client/api";
import { MiniMap } from "./MiniMap";
import { ChainView } from "@/components/analysis/Chain";
import { drillPageOrder, failedWords, incidentSummary } from "./summary";

const list = (v: string | null) => (v ? v.split(",").filter(Boolean) : []);

/** How many matches the picker offers for what was typed: a search, not the estate. */
const PICK_LIMIT = 20;

async function postDrill([url, components, zones]: [string, string[], string[]]): Promise<DrillResponse> {
  return fetchJson(drillResponseSchema, url, {
    method: "POST",
    headers: { "content-type": "application/json" },
    body: JSON.stringify({ fail: { ...(components.length ? { components } : {}), ...(zones.length ? { zones } : {}) } }),
  });
}

export function Drills({ env }: { env: string }) {
  const url = useUrlState();
  const fail = list(url.get("fail"));
  // Opened from the header's "What is down?": the same result, worded as an outage, not a rehearsal.
  const outage = url.get("down") === "1";
  const [why, setWhy] = useState<string | null>(null);
  const zones = list(url.get("zones"));
  // The picker asks the API for what was typed; zones come with the environment's summary.
  const [typed, setTyped] = useState("");
  const matches = useApi(componentsResponseSchema, `/api/v1/environments/${env}/components?${new URLSearchParams({ q: typed, limit: String(PICK_LIMIT) })}`, { keepPreviousData: true });
  const environment = useApi(environmentResponseSchema, `/api/v1/environments/${env}`);
  const hasInput = fail.length + zones.length > 0;
  const drill = useSWR<DrillResponse, ApiError>(hasInput ? [`/api/v1/environments/${env}/drills`, fail, zones] : null, postDrill, { keepPreviousData: true, revalidateOnFocus: false });
  // Tier, zones and placeholders of what went down come with the graph the mini-map draws anyway.
  const graph = useApi(mapGraphSchema, drill.data ? `/api/v1/environments/${env}/graph` : null, { revalidateOnFocus: false });

  const byKey = useMemo(() => new Map(graph.data?.nodes.map((c) => [c.key, c]) ?? []), [graph.data]);
  const undeclared = useMemo(() => new Set(graph.data?.nodes.filter((c) => c.undeclared).map((c) => c.key) ?? []), [graph.data]);
  const options = useMemo(() => matches.data?.items.map((c) => ({ value: c.key, label: c.name, hint: [c.team ?? "unowned", `tier ${c.tier}`, c.kind].join(" · ") })) ?? [], [matches.data]);
  const allZones = environment.data?.zones ?? [];

  const result = drill.data;
  const summary = result ? incidentSummary({ env, result, undeclared, outage, tierOf: (k) => byKey.get(k)?.tier, link: typeof window === "undefined" ? "" : window.location.href }) : "";
  const teams = result ? drillPageOrder(result) : [];
  const failedSet = new Set(result?.failed.components ?? []);
  const what = failedWords({ components: fail, zones });

  const keyLink = (k: string) => (
    <li key={k} className="flex flex-wrap items-center gap-1.5">
      <Link href={`/environments/${env}/components/${encodeURIComponent(k)}`} className="font-mono text-ink hover:underline">
        {k}
      </Link>
      {undeclared.has(k) && <Badge tone="undeclared" title="needed by something, declared by no source">undeclared</Badge>}
      {result?.failed.components.includes(k) && <Badge tone="down">failed</Badge>}
      {byKey.get(k) && <span className="text-xs text-muted">tier {byKey.get(k)!.tier}</span>}
      {fail.length > 0 && !failedSet.has(k) && (
        <button type="button" className="text-xs text-info underline" aria-expanded={why === k} aria-label={`Why is ${k} ${result?.down.includes(k) ? "down" : "degraded"}?`} onClick={() => setWhy(why === k ? null : k)}>
          why?
        </button>
      )}
      {why === k && (
        <div className="basis-full rounded border border-line bg-canvas p-2">
          {fail.map((f) => (
            <ChainView key={f} env={env} from={k} to={f} compact />
          ))}
        </div>
      )}
    </li>
  );

  return (
    <div className="space-y-4">
      <div>
        {outage && hasInput ? (
          <>
            <h1 className="text-2xl font-semibold tracking-tight">
              <span className="font-mono">{[...fail, ...zones.map((z) => `zone ${z}`)].join(", ")}</span> {fail.length + zones.length === 1 ? "is" : "are"} down
            </h1>
            <p className="mt-1 text-sm text-muted">What goes down with it, which tier 1 components are hit, and whom to page first. Ask “why?” beside any component to see the chain of needs.</p>
          </>
        ) : (
          <>
            <h1 className="text-2xl font-semibold tracking-tight">{hasInput ? <>Drill: if <span className="font-mono">{what}</span> {fail.length + zones.length === 1 ? "fails" : "fail"}</> : "Drills"}</h1>
            <p className="mt-1 text-sm text-muted">Fail components or whole zones on paper and see what goes with them and who to page.</p>
          </>
        )}
      </div>

      <Card title={outage ? "What is down" : "What fails"}>
        <div className="grid gap-4 md:grid-cols-[2fr_1fr]">
          <MultiSelect
            label={outage ? "Components that are down" : "Components to fail"}
            options={options}
            selected={fail}
            onChange={(next) => url.set({ fail: next.join(",") || null })}
            onText={setTyped}
            placeholder="Type a key, e.g. dns-resolver"
          />
          <fieldset className="flex flex-col gap-1">
            <legend className="mb-1 text-xs font-medium text-muted">Zones to fail</legend>
            {allZones.length === 0 && <span className="text-sm text-faint">No component declares a zone.</span>}
            {allZones.map((z) => (
              <CheckField
                key={z}
                label={<span className="font-mono">{z}</span>}
                checked={zones.includes(z)}
                onChange={(e) => url.set({ zones: (e.target.checked ? [...zones, z] : zones.filter((x) => x !== z)).join(",") || null })}
              />
            ))}
          </fieldset>
        </div>
        {hasInput && (
          <div className="mt-3">
            <Button type="button" variant="ghost" onClick={() => url.set({ fail: null, zones: null })}>
              Clear the drill
            </Button>
          </div>
        )}
      </Card>

      {!hasInput && <Notice title="Nothing failed yet">Choose one or more components or zones above. The result appears here and the address bar holds a link to this exact drill.</Notice>}
      {drill.error && (
        <Notice tone={drill.error.status === 404 ? "info" : "error"} title={drill.error.status === 404 ? "No analysed snapshot to drill on" : "The drill could not run"}>
          {drill.error.message}
        </Notice>
      )}

      {hasInput && result && (
        <div className="space-y-4" aria-busy={drill.isValidating} data-testid="drill-result">
          <SnapshotMeta meta={result} what="drill" />
          <div className="grid grid-cols-2 gap-3 md:grid-cols-6">
            <Stat label="Down (incl. what failed)" value={<span data-testid="down-count">{result.down.length}</span>} tone="down" hint="hard needs unmet" />
            <Stat label="Degraded" value={result.degraded.length} tone="degraded" hint="soft needs unmet" />
            {(["1", "2", "3", "4"] as const).map((t) => (
              <Stat key={t} label={`Tier ${t} down`} value={result.byTier[t]} tone={t === "1" && result.byTier[t] > 0 ? "down" : "ink"} />
            ))}
          </div>
          <SummaryCopy summary={summary} />

          <Card title="Affected part of the graph">
            {graph.data ? (
              <MiniMap env={env} failed={[...result.failed.components, ...result.down.filter((k) => zones.length > 0 && (byKey.get(k)?.zones ?? []).length > 0 && (byKey.get(k)?.zones ?? []).every((z) => zones.includes(z)))]} down={result.down} degraded={result.degraded} edges={graph.data.edges} undeclared={undeclared} />
            ) : (
              <p className="text-sm text-muted">{graph.error ? `Could not load the graph: ${graph.error.message}` : "Drawing…"}</p>
            )}
          </Card>

          <section aria-labelledby="teams-heading" className="space-y-3">
            <h2 id="teams-heading" className="text-lg font-semibold">
              Who to page <span className="text-sm font-normal text-muted">({result.teams.length} teams: the owners of what failed first, then the most affected; unowned last)</span>
            </h2>
            <div className="grid gap-3 lg:grid-cols-2">
              {teams.map((t, n) => (
                <section key={t.team ?? "(none)"} className="rounded-lg border border-line bg-surface p-4" data-testid="drill-team">
                  <header className="flex flex-wrap items-baseline justify-between gap-2">
                    <h3 className="font-semibold">
                      {t.team ? (
                        <>
                          <span className="mr-1.5 font-mono text-sm text-muted">{n + 1}.</span>
                          {t.contact?.name ?? t.team}
                          {t.down.some((k) => failedSet.has(k)) && (
                            <span className="ml-2">
                              <Badge tone="down">owns what failed</Badge>
                            </span>
                          )}
                        </>
                      ) : (
                        <span className="text-degraded">Unowned — nobody is paged</span>
                      )}
                    </h3>
                    <span className="text-sm text-muted">
                      <span className="text-down">{t.down.length} down</span> · <span className="text-degraded">{t.degraded.length} degraded</span>
                    </span>
                  </header>
                  {t.team && (
                    <p className="mt-1 text-sm text-muted">
                      {t.contact?.oncall ? <>On-call: <span className="text-ink">{t.contact.oncall}</span></> : "No on-call contact on file"}
                      {t.contact?.email && (
                        <>
                          {" · "}
                          <a href={`mailto:${t.contact.email}`} className="text-info underline">
                            {t.contact.email}
                          </a>
                        </>
                      )}
                    </p>
                  )}
                  {!t.team && <p className="mt-1 text-sm text-muted">Nobody is paged for these: assign owners on the teams screen.</p>}
                  <div className="mt-2 grid gap-3 sm:grid-cols-2">
                    {t.down.length > 0 && (
                      <div>
                        <h4 className="text-xs font-medium uppercase tracking-wide text-down">Down</h4>
                        <ul className="mt-1 space-y-0.5 text-sm">{t.down.map(keyLink)}</ul>
                      </div>
                    )}
                    {t.degraded.length > 0 && (
                      <div>
                        <h4 className="text-xs font-medium uppercase tracking-wide text-degraded">Degraded</h4>
                        <ul className="mt-1 space-y-0.5 text-sm">{t.degraded.map(keyLink)}</ul>
                      </div>
                    )}
                  </div>
                </section>
              ))}
            </div>
          </section>
        </div>
      )}
      {hasInput && !result && !drill.error && <p className="text-sm text-muted">Running the drill…</p>}
    </div>
  );
}
