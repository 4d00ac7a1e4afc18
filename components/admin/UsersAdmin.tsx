"use client";
// People (admin): invite someone with a one-time link, change roles, deactivate and reactivate.
import { createColumnHelper } from "@tanstack/react-table";
import { useState, type ReactNode } from "react";
import { Button } from "@/components/ui/Button";
import { Card } from "@/components/ui/Card";
import { ConfirmButton } from "@/components/ui/ConfirmButton";
import { CopyField } from "@/components/ui/CopyField";
import { DataTable } from "@/components/ui/data-table/DataTable";
import { ApiForm, FormProblem, SubmitButton, submitWith, useApiForm } from "@/components/ui/form/api-form";
import { InputField, SelectInput } from "@/components/ui/form/fields";
import { When } from "@/components/ui/When";
import { adminUserSchema, inviteResultSchema, inviteUserSchema, usersResponseSchema, type AdminUser, type InviteResult } from "@/lib/api/schemas/users";
import { ROLES, ROLE_LABELS, type Role } from "@/lib/auth/roles";
import { sendJson, useApi } from "@/lib/client/api";

const STATUS: Record<AdminUser["status"], { label: string; className: string }> = {
  active: { label: "active", className: "text-ok" },
  invited: { label: "invited, no password yet", className: "text-info" },
  "invite-expired": { label: "invite expired", className: "text-degraded" },
  deactivated: { label: "deactivated", className: "text-faint" },
};

function InviteForm({ onInvited }: { onInvited: (invite: InviteResult) => Promise<void> }) {
  const form = useApiForm(inviteUserSchema, { email: "", name: "", role: "viewer" });
  const onSubmit = submitWith(
    form,
    (values) => sendJson(inviteResultSchema, "/api/v1/users", "POST", values),
    async (invite) => {
      form.reset();
      await onInvited(invite);
    },
  );
  return (
    <ApiForm form={form} onSubmit={onSubmit} label="Invite someone" className="grid gap-4 md:grid-cols-[2fr_2fr_1fr_auto] md:items-start">
      <InputField name="email" label="E-mail" type="email" placeholder="name@harbor-pantry.example" autoComplete="off" />
      <InputField name="name" label="Name" autoComplete="off" />
      <SelectInput name="role" label="Role" options={ROLES.map((r) => ({ value: r, label: ROLE_LABELS[r] }))} />
      <div className="md:pt-5">
        <SubmitButton working="Inviting…">Invite</SubmitButton>
      </div>
      <FormProblem className="md:col-span-4" />
    </ApiForm>
  );
}

const col = createColumnHelper<AdminUser>();

function columns(currentUserId: string, update: (u: AdminUser, body: { role?: Role; active?: boolean }, done: string) => Promise<void>, reissue: (u: AdminUser) => Promise<void>) {
  return [
    col.accessor("email", {
      header: "E-mail",
      meta: { fixed: true, className: "font-mono text-xs" },
      cell: (i) => (
        <>
          {i.getValue()}
          {i.row.original.id === currentUserId && <span className="ml-2 rounded bg-raised px-1.5 py-0.5 font-sans text-muted">you</span>}
        </>
      ),
    }),
    col.accessor("name", { header: "Name" }),
    col.accessor("role", {
      header: "Role",
      cell: (i) => {
        const u = i.row.original;
        const self = u.id === currentUserId;
        return (
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
        );
      },
    }),
    col.accessor("status", {
      header: "State",
      cell: (i) => (
        <span className={STATUS[i.row.original.status].className}>
          {STATUS[i.row.original.status].label}
          {i.row.original.status === "invited" && i.row.original.inviteExpiresAt && (
            <span className="block text-xs text-muted">
              link open until <When at={i.row.original.inviteExpiresAt} />
            </span>
          )}
        </span>
      ),
    }),
    col.accessor("createdAt", { header: "Since", cell: (i) => <When at={i.getValue()} /> }),
    col.display({
      id: "actions",
      header: () => <span className="sr-only">Actions</span>,
      meta: { fixed: true, label: "Actions", className: "whitespace-nowrap text-right" },
      cell: (i) => {
        const u = i.row.original;
        const self = u.id === currentUserId;
        return (
          <span className="inline-flex items-center gap-2">
            {(u.status === "invited" || u.status === "invite-expired") && (
              <Button type="button" onClick={() => void reissue(u)} aria-label={`New link for ${u.email}`}>
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
              <Button type="button" onClick={() => void update(u, { active: true }, `${u.email} is active again.`)} aria-label={`Reactivate ${u.email}`}>
                Reactivate
              </Button>
            )}
          </span>
        );
      },
    }),
  ];
}

export function UsersAdmin({ currentUserId }: { currentUserId: string }) {
  const users = useApi(usersResponseSchema, "/api/v1/users");
  const [invite, setInvite] = useState<InviteResult | null>(null);
  const [notice, setNotice] = useState<{ tone: "ok" | "error"; text: ReactNode } | null>(null);

  async function update(user: AdminUser, body: { role?: Role; active?: boolean }, done: string) {
    const result = await sendJson(adminUserSchema, `/api/v1/users/${user.id}`, "PATCH", body);
    setNotice(result.ok ? { tone: "ok", text: done } : { tone: "error", text: result.error.detail });
    await users.mutate();
  }

  async function reissue(user: AdminUser) {
    const result = await sendJson(inviteResultSchema, `/api/v1/users/${user.id}/invite`, "POST");
    if (result.ok) setInvite(result.data);
    else setNotice({ tone: "error", text: result.error.detail });
    await users.mutate();
  }

  const items = users.data?.items;

  return (
    <div className="space-y-6">
      {invite && (
        <section role="status" aria-label="Invite link" className="space-y-3 rounded-lg border border-brass/70 bg-brass/10 p-4">
          <h2 className="font-semibold">
            Invite link for <span className="font-mono">{invite.user.email}</span>
          </h2>
          <p className="text-sm">
            Send this link to {invite.user.name}. It works <strong>once</strong>, until <When at={invite.expiresAt} />, and is not shown again — if it gets lost, make a new
            one from the list below.
          </p>
          <CopyField value={invite.url} label="Invite link" testId="invite-link" />
          <Button type="button" variant="ghost" onClick={() => setInvite(null)}>
            Done — hide the link
          </Button>
        </section>
      )}

      <Card title="Invite someone">
        <InviteForm
          onInvited={async (created) => {
            setInvite(created);
            await users.mutate();
          }}
        />
      </Card>

      <Card title={`People (${items?.length ?? "…"})`}>
        {notice && (
          <p role={notice.tone === "error" ? "alert" : "status"} className={`mb-3 rounded-md border px-3 py-2 text-sm ${notice.tone === "error" ? "border-down/50 bg-down/10" : "border-line bg-raised"}`}>
            {notice.text}
          </p>
        )}
        <p className="mb-3 text-xs text-muted">
          You cannot change your own role or deactivate yourself: another admin does that, so Pinchpoint is never left without one. Changes apply on the person&apos;s next request.
        </p>
        <DataTable
          id="users"
          caption="People"
          columns={columns(currentUserId, update, reissue)}
          data={items}
          rowKey={(u) => u.id}
          rowTestId={(u) => `user-row-${u.email}`}
          rowClassName={(u) => (u.active ? "" : "text-faint")}
          error={users.error}
          paging={{ mode: "client", pageSize: 50, initialSort: [{ id: "email", desc: false }], search: { label: "Find a person", placeholder: "e-mail or name" } }}
          noun={["person", "people"]}
          empty="No one yet."
        />
      </Card>
    </div>
  );
}
