"use client";
// Every component of an environment, one page at a time: sorted, filtered and paged by the API,
// the view kept in the URL. An estate of tens of thousands of components loads one page.
import { createColumnHelper } from "@tanstack/react-table";
import Link from "next/link";
import { useMemo, useState } from "react";
import { ClaimOwner, ClaimUndo, ownerChoices, type Claim, type OwnerViewer } from "@/components/teams/ClaimOwner";
import { Badge } from "@/components/ui/Badge";
import { Button } from "@/components/ui/Button";
import { Stat } from "@/components/ui/Card";
import { DataTable } from "@/components/ui/data-table/DataTable";
import { ListCheck, ListSearch, ListSelect } from "@/components/ui/data-table/filters";
import { useListState } from "@/components/ui/data-table/list-state";
import { Notice } from "@/components/ui/Notice";
import { COMPONENT_LIST, componentsResponseSchema, type ComponentListItem } from "@/lib/api/schemas/components";
import { teamsResponseSchema } from "@/lib/api/schemas/teams";
import { useApi } from "@/lib/client/api";
import { COMPONENT_KINDS } from "@/lib/inventory/types";
import { COMPONENT_FILTERS, COMPONENT_PAGE_SIZE, componentsUrl } from "./list";

const col = createColumnHelper<ComponentListItem>();

const componentHref = (env: string, key: string) => `/environments/${env}/components/${encodeURIComponent(key)}`;

function columns(env: string, viewer: OwnerViewer | undefined, onClaimed: (c: Claim) => void) {
  const mayClaim = viewer !== undefined && ownerChoices(viewer).length > 0;
  return [
    col.accessor("key", {
      header: "Component",
      meta: { fixed: true },
      cell: (i) => (
        <>
          <Link href={componentHref(env, i.getValue())} className="font-mono text-ink underline decoration-line underline-offset-2 hover:decoration-brass">
            {i.getValue()}
          </Link>
          {i.row.original.name !== i.getValue() && <span className="ml-2 text-xs text-faint">{i.row.original.name}</span>}
        </>
      ),
    }),
    col.accessor("name", { header: "Name", meta: { hidden: true } }),
    col.accessor("kind", {
      header: "Kind",
      cell: (i) => (i.getValue() === "undeclared" ? <Badge tone="undeclared" title="needed by something, declared by no source">undeclared</Badge> : <span className="text-muted">{i.getValue()}</span>),
    }),
    col.accessor("team", {
      header: "Team",
      cell: (i) =>
        i.getValue() ??
        (i.row.original.kind === "undeclared" ? (
          <span className="text-muted">—</span>
        ) : (
          <div className="flex flex-wrap items-center gap-2">
            <Badge tone="degraded">unowned</Badge>
            {mayClaim && <ClaimOwner env={env} componentKey={i.row.original.key} viewer={viewer} onClaimed={onClaimed} />}
          </div>
        )),
    }),
    col.accessor("tier", { header: "Tier", meta: { numeric: true } }),
    col.accessor("replicas", { header: "Replicas", meta: { numeric: true } }),
    col.accessor("zones", {
      header: "Zones",
      enableSorting: false,
      cell: (i) => (
        <span className="font-mono text-xs text-muted">
          {i.getValue().join(", ") || "—"}{" "}
          {i.row.original.kind !== "undeclared" && i.row.original.singlePoint && (
            <Badge tone="degraded" title="One replica or fewer than two zones">
              single
            </Badge>
          )}
        </span>
      ),
    }),
    col.accessor("source", { header: "Source", cell: (i) => <span className="font-mono text-xs text-muted">{i.getValue() ?? "—"}</span> }),
    col.accessor("tags", { header: "Tags", enableSorting: false, meta: { hidden: true }, cell: (i) => <span className="text-xs text-muted">{i.getValue().join(", ") || "—"}</span> }),
    col.display({
      id: "drill",
      header: () => <span className="sr-only">Blast radius</span>,
      meta: { label: "Blast radius link", numeric: true },
      cell: (i) => (
        <Link
          href={`/environments/${env}/drills?fail=${encodeURIComponent(i.row.original.key)}`}
          aria-label={`Blast radius of ${i.row.original.key}`}
          className="whitespace-nowrap rounded border border-line px-2 py-0.5 font-sans text-xs text-muted hover:border-brass hover:text-ink"
        >
          Blast radius
        </Link>
      ),
    }),
  ];
}

