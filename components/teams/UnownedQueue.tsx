"use client";
// Components nobody owns, most pinching first, paged on the server (an estate can have thousands).
// A lead claims one for a team they lead; an architect or admin assigns any team. The server
// (annotateComponent) enforces the same rule; the controls are shown only to those it would accept.
import { createColumnHelper } from "@tanstack/react-table";
import Link from "next/link";
import { useMemo, useState } from "react";
import { ClaimOwner, ClaimUndo, type Claim, type OwnerViewer } from "@/components/teams/ClaimOwner";
import { Card } from "@/components/ui/Card";
import { DataTable } from "@/components/ui/data-table/DataTable";
import { ListSearch } from "@/components/ui/data-table/filters";
import { SelectField } from "@/components/ui/LabelledField";
import { useListState } from "@/components/ui/data-table/list-state";
import { OWNED_LIST, unownedResponseSchema, type UnownedComponent } from "@/lib/api/schemas/teams";
import { useApi } from "@/lib/client/api";

export type QueueViewer = OwnerViewer;

const col = createColumnHelper<UnownedComponent>();

function columns(viewer: QueueViewer, onClaimed: (c: Claim) => void, withEnvironment: boolean) {
  return [
    ...(withEnvironment ? [col.accessor("environment", { header: "Env", cell: (i) => <span className="font-mono text-xs text-muted">{i.getValue()}</span> })] : []),
    col.accessor("key", {
      header: "Component",
      meta: { fixed: true },
      cell: (i) => (
        <>
          <Link href={`/environments/${i.row.original.environment}/components/${encodeURIComponent(i.getValue())}`} className="font-mono text-sm text-ink hover:text-brass">
            {i.getValue()}
          </Link>
          <div className="text-xs text-muted">
            {i.row.original.name} · {i.row.original.kind} · tier {i.row.original.tier}
          </div>
        </>
      ),
    }),
    col.accessor("tier", { header: "Tier", meta: { numeric: true, hidden: true } }),
    col.accessor("kind", { header: "Kind", meta: { hidden: true } }),
    col.accessor("pinchScore", {
      header: "Pinch score",
      meta: { numeric: true },
      cell: (i) => (
        <>
          {i.getValue() === null ? <span className="text-faint">—</span> : i.getValue()!.toFixed(1)}
          {i.row.original.pinchPoint && <div className="text-xs text-down">top {i.row.original.pinchRank}</div>}
        </>
      ),
    }),
    col.display({ id: "owner", header: "Owner", meta: { fixed: true }, cell: (i) => <ClaimOwner env={i.row.original.environment} componentKey={i.row.original.key} viewer={viewer} onClaimed={onClaimed} /> }),
  ];
}

/** The URL's value for "every environment": the list is scoped to one environment unless asked. */
const EVERY = "all";

/**
 * Scoped to `environment` when the screen is one environment's; otherwise to the environment chosen
 * in its own filter, which starts at `defaultEnvironment` (the environment the reader came from).
 */
export function UnownedQueue({ environment, defaultEnvironment, environments = [], viewer }: { environment?: string; defaultEnvironment?: string; environments?: string[]; viewer: QueueViewer }) {
  const list = useListState(OWNED_LIST, { filters: ["q", "environment"], prefix: "unowned", pageSize: 25 });
  const query = new URLSearchParams(list.query);
  const chosen = list.filters.environment ?? defaultEnvironment ?? EVERY;
  const scope = environment ?? (chosen === EVERY ? undefined : chosen);
  if (scope) query.set("environment", scope);
  else query.delete("environment");
  const { data, error, mutate } = useApi(unownedResponseSchema, `/api/v1/teams/unowned?${query}`, { keepPreviousData: true });
  const [claim, setClaim] = useState<Claim | null>(null);
  const cols = useMemo(
    () =>
      columns(
        viewer,
        (c) => {
          setClaim(c);
          void mutate();
        },
        !scope,
      ),
    [viewer, mutate, scope],
  );
  return (
    <Card
      title={<span id="unowned">Unowned{scope ? <span className="font-mono text-muted"> · {scope}</span> : " · every environment"}</span>}
      action={
        data && (
          <span className="font-mono text-xs text-muted" data-testid="unowned-count">
            {data.total} left
          </span>
        )
      }
    >
      <p className="mb-3 text-xs text-muted">When one of these fails there is no team to page. Most pinching first; scores come from each environment&apos;s newest analysed snapshot.</p>
      <ClaimUndo
        claim={claim}
        onUndone={() => {
          setClaim(null);
          void mutate();
        }}
      />
      {data && data.total === 0 && !list.filters.q ? (
        <p className="text-sm text-ok">{scope ? `Every declared component in ${scope} has an owner.` : "Every declared component has an owner."}</p>
      ) : (
        <DataTable
          id={environment ? "unowned-environment" : "unowned"}
          caption="Components nobody owns"
          columns={cols}
          data={data?.items}
          rowKey={(c) => `${c.environment}/${c.key}`}
          rowTestId={(c) => `unowned-${c.environment}-${c.key}`}
          error={error}
          paging={{ mode: "server", list, total: data?.total }}
          noun={["component", "components"]}
          empty="No unowned component matches."
          filters={
            <>
              {!environment && environments.length > 0 && (
                <SelectField
                  label="Environment"
                  value={chosen}
                  onChange={(e) => list.setFilter("environment", e.target.value === defaultEnvironment ? null : e.target.value)}
                  options={[{ value: EVERY, label: "Every environment" }, ...environments.map((e) => ({ value: e, label: e }))]}
                />
              )}
              <ListSearch list={list} label="Find" placeholder="key or name" />
            </>
          }
        />
      )}
    </Card>
  );
}
