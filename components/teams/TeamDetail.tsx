"use client";
// One team: who to page, who is in it, what it owns in every environment and which of those are
// pinch points. Leads of the team edit its contact details; admins also manage its people.
import { createColumnHelper } from "@tanstack/react-table";
import Link from "next/link";
import { useState } from "react";
import { Button } from "@/components/ui/Button";
import { Card } from "@/components/ui/Card";
import { DataTable } from "@/components/ui/data-table/DataTable";
import { ListSearch } from "@/components/ui/data-table/filters";
import { useListState } from "@/components/ui/data-table/list-state";
import { FormError } from "@/components/ui/Field";
import { ApiForm, FormProblem, SubmitButton, submitWith, useApiForm } from "@/components/ui/form/api-form";
import { CheckboxField, InputField, TextAreaField } from "@/components/ui/form/fields";
import {
  addMemberSchema,
  memberRemovedSchema,
  OWNED_LIST,
  teamDetailSchema,
  teamMemberSchema,
  teamRecordSchema,
  updateTeamSchema,
  type TeamComponent,
  type TeamDetail as TeamDetailData,
} from "@/lib/api/schemas/teams";
import { sendJson, useApi, type ApiError } from "@/lib/client/api";

function ContactForm({ team, canRename, onSaved, onCancel }: { team: TeamDetailData; canRename: boolean; onSaved: () => void; onCancel: () => void }) {
  // A lead may not send the name at all (the server refuses it), so it is left out unless admins edit.
  const form = useApiForm(updateTeamSchema, { ...(canRename ? { name: team.name } : {}), email: team.email, oncall: team.oncall, description: team.description });
  const onSubmit = submitWith(form, (values) => sendJson(teamRecordSchema, `/api/v1/teams/${team.slug}`, "PATCH", values), onSaved);
  return (
    <ApiForm form={form} onSubmit={onSubmit} label="Edit team contact" className="space-y-3">
      {canRename && <InputField name="name" label="Name" />}
      <InputField name="email" label="E-mail" type="email" blank="null" />
      <InputField name="oncall" label="On-call contact" hint="a rota name, a phone number or a channel" blank="null" />
      <TextAreaField name="description" label="Description" rows={3} blank="null" />
      <FormProblem />
      <div className="flex gap-2">
        <SubmitButton working="Saving…">Save</SubmitButton>
        <Button type="button" variant="ghost" onClick={onCancel}>
          Cancel
        </Button>
      </div>
    </ApiForm>
  );
}

function AddMember({ slug, onAdded }: { slug: string; onAdded: () => void }) {
  const form = useApiForm(addMemberSchema, { email: "", lead: false });
  const onSubmit = submitWith(
    form,
    (values) => sendJson(teamMemberSchema, `/api/v1/teams/${slug}/members`, "POST", values),
    () => {
      form.reset();
      onAdded();
    },
  );
  return (
    <ApiForm form={form} onSubmit={onSubmit} label="Add a person" className="mt-3 flex flex-wrap items-start gap-3 border-t border-line pt-3">
      <InputField name="email" label="Add a person by e-mail" type="email" placeholder="name@harbor-pantry.example" className="min-w-56 flex-1" />
      <div className="pt-7">
        <CheckboxField name="lead" label="lead" />
      </div>
      <div className="pt-5">
        <SubmitButton variant="secondary" working="Adding…">
          Add
        </SubmitButton>
      </div>
      <FormProblem className="w-full" />
    </ApiForm>
  );
}

function Members({ team, isAdmin, onChanged }: { team: TeamDetailData; isAdmin: boolean; onChanged: () => void }) {
  const [error, setError] = useState<ApiError | null>(null);
  async function run(p: Promise<{ ok: true } | { ok: false; error: ApiError }>) {
    const res = await p;
    setError(res.ok ? null : res.error);
    if (res.ok) onChanged();
  }
  return (
    <Card title={`People (${team.members.length})`}>
      {team.members.length === 0 && <p className="text-sm text-muted">Nobody is in this team yet.</p>}
      <ul className="divide-y divide-line" data-testid="team-members">
        {team.members.map((m) => (
          <li key={m.userId} className="flex flex-wrap items-center gap-2 py-2">
            <div className="min-w-0 flex-1">
              <div className="text-sm text-ink">
                {m.name}
                {m.isLead && <span className="ml-2 rounded border border-brass/60 px-1.5 py-0.5 text-xs text-brass">lead</span>}
              </div>
              <div className="truncate font-mono text-xs text-muted">{m.email}</div>
            </div>
            {isAdmin && (
              <div className="flex gap-1">
                <Button variant="ghost" onClick={() => void run(sendJson(teamMemberSchema, `/api/v1/teams/${team.slug}/members`, "POST", { email: m.email, lead: !m.isLead }))}>
                  {/* Named per row ("Make Noor Harbison lead"), read the same as it is seen. */}
                  {m.isLead ? <>Not lead<span className="sr-only">: {m.name}</span></> : <>Make <span className="sr-only">{m.name} </span>lead</>}
                </Button>
                <Button variant="danger" onClick={() => void run(sendJson(memberRemovedSchema, `/api/v1/teams/${team.slug}/members/${m.userId}`, "DELETE"))} aria-label={`Remove ${m.email}`}>
                  Remove
                </Button>
              </div>
            )}
          </li>
        ))}
      </ul>
      {isAdmin && <AddMember slug={team.slug} onAdded={onChanged} />}
      <div className="mt-2">
        <FormError message={error?.detail} />
      </div>
    </Card>
  );
}