export function ComponentList({ env, viewer }: { env: string; viewer?: OwnerViewer }) {
  const list = useListState(COMPONENT_LIST, { filters: COMPONENT_FILTERS, pageSize: COMPONENT_PAGE_SIZE });
  // The page (app/(app)/environments/[env]/components/page.tsx) puts the first answer in swr's
  // cache under this URL, so the first rows come with the HTML.
  const page = useApi(componentsResponseSchema, componentsUrl(env, list.query), { keepPreviousData: true });
  const teams = useApi(teamsResponseSchema, "/api/v1/teams");
  const [claim, setClaim] = useState<Claim | null>(null);
  const { mutate } = page;
  const cols = useMemo(
    () =>
      columns(env, viewer, (c) => {
        setClaim(c);
        void mutate();
      }),
    [env, viewer, mutate],
  );
  const counts = page.data?.counts;
  const error = page.error;
  const filtered = Object.keys(list.filters).length > 0;

  return (
    <div className="space-y-4">
      <div>
        <h1 className="text-2xl font-semibold tracking-tight">Components</h1>
        <p className="mt-1 text-sm text-muted">
          Everything the inventory of <span className="font-mono text-ink">{env}</span> declares, plus undeclared components (needed by something, declared by no source).
        </p>
      </div>
      <div className="grid grid-cols-2 gap-3 md:grid-cols-4">
        <Stat label="Components" value={counts?.components.toLocaleString() ?? "—"} hint={counts ? `${counts.dependencies.toLocaleString()} dependencies` : undefined} />
        <Stat label="Teams" value={counts?.teams ?? "—"} />
        <Stat label="Unowned" value={counts?.unowned.toLocaleString() ?? "—"} tone={counts?.unowned ? "degraded" : "ink"} hint="nobody to page" />
        <Stat label="Undeclared" value={counts?.undeclared.toLocaleString() ?? "—"} tone={counts?.undeclared ? "degraded" : "ink"} hint="needed by something, declared by no source" />
      </div>
      <ClaimUndo
        claim={claim}
        onUndone={() => {
          setClaim(null);
          void mutate();
        }}
      />
      {error && (
        <Notice tone={error.status === 404 ? "info" : "error"} title={error.status === 404 ? "Nothing here yet" : "Could not load the components"}>
          {error.message}
        </Notice>
      )}
      <DataTable
        id="components"
        testId="components-table"
        caption="Components"
        columns={cols}
        data={page.data?.items}
        rowKey={(c) => c.key}
        error={error}
        loading={page.isValidating}
        paging={{ mode: "server", list, total: page.data?.total }}
        noun={["component", "components"]}
        empty="No component matches these filters."
        filters={
          <form role="search" aria-label="Filter components" className="flex flex-wrap items-end gap-3" onSubmit={(e) => e.preventDefault()}>
            <ListSearch list={list} label="Search key or name" placeholder="e.g. session" />
            <ListSelect list={list} name="team" label="Team" all="All teams" options={(teams.data?.items ?? []).map((t) => ({ value: t.slug, label: t.name }))} />
            <ListSelect list={list} name="kind" label="Kind" all="All kinds" options={[...COMPONENT_KINDS, "undeclared"].map((k) => ({ value: k, label: k }))} />
            <ListSelect list={list} name="tier" label="Tier" all="All tiers" options={[1, 2, 3, 4].map((t) => ({ value: String(t), label: `Tier ${t}` }))} />
            <ListCheck list={list} name="unowned" label="Unowned only" />
            {filtered && (
              <Button type="button" variant="ghost" onClick={list.clearFilters}>
                Clear filters
              </Button>
            )}
          </form>
        }
      />
    </div>
  );
}
