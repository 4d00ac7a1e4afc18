"use client";
// API tokens (admin): make one (shown once), see which are live and when they were last used, revoke.
import { createColumnHelper } from "@tanstack/react-table";
import { useState } from "react";
import { Button } from "@/components/ui/Button";
import { Card } from "@/components/ui/Card";
import { ConfirmButton } from "@/components/ui/ConfirmButton";
import { CopyField } from "@/components/ui/CopyField";
import { DataTable } from "@/components/ui/data-table/DataTable";
import { ApiForm, FormProblem, SubmitButton, submitWith, useApiForm } from "@/components/ui/form/api-form";
import { CheckboxGroup, InputField, SelectInput } from "@/components/ui/form/fields";
import { When } from "@/components/ui/When";
import { environmentsResponseSchema } from "@/lib/api/schemas/environments";
import { createdTokenSchema, createTokenSchema, tokenInfoSchema, tokensResponseSchema, type CreatedToken, type TokenInfo } from "@/lib/api/schemas/tokens";
import { TOKEN_SCOPES, type TokenScope } from "@/lib/auth/roles";
import { sendJson, useApi } from "@/lib/client/api";

const SCOPE_HELP: Record<TokenScope, string> = {
  "inventory:write": "push inventory files (CI jobs)",
  read: "read rankings, components and drills (scripts, dashboards)",
};

function CreateToken({ onCreated }: { onCreated: (token: CreatedToken) => Promise<void> }) {
  const environments = useApi(environmentsResponseSchema, "/api/v1/environments");
  const form = useApiForm(createTokenSchema, { name: "", scopes: ["inventory:write"], environment: undefined, source: undefined });
  const onSubmit = submitWith(
    form,
    (values) => sendJson(createdTokenSchema, "/api/v1/tokens", "POST", values),
    async (created) => {
      form.reset();
      await onCreated(created);
    },
  );
  return (
    <ApiForm form={form} onSubmit={onSubmit} label="New token" className="grid gap-4 md:grid-cols-2">
      <InputField name="name" label="Name" maxLength={100} placeholder="storefront CI" />
      <CheckboxGroup
        name="scopes"
        legend="Scopes"
        options={TOKEN_SCOPES.map((scope) => ({
          value: scope,
          label: (
            <>
              <span className="font-mono">{scope}</span> <span className="text-muted">— {SCOPE_HELP[scope]}</span>
            </>
          ),
        }))}
      />
      <SelectInput
        name="environment"
        label="Only for environment"
        blank="absent"
        options={[{ value: "", label: "any environment" }, ...(environments.data?.items ?? []).map((e) => ({ value: e.slug, label: e.slug }))]}
        help="A token bound to no environment may also create new ones on first push."
      />
      <InputField name="source" label="Only for source" blank="absent" placeholder="storefront-repo (optional)" controlClassName="font-mono" help="Binds the token to one repository's part of the inventory." />
      <FormProblem className="md:col-span-2" />
      <div className="md:col-span-2">
        <SubmitButton working="Creating…">Create token</SubmitButton>
      </div>
    </ApiForm>
  );
}

const col = createColumnHelper<TokenInfo>();