const col = createColumnHelper<TeamComponent>();

const COMPONENT_COLUMNS = [
  col.accessor("environment", { header: "Env", cell: (i) => <span className="font-mono text-xs text-muted">{i.getValue()}</span> }),
  col.accessor("key", {
    header: "Component",
    meta: { fixed: true },
    cell: (i) => (
      <>
        <Link href={`/environments/${i.row.original.environment}/components/${encodeURIComponent(i.getValue())}`} className="font-mono text-ink hover:text-brass">
          {i.getValue()}
        </Link>
        <span className="ml-2 text-xs text-muted">{i.row.original.kind}</span>
      </>
    ),
  }),
  col.accessor("kind", { header: "Kind", meta: { hidden: true } }),
  col.accessor("tier", { header: "Tier", meta: { numeric: true } }),
  col.accessor("pinchScore", {
    header: "Pinch score",
    meta: { numeric: true },
    cell: (i) => <span className={i.row.original.pinchPoint ? "text-down" : ""}>{i.getValue() === null ? "—" : i.getValue()!.toFixed(1)}</span>,
  }),
  col.accessor("pinchRank", { header: "Rank by pinch score", enableSorting: false, meta: { numeric: true, help: "place by pinch score in its environment" }, cell: (i) => i.getValue() ?? "—" }),
  col.accessor("rank", { header: "Rank by betweenness", enableSorting: false, meta: { numeric: true, help: "place by betweenness, the default ranking" }, cell: (i) => i.getValue() ?? "—" }),
];

export function TeamDetail({ slug, canEdit, isAdmin }: { slug: string; canEdit: boolean; isAdmin: boolean }) {
  const list = useListState(OWNED_LIST, { filters: ["q"], pageSize: 25 });
  const { data: team, error, mutate } = useApi(teamDetailSchema, `/api/v1/teams/${slug}?${list.query}`, { keepPreviousData: true });
  const [editing, setEditing] = useState(false);
  if (error?.status === 404)
    return (
      <Card title="No such team">
        <p className="text-muted">
          There is no team <span className="font-mono text-ink">{slug}</span>.{" "}
          <Link className="text-brass" href="/teams">
            All teams
          </Link>
        </p>
      </Card>
    );
  if (error) return <FormError message={`Could not load the team: ${error.message}`} />;
  if (!team) return <p className="text-sm text-muted">Loading…</p>;
  return (
    <div className="space-y-6">
      <div>
        <Link href="/teams" className="text-xs text-muted hover:text-ink">
          ← All teams
        </Link>
        <h1 className="mt-1 text-2xl font-semibold tracking-tight">{team.name}</h1>
        <p className="font-mono text-xs text-faint">{team.slug}</p>
      </div>
      <div className="grid gap-6 lg:grid-cols-3">
        <Card title="Who to call" action={canEdit && !editing && <Button onClick={() => setEditing(true)}>Edit</Button>}>
          {editing ? (
            <ContactForm
              team={team}
              canRename={isAdmin}
              onCancel={() => setEditing(false)}
              onSaved={() => {
                setEditing(false);
                void mutate();
              }}
            />
          ) : (
            <dl className="space-y-3 text-sm" data-testid="team-contact">
              <div>
                <dt className="text-xs uppercase tracking-wide text-faint">On-call</dt>
                <dd className={team.oncall ? "text-lg font-semibold text-ink" : "text-degraded"}>{team.oncall ?? "No on-call contact: nobody to page"}</dd>
              </div>
              <div>
                <dt className="text-xs uppercase tracking-wide text-faint">E-mail</dt>
                <dd>
                  {team.email ? (
                    <a className="font-mono text-info hover:underline" href={`mailto:${team.email}`}>
                      {team.email}
                    </a>
                  ) : (
                    <span className="text-muted">none</span>
                  )}
                </dd>
              </div>
              {team.description && (
                <div>
                  <dt className="text-xs uppercase tracking-wide text-faint">What they look after</dt>
                  <dd className="text-muted">{team.description}</dd>
                </div>
              )}
            </dl>
          )}
        </Card>
        <div className="lg:col-span-2">
          <Members team={team} isAdmin={isAdmin} onChanged={() => void mutate()} />
        </div>
      </div>
      <Card title={`Top 10 by pinch score (${team.pinchPoints.length} of this team's)`}>
        <p className="mb-3 text-xs text-muted">This team&apos;s components in their environment&apos;s top 10 by pinch score. Scores are only as good as the inventory pushed.</p>
        <DataTable
          id="team-pinch-points"
          caption="This team's pinch points"
          columns={COMPONENT_COLUMNS}
          data={team.pinchPoints}
          rowKey={(c) => `${c.environment}/${c.key}`}
          paging={{ mode: "client", pageSize: 25, initialSort: [{ id: "pinchScore", desc: true }] }}
          noun={["component", "components"]}
          empty="None of this team's components is in its environment's top 10."
        />
      </Card>
      <Card title={`Components (${team.components.total})`}>
        <DataTable
          id="team-components"
          caption="Components this team owns"
          columns={COMPONENT_COLUMNS}
          data={team.components.items}
          rowKey={(c) => `${c.environment}/${c.key}`}
          paging={{ mode: "server", list, total: team.components.total }}
          noun={["component", "components"]}
          empty={list.filters.q ? "No component of this team matches." : "This team owns no components yet."}
          filters={<ListSearch list={list} label="Find" placeholder="key or name" />}
        />
      </Card>
    </div>
  );
}
