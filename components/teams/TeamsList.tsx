"use client";
// Every team with its contact, people and how much of the estate it owns; admins add teams here.
import Link from "next/link";
import { useState } from "react";
import useSWR from "swr";
import { Button } from "@/components/ui/Button";
import { Card } from "@/components/ui/Card";
import { FormError, Label, TextInput } from "@/components/ui/Field";
import { sendJson } from "@/components/ui/send-json";
import { fetchJson, type ApiError } from "@/lib/client/fetcher";
import type { TeamOverview } from "@/lib/data/team-admin";

export interface TeamsResponse {
  items: TeamOverview[];
  unownedCount: number;
}

function CreateTeam({ onCreated }: { onCreated: () => void }) {
  const [open, setOpen] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  if (!open) return <Button onClick={() => setOpen(true)}>New team</Button>;
  async function submit(form: FormData) {
    setBusy(true);
    const body = Object.fromEntries(["slug", "name", "email", "oncall", "description"].map((f) => [f, String(form.get(f) ?? "")]));
    const res = await sendJson("/api/v1/teams", "POST", body);
    setBusy(false);
    if (!res.ok) return setError(res.message);
    setError(null);
    setOpen(false);
    onCreated();
  }
  return (
    <form action={submit} className="grid w-full gap-3 rounded-md border border-line bg-raised p-3 md:grid-cols-5">
      <div>
        <Label htmlFor="nt-slug">Slug</Label>
        <TextInput id="nt-slug" name="slug" required pattern="[a-z0-9][a-z0-9-]{0,62}" placeholder="loyalty" />
      </div>
      <div>
        <Label htmlFor="nt-name">Name</Label>
        <TextInput id="nt-name" name="name" required placeholder="Loyalty" />
      </div>
      <div>
        <Label htmlFor="nt-email">E-mail</Label>
        <TextInput id="nt-email" name="email" type="email" />
      </div>
      <div>
        <Label htmlFor="nt-oncall">On-call</Label>
        <TextInput id="nt-oncall" name="oncall" placeholder="rota, phone or channel" />
      </div>
      <div>
        <Label htmlFor="nt-description">Description</Label>
        <TextInput id="nt-description" name="description" />
      </div>
      <div className="flex items-center gap-2 md:col-span-5">
        <Button type="submit" variant="primary" disabled={busy}>
          Create team
        </Button>
        <Button type="button" variant="ghost" onClick={() => setOpen(false)}>
          Cancel
        </Button>
        <div className="flex-1">
          <FormError message={error} />
        </div>
      </div>
    </form>
  );
}

export function TeamsList({ isAdmin }: { isAdmin: boolean }) {
  const { data, error, isLoading, mutate } = useSWR<TeamsResponse, ApiError>("/api/v1/teams", fetchJson);
  return (
    <Card title="Teams" action={isAdmin && <CreateTeam onCreated={() => void mutate()} />}>
      {error && <FormError message={`Could not load the teams: ${error.message}`} />}
      {isLoading && <p className="text-sm text-muted">Loading…</p>}
      {data && (
        <div className="overflow-x-auto">
          <table className="w-full text-left text-sm" data-testid="teams-table">
            <thead className="text-xs uppercase tracking-wide text-faint">
              <tr>
                <th className="pb-2 pr-3 font-medium">Team</th>
                <th className="pb-2 pr-3 font-medium">E-mail</th>
                <th className="pb-2 pr-3 font-medium">On-call</th>
                <th className="pb-2 pr-3 text-right font-medium">People</th>
                <th className="pb-2 pr-3 text-right font-medium">Components</th>
                <th className="pb-2 text-right font-medium" title="components in their environment's top 10 by pinch score">
                  In top 10 by pinch score
                </th>
              </tr>
            </thead>
            <tbody>
              {data.items.map((t) => (
                <tr key={t.slug} className="border-t border-line">
                  <td className="py-2 pr-3">
                    <Link href={`/teams/${t.slug}`} className="font-medium text-ink hover:text-brass">
                      {t.name}
                    </Link>
                    <div className="font-mono text-xs text-faint">{t.slug}</div>
                  </td>
                  <td className="py-2 pr-3 text-muted">{t.email ?? <span className="text-faint">none</span>}</td>
                  <td className="py-2 pr-3 text-muted">{t.oncall ?? <span className="text-degraded">nobody to page</span>}</td>
                  <td className="py-2 pr-3 text-right font-mono tabular-nums">
                    {t.memberCount}
                    {t.leadCount === 0 && t.memberCount > 0 && <div className="text-xs text-degraded">no lead</div>}
                  </td>
                  <td className="py-2 pr-3 text-right font-mono tabular-nums">{t.componentCount}</td>
                  <td className={`py-2 text-right font-mono tabular-nums ${t.pinchPointCount > 0 ? "text-down" : "text-muted"}`}>{t.pinchPointCount}</td>
                </tr>
              ))}
            </tbody>
          </table>
          <p className="mt-3 text-xs text-muted" data-testid="unowned-total">
            {data.unownedCount} component{data.unownedCount === 1 ? "" : "s"} in all environments are unowned.
          </p>
        </div>
      )}
    </Card>
  );
}