function columns(revoke: (t: TokenInfo) => Promise<void>) {
  return [
    col.accessor("name", { header: "Name", meta: { fixed: true, className: "font-medium" } }),
    col.accessor("prefix", { header: "Starts with", cell: (i) => <span className="font-mono">{i.getValue()}…</span> }),
    col.accessor((t) => t.scopes.join(", "), { id: "scopes", header: "Scopes", cell: (i) => <span className="font-mono text-xs">{i.getValue()}</span> }),
    col.accessor((t) => `${t.environment ?? ""} ${t.source ?? ""}`, {
      id: "bound",
      header: "Bound to",
      cell: (i) =>
        i.row.original.environment || i.row.original.source ? (
          <span className="font-mono text-xs">
            {i.row.original.environment ?? "any env"} / {i.row.original.source ?? "any source"}
          </span>
        ) : (
          <span className="text-xs text-muted">not bound</span>
        ),
    }),
    col.accessor("createdAt", { header: "Created", cell: (i) => <When at={i.getValue()} /> }),
    col.accessor("lastUsedAt", { header: "Last used", cell: (i) => <When at={i.getValue()} empty="never" /> }),
    col.accessor((t) => t.revokedAt ?? "", {
      id: "state",
      header: "State",
      cell: (i) =>
        i.row.original.revokedAt ? (
          <span>
            revoked <When at={i.row.original.revokedAt} />
          </span>
        ) : (
          <span className="text-ok">live</span>
        ),
    }),
    col.accessor("createdByEmail", { header: "Made by", cell: (i) => i.getValue() ?? "—" }),
    col.display({
      id: "actions",
      header: () => <span className="sr-only">Actions</span>,
      meta: { fixed: true, label: "Actions", className: "text-right" },
      cell: (i) =>
        i.row.original.revokedAt ? null : (
          <ConfirmButton
            label="Revoke"
            name={`Revoke token ${i.row.original.name}`}
            question={
              <>
                Revoke <span className="font-mono">{i.row.original.name}</span>? Jobs using it start failing. This cannot be undone.
              </>
            }
            confirmLabel="Yes, revoke"
            onConfirm={() => revoke(i.row.original)}
          />
        ),
    }),
  ];
}

export function TokensAdmin() {
  const tokens = useApi(tokensResponseSchema, "/api/v1/tokens");
  const [created, setCreated] = useState<CreatedToken | null>(null);
  const [notice, setNotice] = useState<string | null>(null);

  async function revoke(token: TokenInfo) {
    const result = await sendJson(tokenInfoSchema, `/api/v1/tokens/${token.id}`, "DELETE");
    if (!result.ok) setNotice(`Could not revoke ${token.name}: ${result.error.detail}`);
    else {
      setNotice(`Revoked ${token.name} (${token.prefix}…). Requests with it are refused from now on.`);
      if (created?.id === token.id) setCreated(null);
    }
    await tokens.mutate();
  }

  const items = tokens.data?.items;
  return (
    <div className="space-y-6">
      {created && (
        <section role="status" aria-label="New token" className="space-y-3 rounded-lg border border-brass/70 bg-brass/10 p-4">
          <h2 className="font-semibold">
            Token <span className="font-mono">{created.name}</span> is ready
          </h2>
          <p className="text-sm">
            <strong>Copy it now: you will not see it again.</strong> Pinchpoint keeps only a hash of it. If it is lost, revoke it and make a new one.
          </p>
          <CopyField value={created.token} label="New token" testId="new-token" />
          <p className="text-xs text-muted">
            Use it as <span className="font-mono">Authorization: Bearer …</span>, e.g. in your CI secret store.
          </p>
          <Button type="button" variant="ghost" onClick={() => setCreated(null)}>
            I have stored it — hide
          </Button>
        </section>
      )}

      <Card title="New token">
        <CreateToken
          onCreated={async (token) => {
            setNotice(null);
            setCreated(token);
            await tokens.mutate();
          }}
        />
      </Card>

      <Card title={`Tokens (${items?.length ?? "…"})`}>
        {notice && (
          <p role="status" className="mb-3 rounded-md border border-line bg-raised px-3 py-2 text-sm">
            {notice}
          </p>
        )}
        <DataTable
          id="tokens"
          caption="API tokens"
          columns={columns(revoke)}
          data={items}
          rowKey={(t) => t.id}
          rowTestId={(t) => `token-row-${t.name}`}
          rowClassName={(t) => (t.revokedAt ? "text-faint" : "")}
          error={tokens.error}
          paging={{ mode: "client", pageSize: 50, search: { label: "Find a token", placeholder: "name, environment or source" } }}
          noun={["token", "tokens"]}
          empty="No tokens yet. CI jobs need one to push their inventory."
        />
      </Card>
    </div>
  );
}
