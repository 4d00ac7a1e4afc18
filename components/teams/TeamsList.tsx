"use client";
// Every team with its contact, people and how much of the estate it owns; admins add teams here.
import { createColumnHelper } from "@tanstack/react-table";
import Link from "next/link";
import { useState } from "react";
import { Button } from "@/components/ui/Button";
import { Card } from "@/components/ui/Card";
import { DataTable } from "@/components/ui/data-table/DataTable";
import { ApiForm, FormProblem, SubmitButton, submitWith, useApiForm } from "@/components/ui/form/api-form";
import { InputField } from "@/components/ui/form/fields";
import { createTeamSchema, teamRecordSchema, teamsResponseSchema, type TeamOverview } from "@/lib/api/schemas/teams";
import { sendJson, useApi } from "@/lib/client/api";

function CreateTeam({ onCreated }: { onCreated: () => void }) {
  const [open, setOpen] = useState(false);
  const form = useApiForm(createTeamSchema, { slug: "", name: "", email: null, oncall: null, description: null });
  if (!open) return <Button onClick={() => setOpen(true)}>New team</Button>;
  const onSubmit = submitWith(
    form,
    (values) => sendJson(teamRecordSchema, "/api/v1/teams", "POST", values),
    () => {
      form.reset();
      setOpen(false);
      onCreated();
    },
  );
  return (
    <ApiForm form={form} onSubmit={onSubmit} label="New team" className="grid w-full gap-3 rounded-md border border-line bg-raised p-3 md:grid-cols-5">
      <InputField name="slug" label="Slug" placeholder="loyalty" controlClassName="font-mono" autoComplete="off" spellCheck={false} />
      <InputField name="name" label="Name" placeholder="Loyalty" />
      <InputField name="email" label="E-mail" type="email" blank="null" />
      <InputField name="oncall" label="On-call" placeholder="rota, phone or channel" blank="null" />
      <InputField name="description" label="Description" blank="null" />
      <div className="flex flex-wrap items-center gap-2 md:col-span-5">
        <SubmitButton working="Creating…">Create team</SubmitButton>
        <Button type="button" variant="ghost" onClick={() => setOpen(false)}>
          Cancel
        </Button>
        <FormProblem className="flex-1" />
      </div>
    </ApiForm>
  );
}

const col = createColumnHelper<TeamOverview>();

const COLUMNS = [
  col.accessor("name", {
    header: "Team",
    meta: { fixed: true },
    cell: (i) => (
      <>
        <Link href={`/teams/${i.row.original.slug}`} className="font-medium text-ink hover:text-brass">
          {i.getValue()}
        </Link>
        <div className="font-mono text-xs text-faint">{i.row.original.slug}</div>
      </>
    ),
  }),
  col.accessor((t) => t.email ?? "", { id: "email", header: "E-mail", cell: (i) => <span className="text-muted">{i.getValue() || <span className="text-faint">none</span>}</span> }),
  col.accessor((t) => t.oncall ?? "", { id: "oncall", header: "On-call", cell: (i) => <span className="text-muted">{i.getValue() || <span className="text-degraded">nobody to page</span>}</span> }),
  col.accessor("memberCount", {
    header: "People",
    meta: { numeric: true },
    cell: (i) => (
      <>
        {i.getValue()}
        {i.row.original.leadCount === 0 && i.getValue() > 0 && <div className="text-xs text-degraded">no lead</div>}
      </>
    ),
  }),
  col.accessor("componentCount", { header: "Components", meta: { numeric: true } }),
  col.accessor("pinchPointCount", {
    header: "In top 10 by pinch score",
    meta: { numeric: true, help: "components in their environment's top 10 by pinch score" },
    cell: (i) => <span className={i.getValue() > 0 ? "text-down" : "text-muted"}>{i.getValue()}</span>,
  }),
  col.accessor((t) => t.description ?? "", { id: "description", header: "Description", meta: { hidden: true }, cell: (i) => <span className="text-xs text-muted">{i.getValue() || "—"}</span> }),
];

export function TeamsList({ isAdmin }: { isAdmin: boolean }) {
  const { data, error, mutate } = useApi(teamsResponseSchema, "/api/v1/teams");
  return (
    <Card title="Teams" action={isAdmin && <CreateTeam onCreated={() => void mutate()} />}>
      <DataTable
        id="teams"
        testId="teams-table"
        caption="Teams"
        columns={COLUMNS}
        data={data?.items}
        rowKey={(t) => t.slug}
        error={error}
        paging={{ mode: "client", pageSize: 25, initialSort: [{ id: "name", desc: false }], search: { label: "Find a team", placeholder: "name, slug or contact" } }}
        noun={["team", "teams"]}
        empty="No team yet."
      />
      {data && (
        <p className="mt-3 text-xs text-muted" data-testid="unowned-total">
          {data.unownedCount} component{data.unownedCount === 1 ? "" : "s"} in all environments are unowned.
        </p>
      )}
    </Card>
  );
}
