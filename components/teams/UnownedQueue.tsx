"use client";
// Components nobody owns, most pinching first, paged on the server (an estate can have thousands).
// A lead claims one for a team they lead; an architect or admin assigns any team. The server
// (annotateComponent) enforces the same rule; the controls are shown only to those it would accept.
import { createColumnHelper } from "@tanstack/react-table";
import Link from "next/link";
import { useMemo } from "react";
import { z } from "zod";
import { Card } from "@/components/ui/Card";
import { DataTable } from "@/components/ui/data-table/DataTable";
import { ListSearch } from "@/components/ui/data-table/filters";
import { useListState } from "@/components/ui/data-table/list-state";
import { ApiForm, FormProblem, SubmitButton, submitWith, useApiForm } from "@/components/ui/form/api-form";
import { SelectInput } from "@/components/ui/form/fields";
import { slugSchema } from "@/lib/api/schemas/common";
import { annotationResultSchema } from "@/lib/api/schemas/components";
import { OWNED_LIST, unownedResponseSchema, type UnownedComponent } from "@/lib/api/schemas/teams";
import { sendJson, useApi } from "@/lib/client/api";

export interface QueueViewer {
  /** slugs of the teams the viewer leads */
  ledTeams: string[];
  /** architects and admins may assign any team */
  assignAny: boolean;
  /** every team slug and name, for the assign choice */
  teams: Array<{ slug: string; name: string }>;
}

/** An owner for one component: the team part of PATCH …/components/{key}, required here. */
const assignSchema = z.object({ team: slugSchema.or(z.literal("")).refine((t) => t !== "", "choose a team") });

function Assign({ item, viewer, onDone }: { item: UnownedComponent; viewer: QueueViewer; onDone: () => void }) {
  const choices = viewer.assignAny ? viewer.teams : viewer.teams.filter((t) => viewer.ledTeams.includes(t.slug));
  // Architects pick deliberately (no preselected team to assign by accident); a lead of one team has one choice.
  const form = useApiForm(assignSchema, { team: viewer.assignAny || choices.length > 1 ? "" : (choices[0]?.slug ?? "") });
  if (choices.length === 0) return <span className="text-xs text-faint">a team lead or architect assigns an owner</span>;
  const onSubmit = submitWith(form, (v) => sendJson(annotationResultSchema, `/api/v1/environments/${item.environment}/components/${encodeURIComponent(item.key)}`, "PATCH", { team: v.team }), onDone);
  const verb = viewer.assignAny ? "Assign" : "Claim";
  return (
    <ApiForm form={form} onSubmit={onSubmit} label={`${verb} ${item.key}`} className="flex flex-wrap items-start gap-2">
      {choices.length === 1 && !viewer.assignAny ? (
        <span className="pt-1.5 text-xs text-muted">for {choices[0]?.name}</span>
      ) : (
        <SelectInput
          name="team"
          label={<span className="sr-only">Team for {item.key}</span>}
          options={[{ value: "", label: "choose a team…" }, ...choices.map((t) => ({ value: t.slug, label: t.name }))]}
          controlClassName="w-auto min-w-40"
        />
      )}
      <SubmitButton working="Saving…" label={`${verb} ${item.key}`}>
        {verb}
      </SubmitButton>
      <FormProblem className="w-full" />
    </ApiForm>
  );
}

const col = createColumnHelper<UnownedComponent>();

function columns(viewer: QueueViewer, onDone: () => void, withEnvironment: boolean) {
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
    col.display({ id: "owner", header: "Owner", meta: { fixed: true }, cell: (i) => <Assign item={i.row.original} viewer={viewer} onDone={onDone} /> }),
  ];
}

export function UnownedQueue({ environment, viewer }: { environment?: string; viewer: QueueViewer }) {
  const list = useListState(OWNED_LIST, { filters: ["q"], prefix: "unowned", pageSize: 25 });
  const query = new URLSearchParams(list.query);
  if (environment) query.set("environment", environment);
  const { data, error, mutate } = useApi(unownedResponseSchema, `/api/v1/teams/unowned?${query}`, { keepPreviousData: true });
  const cols = useMemo(() => columns(viewer, () => void mutate(), !environment), [viewer, mutate, environment]);
  return (
    <Card
      title={<span>Unowned{environment ? <span className="font-mono text-muted"> · {environment}</span> : " · every environment"}</span>}
      action={
        data && (
          <span className="font-mono text-xs text-muted" data-testid="unowned-count">
            {data.total} left
          </span>
        )
      }
    >
      <p className="mb-3 text-xs text-muted">When one of these fails there is no team to page. Most pinching first; scores come from each environment&apos;s newest analysed snapshot.</p>
      {data && data.total === 0 && !list.filters.q ? (
        <p className="text-sm text-ok">Every declared component has an owner.</p>
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
          filters={<ListSearch list={list} label="Find" placeholder="key or name" />}
        />
      )}
    </Card>
  );
}
