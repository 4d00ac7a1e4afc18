"use client";
// The audit log: who did what, when, with before and after. Filters live in the URL so a view
// of the log can be pasted into an incident channel.
import { usePathname, useRouter } from "next/navigation";
import { dateTime } from "@/components/ui/format";
import { useState } from "react";
import useSWR from "swr";
import { Button } from "@/components/ui/Button";
import { Card } from "@/components/ui/Card";
import { FormError, Label, Select, TextInput } from "@/components/ui/Field";
import { fetchJson, type ApiError } from "@/lib/client/fetcher";
import type { AuditPage } from "@/lib/data/audit-log";
import { AuditDiff } from "./AuditDiff";
import { AUDIT_FILTERS, type AuditFilters } from "./filters";

const PAGE = 25;

function toQuery(filters: AuditFilters, offset: number): string {
  const q = new URLSearchParams();
  for (const f of AUDIT_FILTERS) {
    const v = filters[f]?.trim();
    if (v) q.set(f, v);
  }
  if (offset) q.set("offset", String(offset));
  return q.toString();
}

const when = (iso: string) => dateTime(iso, { seconds: true });

export function AuditLog({ initial, initialOffset }: { initial: AuditFilters; initialOffset: number }) {
  const router = useRouter();
  const pathname = usePathname();
  const [filters, setFilters] = useState<AuditFilters>(initial);
  const [draft, setDraft] = useState<AuditFilters>(initial);
  const [offset, setOffset] = useState(initialOffset);
  const query = toQuery(filters, offset);
  const { data, error, isLoading } = useSWR<AuditPage, ApiError>(`/api/v1/audit?${query}${query ? "&" : ""}limit=${PAGE}`, fetchJson, { keepPreviousData: true });

  function apply(next: AuditFilters, nextOffset: number) {
    setFilters(next);
    setOffset(nextOffset);
    const q = toQuery(next, nextOffset);
    router.replace(q ? `${pathname}?${q}` : pathname, { scroll: false });
  }

  const set = (f: keyof AuditFilters) => (e: { target: { value: string } }) => setDraft((d) => ({ ...d, [f]: e.target.value }));
  const total = data?.total ?? 0;

  return (
    <div className="space-y-6">
      <div>
        <h1 className="text-2xl font-semibold tracking-tight">Audit log</h1>
        <p className="mt-1 text-sm text-muted">Every change made in Pinchpoint: pushes, owners, reviews, weights, teams, roles and tokens. Append-only.</p>
      </div>
      <Card>
        <form
          aria-label="Filter the audit log"
          className="grid gap-3 md:grid-cols-7"
          onSubmit={(e) => {
            e.preventDefault();
            apply(draft, 0);
          }}
        >
          <div>
            <Label htmlFor="f-action">Action</Label>
            <Select id="f-action" value={draft.action ?? ""} onChange={set("action")}>
              <option value="">any</option>
              {[...new Set((data?.actions ?? []).map((a) => a.split(".")[0] ?? a))].map((family) => (
                <optgroup key={family} label={family}>
                  <option value={family}>{family} (all)</option>
                  {(data?.actions ?? [])
                    .filter((a) => a.startsWith(`${family}.`))
                    .map((a) => (
                      <option key={a} value={a}>
                        {a}
                      </option>
                    ))}
                </optgroup>
              ))}
            </Select>
          </div>
          <div>
            <Label htmlFor="f-actor">Who</Label>
            <TextInput id="f-actor" value={draft.actor ?? ""} onChange={set("actor")} placeholder="e-mail or token" />
          </div>
          <div>
            <Label htmlFor="f-environment">Environment</Label>
            <TextInput id="f-environment" value={draft.environment ?? ""} onChange={set("environment")} placeholder="production" className="font-mono" />
          </div>
          <div>
            <Label htmlFor="f-target">Target</Label>
            <TextInput id="f-target" value={draft.target ?? ""} onChange={set("target")} placeholder="key, team, token…" className="font-mono" />
          </div>
          <div>
            <Label htmlFor="f-from">From (UTC day)</Label>
            <TextInput id="f-from" type="date" value={draft.from ?? ""} onChange={set("from")} />
          </div>
          <div>
            <Label htmlFor="f-to">To (UTC day)</Label>
            <TextInput id="f-to" type="date" value={draft.to ?? ""} onChange={set("to")} />
          </div>
          <div className="flex items-end gap-2">
            <Button type="submit" variant="primary">
              Filter
            </Button>
            <Button
              type="button"
              variant="ghost"
              onClick={() => {
                setDraft({});
                apply({}, 0);
              }}
            >
              Reset
            </Button>
          </div>
        </form>
      </Card>
      {error && <FormError message={`Could not load the log: ${error.message}`} />}
      <Card
        title={<span data-testid="audit-total">{isLoading && !data ? "Loading…" : `${total} event${total === 1 ? "" : "s"}`}</span>}
        action={
          total > PAGE && (
            <div className="flex items-center gap-2 text-xs text-muted">
              <Button variant="ghost" disabled={offset === 0} onClick={() => apply(filters, Math.max(0, offset - PAGE))}>
                ← Newer
              </Button>
              <span className="font-mono">
                {offset + 1}–{Math.min(offset + PAGE, total)} of {total}
              </span>
              <Button variant="ghost" disabled={offset + PAGE >= total} onClick={() => apply(filters, offset + PAGE)}>
                Older →
              </Button>
            </div>
          )
        }
      >
        {data && data.items.length === 0 && <p className="text-sm text-muted">Nothing matches these filters.</p>}
        <ol className="divide-y divide-line" data-testid="audit-events">
          {data?.items.map((e) => (
            <li key={e.id} className="grid gap-2 py-3 md:grid-cols-[14rem_1fr]">
              <div className="text-xs">
                <div className="font-mono text-ink">{e.action}</div>
                <div className="mt-0.5 text-muted">{when(e.at)}</div>
                <div className="mt-0.5 truncate text-muted" title={e.actorLabel}>
                  {e.actorType === "user" ? "" : `${e.actorType} · `}
                  {e.actorLabel}
                </div>
                <div className="mt-0.5 font-mono text-faint">
                  {e.targetType} {e.targetId}
                  {e.environment && ` · ${e.environment}`}
                </div>
              </div>
              <AuditDiff before={e.before} after={e.after} />
            </li>
          ))}
        </ol>
      </Card>
    </div>
  );
}
