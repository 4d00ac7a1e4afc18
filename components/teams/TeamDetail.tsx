"use client";
// One team: who to page, who is in it, what it owns in every environment and which of those are
// pinch points. Leads of the team edit its contact details; admins also manage its people.
import Link from "next/link";
import { useState } from "react";
import useSWR from "swr";
import { Button } from "@/components/ui/Button";
import { Card } from "@/components/ui/Card";
import { FormError, Label, TextArea, TextInput } from "@/components/ui/Field";
import { sendJson } from "@/components/ui/send-json";
import { fetchJson, type ApiError } from "@/lib/client/fetcher";
import type { TeamComponent, TeamDetail as TeamDetailData } from "@/lib/data/team-admin";

function ContactForm({ team, canRename, onSaved, onCancel }: { team: TeamDetailData; canRename: boolean; onSaved: () => void; onCancel: () => void }) {
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  async function submit(form: FormData) {
    setBusy(true);
    const body: Record<string, string> = {
      email: String(form.get("email") ?? ""),
      oncall: String(form.get("oncall") ?? ""),
      description: String(form.get("description") ?? ""),
    };
    if (canRename) body.name = String(form.get("name") ?? "");
    const res = await sendJson(`/api/v1/teams/${team.slug}`, "PATCH", body);
    setBusy(false);
    if (!res.ok) return setError(res.message);
    onSaved();
  }
  return (
    <form action={submit} className="space-y-3" aria-label="Edit team contact">
      {canRename && (
        <div>
          <Label htmlFor="team-name">Name</Label>
          <TextInput id="team-name" name="name" defaultValue={team.name} required />
        </div>
      )}
      <div>
        <Label htmlFor="team-email">E-mail</Label>
        <TextInput id="team-email" name="email" type="email" defaultValue={team.email ?? ""} />
      </div>
      <div>
        <Label htmlFor="team-oncall" hint="a rota name, a phone number or a channel">
          On-call contact
        </Label>
        <TextInput id="team-oncall" name="oncall" defaultValue={team.oncall ?? ""} />
      </div>
      <div>
        <Label htmlFor="team-description">Description</Label>
        <TextArea id="team-description" name="description" rows={3} defaultValue={team.description ?? ""} />
      </div>
      <FormError message={error} />
      <div className="flex gap-2">
        <Button type="submit" variant="primary" disabled={busy}>
          Save
        </Button>
        <Button type="button" variant="ghost" onClick={onCancel}>
          Cancel
        </Button>
      </div>
    </form>
  );
}

function Members({ team, isAdmin, onChanged }: { team: TeamDetailData; isAdmin: boolean; onChanged: () => void }) {
  const [error, setError] = useState<string | null>(null);
  async function run(p: ReturnType<typeof sendJson>) {
    const res = await p;
    setError(res.ok ? null : res.message);
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
                <Button variant="ghost" onClick={() => void run(sendJson(`/api/v1/teams/${team.slug}/members`, "POST", { email: m.email, lead: !m.isLead }))}>
                  {m.isLead ? "Not lead" : "Make lead"}
                </Button>
                <Button variant="danger" onClick={() => void run(sendJson(`/api/v1/teams/${team.slug}/members/${m.userId}`, "DELETE"))} aria-label={`Remove ${m.email}`}>
                  Remove
                </Button>
              </div>
            )}
          </li>
        ))}
      </ul>
      {isAdmin && (
        <form
          className="mt-3 flex flex-wrap items-end gap-2 border-t border-line pt-3"
          action={(form) => void run(sendJson(`/api/v1/teams/${team.slug}/members`, "POST", { email: String(form.get("email") ?? ""), lead: form.get("lead") === "on" }))}
        >
          <div className="min-w-56 flex-1">
            <Label htmlFor="add-member">Add a person by e-mail</Label>
            <TextInput id="add-member" name="email" type="email" required placeholder="name@harbor-pantry.example" />
          </div>
          <label className="flex items-center gap-1.5 pb-2 text-sm text-muted">
            <input type="checkbox" name="lead" /> lead
          </label>
          <Button type="submit">Add</Button>
        </form>
      )}
      <div className="mt-2">
        <FormError message={error} />
      </div>
    </Card>
  );
}

function ComponentsTable({ items, empty }: { items: TeamComponent[]; empty: string }) {
  if (!items.length) return <p className="text-sm text-muted">{empty}</p>;
  return (
    <div className="overflow-x-auto">
      <table className="w-full text-left text-sm">
        <thead className="text-xs uppercase tracking-wide text-faint">
          <tr>
            <th className="pb-1 pr-3 font-medium">Env</th>
            <th className="pb-1 pr-3 font-medium">Component</th>
            <th className="pb-1 pr-3 font-medium">Tier</th>
            <th className="pb-1 pr-3 text-right font-medium">Pinch score</th>
            <th className="pb-1 pr-3 text-right font-medium" title="place by pinch score in its environment">
              Rank by pinch score
            </th>
            <th className="pb-1 text-right font-medium" title="place by betweenness, the default ranking">
              Rank by betweenness
            </th>
          </tr>
        </thead>
        <tbody>
          {items.map((c) => (
            <tr key={`${c.environment}/${c.key}`} className="border-t border-line">
              <td className="py-1.5 pr-3 font-mono text-xs text-muted">{c.environment}</td>
              <td className="py-1.5 pr-3">
                <Link href={`/environments/${c.environment}/components/${c.key}`} className="font-mono text-ink hover:text-brass">
                  {c.key}
                </Link>
                <span className="ml-2 text-xs text-muted">{c.kind}</span>
              </td>
              <td className="py-1.5 pr-3 font-mono tabular-nums">{c.tier}</td>
              <td className={`py-1.5 pr-3 text-right font-mono tabular-nums ${c.pinchPoint ? "text-down" : ""}`}>{c.pinchScore === null ? "—" : c.pinchScore.toFixed(1)}</td>
              <td className="py-1.5 pr-3 text-right font-mono tabular-nums">{c.pinchRank ?? "—"}</td>
              <td className="py-1.5 text-right font-mono tabular-nums">{c.rank ?? "—"}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

export function TeamDetail({ slug, canEdit, isAdmin }: { slug: string; canEdit: boolean; isAdmin: boolean }) {
  const { data: team, error, mutate } = useSWR<TeamDetailData, ApiError>(`/api/v1/teams/${slug}`, fetchJson);
  const [editing, setEditing] = useState(false);
  if (error?.status === 404) return <Card title="No such team"><p className="text-muted">There is no team <span className="font-mono text-ink">{slug}</span>. <Link className="text-brass" href="/teams">All teams</Link></p></Card>;
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
                <dd>{team.email ? <a className="font-mono text-info hover:underline" href={`mailto:${team.email}`}>{team.email}</a> : <span className="text-muted">none</span>}</dd>
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
        <ComponentsTable items={team.pinchPoints} empty="None of this team's components is in its environment's top 10." />
      </Card>
      <Card title={`Components (${team.components.length})`}>
        <ComponentsTable items={team.components} empty="This team owns no components yet." />
      </Card>
    </div>
  );
}
