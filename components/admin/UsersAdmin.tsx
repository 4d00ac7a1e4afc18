"use client";

import { useState, type FormEvent } from "react";
import useSWR from "swr";
import { Button } from "@/components/ui/Button";
import { Card } from "@/components/ui/Card";
import { fetchJson, type ApiError } from "@/lib/client/fetcher";
import { ROLES, ROLE_LABELS, type Role } from "@/lib/auth/roles";
import type { AdminUser, InviteResult } from "@/lib/data/user-admin";
import { ConfirmButton } from "./ConfirmButton";
import { CopyField } from "./CopyField";
import { formatWhen, sendJson, type RequestProblem } from "./request";

const input = "mt-1 w-full rounded-md border border-line bg-raised px-3 py-2 text-sm text-ink outline-none focus:border-brass";

const STATUS: Record<AdminUser["status"], { label: string; className: string }> = {
  active: { label: "active", className: "text-ok" },
  invited: { label: "invited, no password yet", className: "text-info" },
  "invite-expired": { label: "invite expired", className: "text-degraded" },
  deactivated: { label: "deactivated", className: "text-faint" },
};

export function UsersAdmin({ currentUserId }: { currentUserId: string }) {
  const users = useSWR<{ items: AdminUser[] }, ApiError>("/api/v1/users", fetchJson);
  const [problem, setProblem] = useState<RequestProblem | null>(null);
  const [invite, setInvite] = useState<InviteResult | null>(null);
  const [notice, setNotice] = useState<{ tone: "ok" | "error"; text: string } | null>(null);
  const [pending, setPending] = useState(false);

  async function onInvite(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const form = event.currentTarget;
    const data = new FormData(form);
    setPending(true);
    setProblem(null);
    const result = await sendJson<InviteResult>("/api/v1/users", "POST", {
      email: String(data.get("email") ?? ""),
      name: String(data.get("name") ?? ""),
      role: String(data.get("role") ?? "viewer"),
    });
    setPending(false);
    if (!result.ok) return setProblem(result.problem);
    setInvite(result.data);
    form.reset();
    await users.mutate();
  }

  async function update(user: AdminUser, body: { role?: Role; active?: boolean }, done: string) {
    const result = await sendJson<AdminUser>(`/api/v1/users/${user.id}`, "PATCH", body);
    setNotice(result.ok ? { tone: "ok", text: done } : { tone: "error", text: result.problem.message });
    await users.mutate();
  }

  async function reissue(user: AdminUser) {
    const result = await sendJson<InviteResult>(`/api/v1/users/${user.id}/invite`, "POST");
    if (result.ok) setInvite(result.data);
    else setNotice({ tone: "error", text: result.problem.message });
    await users.mutate();
  }

  const issue = (field: string) => problem?.issues.find((i) => i.path === field)?.message;
  const items = users.data?.items ?? [];

  return (
    <div className="space-y-6">
      {invite && (
        <section role="status" aria-label="Invite link" className="space-y-3 rounded-lg border border-brass/70 bg-brass/10 p-4">
          <h2 className="font-semibold">
            Invite link for <span className="font-mono">{invite.user.email}</span>
          </h2>
          <p className="text-sm">
            Send this link to {invite.user.name}. It works <strong>once</strong>, until {formatWhen(invite.expiresAt)}, and is not shown again —
            if it gets lost, make a new one from the list below.
          </p>
          <CopyField value={invite.url} label="Invite link" testId="invite-link" />
          <Button type="button" variant="ghost" onClick={() => setInvite(null)}>
            Done — hide the link
          </Button>
        </section>
      )}

      <Card title="Invite someone">
        <form onSubmit={onInvite} className="grid gap-4 md:grid-cols-[2fr_2fr_1fr_auto] md:items-start" noValidate>
          <label className="block">
            <span className="text-sm font-medium">E-mail</span>
            <input name="email" type="email" required className={input} placeholder="name@harbor-pantry.example" aria-invalid={!!issue("email")} />
            {issue("email") && <span className="mt-1 block text-xs text-down">{issue("email")}</span>}
          </label>
          <label className="block">
            <span className="text-sm font-medium">Name</span>
            <input name="name" required className={input} aria-invalid={!!issue("name")} />
            {issue("name") && <span className="mt-1 block text-xs text-down">{issue("name")}</span>}
          </label>
          <label className="block">
            <span className="text-sm font-medium">Role</span>
            <select name="role" defaultValue="viewer" className={input}>
              {ROLES.map((r) => (
                <option key={r} value={r}>
                  {ROLE_LABELS[r]}
                </option>
              ))}
            </select>
          </label>
          <div className="md:pt-6">
            <Button type="submit" variant="primary" disabled={pending}>
              {pending ? "Inviting…" : "Invite"}
            </Button>
          </div>
          {problem && (
            <p role="alert" className="rounded-md border border-down/50 bg-down/10 px-3 py-2 text-sm md:col-span-4">
              {problem.message}
            </p>
          )}
        </form>
      </Card>

      <Card title={`People (${items.length})`}>
        {notice && (
          <p role={notice.tone === "error" ? "alert" : "status"} className={`mb-3 rounded-md border px-3 py-2 text-sm ${notice.tone === "error" ? "border-down/50 bg-down/10" : "border-line bg-raised"}`}>
            {notice.text}
          </p>
        )}
        {users.error && <p role="alert" className="text-sm text-down">Could not load people: {users.error.message}</p>}
        <p className="mb-3 text-xs text-muted">
          You cannot change your own role or deactivate yourself: another admin does that, so Pinchpoint is never left without one. Changes apply on the person&apos;s next request.
        </p>
        <div className="overflow-x-auto">
          <table className="w-full text-left text-sm">
            <thead className="text-xs uppercase tracking-wide text-faint">
              <tr>
                <th className="py-2 pr-4 font-medium">E-mail</th>
                <th className="py-2 pr-4 font-medium">Name</th>
                <th className="py-2 pr-4 font-medium">Role</th>
                <th className="py-2 pr-4 font-medium">State</th>
                <th className="py-2 pr-4 font-medium">Since</th>
                <th className="py-2 font-medium"><span className="sr-only">Actions</span></th>
              </tr>
            </thead>
            <tbody>
              {items.map((u) => {
                const self = u.id === currentUserId;
                return (
                  <tr key={u.id} data-testid={`user-row-${u.email}`} className={`border-t border-line ${u.active ? "" : "text-faint"}`}>
                    <td className="py-2 pr-4 font-mono text-xs">
                      {u.email}
                      {self && <span className="ml-2 rounded bg-raised px-1.5 py-0.5 font-sans text-muted">you</span>}
                    </td>
                    <td className="py-2 pr-4">{u.name}</td>
                    <td className="py-2 pr-4">
                      <select
                        aria-label={`Role of ${u.email}`}
                        value={u.role}
                        disabled={self}
                        title={self ? "Your own role is changed by another admin" : undefined}
                        onChange={(e) => {
                          const role = e.target.value as Role;
                          void update(u, { role }, `${u.email} is now ${ROLE_LABELS[role]} (was ${ROLE_LABELS[u.role]}).`);
                        }}
                        className="rounded-md border border-line bg-raised px-2 py-1 text-sm disabled:opacity-60"
                      >
                        {ROLES.map((r) => (
                          <option key={r} value={r}>
                            {ROLE_LABELS[r]}
                          </option>
                        ))}
                      </select>
                    </td>
                    <td className={`py-2 pr-4 ${STATUS[u.status].className}`}>
                      {STATUS[u.status].label}
                      {u.status === "invited" && u.inviteExpiresAt && <span className="block text-xs text-muted">link open until {formatWhen(u.inviteExpiresAt)}</span>}
                    </td>
                    <td className="py-2 pr-4 whitespace-nowrap">{formatWhen(u.createdAt)}</td>
                    <td className="py-2 text-right whitespace-nowrap">
                      <span className="inline-flex items-center gap-2">
                        {(u.status === "invited" || u.status === "invite-expired") && (
                          <Button type="button" onClick={() => reissue(u)} aria-label={`New invitation link for ${u.email}`}>
                            New link
                          </Button>
                        )}
                        {self ? null : u.active ? (
                          <ConfirmButton
                            label="Deactivate"
                            name={`Deactivate ${u.email}`}
                            question={<>Deactivate {u.email}? They are signed out on their next request.</>}
                            confirmLabel="Yes, deactivate"
                            onConfirm={() => update(u, { active: false }, `${u.email} is deactivated.`)}
                          />
                        ) : (
                          <Button type="button" onClick={() => update(u, { active: true }, `${u.email} is active again.`)} aria-label={`Reactivate ${u.email}`}>
                            Reactivate
                          </Button>
                        )}
                      </span>
                    </td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        </div>
      </Card>
    </div>
  );
}
