"use client";

import { useState, type FormEvent } from "react";
import useSWR from "swr";
import { Button } from "@/components/ui/Button";
import { Card } from "@/components/ui/Card";
import { fetchJson, type ApiError } from "@/lib/client/fetcher";
import { TOKEN_SCOPES, type TokenScope } from "@/lib/auth/roles";
import type { TokenInfo } from "@/lib/data/tokens";
import type { EnvironmentSummary } from "@/lib/data/environments";
import { ConfirmButton } from "./ConfirmButton";
import { CopyField } from "./CopyField";
import { formatWhen, sendJson, type RequestProblem } from "./request";

const SCOPE_HELP: Record<TokenScope, string> = {
  "inventory:write": "push inventory files (CI jobs)",
  read: "read rankings, components and drills (scripts, dashboards)",
};

const input = "mt-1 w-full rounded-md border border-line bg-raised px-3 py-2 text-sm text-ink outline-none focus:border-brass";

function fieldError(problem: RequestProblem | null, field: string): string | undefined {
  return problem?.issues.find((i) => i.path === field || i.path.startsWith(`${field}.`) || i.path.startsWith(`${field}[`))?.message;
}

export function TokensAdmin() {
  const tokens = useSWR<{ items: TokenInfo[] }, ApiError>("/api/v1/tokens", fetchJson);
  const environments = useSWR<{ items: EnvironmentSummary[] }, ApiError>("/api/v1/environments", fetchJson);
  const [problem, setProblem] = useState<RequestProblem | null>(null);
  const [created, setCreated] = useState<(TokenInfo & { token: string }) | null>(null);
  const [pending, setPending] = useState(false);
  const [notice, setNotice] = useState<string | null>(null);

  async function onCreate(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const form = event.currentTarget;
    const data = new FormData(form);
    const environment = String(data.get("environment") ?? "");
    const source = String(data.get("source") ?? "").trim();
    setPending(true);
    setProblem(null);
    setNotice(null);
    const result = await sendJson<TokenInfo & { token: string }>("/api/v1/tokens", "POST", {
      name: String(data.get("name") ?? ""),
      scopes: data.getAll("scopes").map(String),
      ...(environment ? { environment } : {}),
      ...(source ? { source } : {}),
    });
    setPending(false);
    if (!result.ok) {
      setProblem(result.problem);
      return;
    }
    setCreated(result.data);
    form.reset();
    await tokens.mutate();
  }

  async function revoke(token: TokenInfo) {
    const result = await sendJson<TokenInfo>(`/api/v1/tokens/${token.id}`, "DELETE");
    if (!result.ok) setNotice(`Could not revoke ${token.name}: ${result.problem.message}`);
    else {
      setNotice(`Revoked ${token.name} (${token.prefix}…). Requests with it are refused from now on.`);
      if (created?.id === token.id) setCreated(null);
    }
    await tokens.mutate();
  }

  const items = tokens.data?.items ?? [];
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
        <form onSubmit={onCreate} className="grid gap-4 md:grid-cols-2" noValidate>
          <label className="block">
            <span className="text-sm font-medium">Name</span>
            <input name="name" required maxLength={100} placeholder="storefront CI" className={input} aria-invalid={!!fieldError(problem, "name")} />
            {fieldError(problem, "name") && <span className="mt-1 block text-xs text-down">{fieldError(problem, "name")}</span>}
          </label>
          <fieldset>
            <legend className="text-sm font-medium">Scopes</legend>
            <div className="mt-1 space-y-1">
              {TOKEN_SCOPES.map((scope) => (
                <label key={scope} className="flex items-start gap-2 text-sm">
                  <input type="checkbox" name="scopes" value={scope} defaultChecked={scope === "inventory:write"} className="mt-1 accent-[var(--pp-brass)]" />
                  <span>
                    <span className="font-mono">{scope}</span> <span className="text-muted">— {SCOPE_HELP[scope]}</span>
                  </span>
                </label>
              ))}
            </div>
            {fieldError(problem, "scopes") && <span className="mt-1 block text-xs text-down">{fieldError(problem, "scopes")}</span>}
          </fieldset>
          <label className="block">
            <span className="text-sm font-medium">Only for environment</span>
            <select name="environment" className={input} defaultValue="">
              <option value="">any environment</option>
              {environments.data?.items.map((e) => (
                <option key={e.slug} value={e.slug}>
                  {e.slug}
                </option>
              ))}
            </select>
            <span className="mt-1 block text-xs text-muted">A token bound to no environment may also create new ones on first push.</span>
            {fieldError(problem, "environment") && <span className="mt-1 block text-xs text-down">{fieldError(problem, "environment")}</span>}
          </label>
          <label className="block">
            <span className="text-sm font-medium">Only for source</span>
            <input name="source" placeholder="storefront-repo (optional)" className={`${input} font-mono`} />
            <span className="mt-1 block text-xs text-muted">Binds the token to one repository&apos;s part of the inventory.</span>
            {fieldError(problem, "source") && <span className="mt-1 block text-xs text-down">{fieldError(problem, "source")}</span>}
          </label>
          {problem && (
            <p role="alert" className="rounded-md border border-down/50 bg-down/10 px-3 py-2 text-sm md:col-span-2">
              {problem.message}
              {problem.issues.length > 0 && `: ${problem.issues.map((i) => `${i.path} ${i.message}`).join("; ")}`}
            </p>
          )}
          <div className="md:col-span-2">
            <Button type="submit" variant="primary" disabled={pending}>
              {pending ? "Creating…" : "Create token"}
            </Button>
          </div>
        </form>
      </Card>

      <Card title={`Tokens (${items.length})`}>
        {notice && (
          <p role="status" className="mb-3 rounded-md border border-line bg-raised px-3 py-2 text-sm">
            {notice}
          </p>
        )}
        {tokens.error && <p role="alert" className="text-sm text-down">Could not load tokens: {tokens.error.message}</p>}
        {tokens.isLoading ? (
          <p className="text-sm text-muted">Loading…</p>
        ) : items.length === 0 ? (
          <p className="text-sm text-muted">No tokens yet. CI jobs need one to push their inventory.</p>
        ) : (
          <div className="overflow-x-auto">
            <table className="w-full text-left text-sm">
              <thead className="text-xs uppercase tracking-wide text-faint">
                <tr>
                  <th className="py-2 pr-4 font-medium">Name</th>
                  <th className="py-2 pr-4 font-medium">Starts with</th>
                  <th className="py-2 pr-4 font-medium">Scopes</th>
                  <th className="py-2 pr-4 font-medium">Bound to</th>
                  <th className="py-2 pr-4 font-medium">Created</th>
                  <th className="py-2 pr-4 font-medium">Last used</th>
                  <th className="py-2 pr-4 font-medium">State</th>
                  <th className="py-2 font-medium"><span className="sr-only">Actions</span></th>
                </tr>
              </thead>
              <tbody>
                {items.map((t) => (
                  <tr key={t.id} data-testid={`token-row-${t.name}`} className={`border-t border-line align-middle ${t.revokedAt ? "text-faint" : ""}`}>
                    <td className="py-2 pr-4 font-medium">{t.name}</td>
                    <td className="py-2 pr-4 font-mono">{t.prefix}…</td>
                    <td className="py-2 pr-4 font-mono text-xs">{t.scopes.join(", ")}</td>
                    <td className="py-2 pr-4 text-xs">
                      {t.environment || t.source ? (
                        <span className="font-mono">
                          {t.environment ?? "any env"} / {t.source ?? "any source"}
                        </span>
                      ) : (
                        <span className="text-muted">not bound</span>
                      )}
                    </td>
                    <td className="py-2 pr-4 whitespace-nowrap">{formatWhen(t.createdAt)}</td>
                    <td className="py-2 pr-4 whitespace-nowrap">{t.lastUsedAt ? formatWhen(t.lastUsedAt) : <span className="text-muted">never</span>}</td>
                    <td className="py-2 pr-4 whitespace-nowrap">
                      {t.revokedAt ? <span>revoked {formatWhen(t.revokedAt)}</span> : <span className="text-ok">live</span>}
                    </td>
                    <td className="py-2 text-right">
                      {!t.revokedAt && (
                        <ConfirmButton
                          label="Revoke"
                          name={`Revoke token ${t.name}`}
                          question={
                            <>
                              Revoke <span className="font-mono">{t.name}</span>? Jobs using it start failing. This cannot be undone.
                            </>
                          }
                          confirmLabel="Yes, revoke"
                          onConfirm={() => revoke(t)}
                        />
                      )}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        )}
      </Card>
    </div>
  );
}
