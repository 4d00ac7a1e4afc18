"use client";
// Every component of an environment, filterable; filters live in the URL. The API filters by
// team, kind, text and ownership; tier is filtered here (the list is one environment, already loaded).
import Link from "next/link";
import { useMemo } from "react";
import useSWR from "swr";
import type { ComponentsResponse } from "@/components/rankings/api-types";
import { Badge } from "@/components/ui/Badge";
import { Button } from "@/components/ui/Button";
import { Stat } from "@/components/ui/Card";
import { CheckField, SelectField, TextField } from "@/components/ui/LabelledField";
import { Notice } from "@/components/ui/Notice";
import { useUrlState } from "@/components/ui/url-state";
import { fetchJson, type ApiError } from "@/lib/client/fetcher";
import { COMPONENT_KINDS } from "@/lib/inventory/types";

export function ComponentList({ env }: { env: string }) {
  const url = useUrlState();
  const f = { q: url.get("q") ?? "", team: url.get("team") ?? "", kind: url.get("kind") ?? "", tier: url.get("tier") ?? "", unowned: url.get("unowned") === "true" };
  const apiQuery = new URLSearchParams();
  if (f.q) apiQuery.set("q", f.q);
  if (f.team) apiQuery.set("team", f.team);
  if (f.kind) apiQuery.set("kind", f.kind);
  if (f.unowned) apiQuery.set("unowned", "true");
  const all = useSWR<ComponentsResponse, ApiError>(`/api/v1/environments/${env}/components`, fetchJson);
  const filtered = useSWR<ComponentsResponse, ApiError>(`/api/v1/environments/${env}/components?${apiQuery}`, fetchJson, { keepPreviousData: true });
  const teams = useMemo(() => [...new Set(all.data?.items.map((c) => c.team).filter((t): t is string => !!t) ?? [])].sort(), [all.data]);
  const items = useMemo(() => (filtered.data?.items ?? []).filter((c) => !f.tier || String(c.tier) === f.tier), [filtered.data, f.tier]);
  const counts = all.data?.counts;
  const error = filtered.error ?? all.error;
  const any = f.q || f.team || f.kind || f.tier || f.unowned;

  return (
    <div className="space-y-4">
      <div>
        <h1 className="text-2xl font-semibold tracking-tight">Components</h1>
        <p className="mt-1 text-sm text-muted">Everything the inventory of <span className="font-mono text-ink">{env}</span> declares, plus undeclared components (needed by something, declared by no source).</p>
      </div>
      <div className="grid grid-cols-2 gap-3 md:grid-cols-4">
        <Stat label="Components" value={counts?.components ?? "—"} hint={counts ? `${counts.dependencies} dependencies` : undefined} />
        <Stat label="Teams" value={counts?.teams ?? "—"} />
        <Stat label="Unowned" value={counts?.unowned ?? "—"} tone={counts?.unowned ? "degraded" : "ink"} hint="nobody to page" />
        <Stat label="Undeclared" value={counts?.undeclared ?? "—"} tone={counts?.undeclared ? "degraded" : "ink"} hint="needed by something, declared by no source" />
      </div>
      {error && (
        <Notice tone={error.status === 404 ? "info" : "error"} title={error.status === 404 ? "Nothing here yet" : "Could not load the components"}>
          {error.message}
        </Notice>
      )}
      <form role="search" aria-label="Filter components" className="flex flex-wrap items-end gap-3" onSubmit={(e) => e.preventDefault()}>
        <TextField label="Search key or name" type="search" defaultValue={f.q} onChange={(e) => url.set({ q: e.target.value.trim() || null })} className="w-56" />
        <SelectField label="Team" value={f.team} onChange={(e) => url.set({ team: e.target.value || null })} options={[{ value: "", label: "All teams" }, ...teams.map((t) => ({ value: t, label: t }))]} />
        <SelectField label="Kind" value={f.kind} onChange={(e) => url.set({ kind: e.target.value || null })} options={[{ value: "", label: "All kinds" }, ...[...COMPONENT_KINDS, "undeclared"].map((k) => ({ value: k, label: k }))]} />
        <SelectField label="Tier" value={f.tier} onChange={(e) => url.set({ tier: e.target.value || null })} options={[{ value: "", label: "All tiers" }, ...[1, 2, 3, 4].map((t) => ({ value: String(t), label: `Tier ${t}` }))]} />
        <div className="pb-1.5">
          <CheckField label="Unowned only" checked={f.unowned} onChange={(e) => url.set({ unowned: e.target.checked ? "true" : null })} />
        </div>
        {any && (
          <Button type="button" variant="ghost" onClick={() => url.set({ q: null, team: null, kind: null, tier: null, unowned: null })}>
            Clear filters
          </Button>
        )}
      </form>
      <p className="text-sm text-muted" role="status" data-testid="component-count">
        {filtered.data ? `${items.length} of ${counts?.components ?? "?"} components` : "Loading…"}
      </p>
      <div className="overflow-x-auto rounded-lg border border-line bg-surface" aria-busy={filtered.isValidating}>
        <table className="w-full text-sm" data-testid="components-table">
          <caption className="sr-only">Components</caption>
          <thead className="border-b border-line bg-raised text-left text-xs text-muted">
            <tr>
              <th scope="col" className="px-2 py-2 font-medium">Component</th>
              <th scope="col" className="px-2 py-2 font-medium">Kind</th>
              <th scope="col" className="px-2 py-2 font-medium">Team</th>
              <th scope="col" className="px-2 py-2 text-right font-medium">Tier</th>
              <th scope="col" className="px-2 py-2 text-right font-medium">Replicas</th>
              <th scope="col" className="px-2 py-2 font-medium">Zones</th>
              <th scope="col" className="px-2 py-2 font-medium">Source</th>
              <th scope="col" className="px-2 py-2 font-medium"><span className="sr-only">Blast radius</span></th>
            </tr>
          </thead>
          <tbody>
            {items.map((c) => (
              <tr key={c.key} className="border-b border-line/60 last:border-0 hover:bg-raised/60">
                <td className="px-2 py-1.5">
                  <Link href={`/environments/${env}/components/${encodeURIComponent(c.key)}`} className="font-mono text-ink underline decoration-line underline-offset-2 hover:decoration-brass">
                    {c.key}
                  </Link>
                  {c.name !== c.key && <span className="ml-2 text-xs text-faint">{c.name}</span>}
                </td>
                <td className="px-2 py-1.5 text-muted">{c.kind === "undeclared" ? <Badge tone="undeclared" title="needed by something, declared by no source">undeclared</Badge> : c.kind}</td>
                <td className="px-2 py-1.5">{c.team ?? (c.kind === "undeclared" ? <span className="text-faint">—</span> : <Badge tone="degraded">unowned</Badge>)}</td>
                <td className="px-2 py-1.5 text-right font-mono tabular-nums">{c.tier}</td>
                <td className="px-2 py-1.5 text-right font-mono tabular-nums">{c.replicas}</td>
                <td className="px-2 py-1.5 font-mono text-xs text-muted">
                  {c.zones.join(", ") || "—"} {c.kind !== "undeclared" && c.singlePoint && <Badge tone="degraded" title="One replica or fewer than two zones">single</Badge>}
                </td>
                <td className="px-2 py-1.5 font-mono text-xs text-muted">{c.source ?? "—"}</td>
                <td className="px-2 py-1.5 text-right">
                  <Link href={`/environments/${env}/drills?fail=${encodeURIComponent(c.key)}`} aria-label={`Blast radius of ${c.key}`} className="whitespace-nowrap rounded border border-line px-2 py-0.5 text-xs text-muted hover:border-brass hover:text-ink">
                    Blast radius
                  </Link>
                </td>
              </tr>
            ))}
            {filtered.data && items.length === 0 && (
              <tr>
                <td colSpan={8} className="px-3 py-6 text-center text-muted">No component matches these filters.</td>
              </tr>
            )}
          </tbody>
        </table>
      </div>
    </div>
  );
}
