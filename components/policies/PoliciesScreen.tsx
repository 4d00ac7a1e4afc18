"use client";
// Change policies of one environment (lib/impact/policies.ts): which rules a push's impact is held
// to, each blocking or only warning, and what counts as "moved" in the impact's table.
import Link from "next/link";
import { useEffect, useState } from "react";
import useSWR from "swr";
import { Badge } from "@/components/ui/Badge";
import { Button } from "@/components/ui/Button";
import { Card } from "@/components/ui/Card";
import { FormError, Label, Select, TextInput } from "@/components/ui/Field";
import { sendJson } from "@/components/ui/send-json";
import { policiesViewSchema, type PoliciesViewBody } from "@/lib/api/schemas/policies";
import { ApiError, fetchJson } from "@/lib/client/fetcher";
import { POLICY_RULES, RULE_INFO, type PolicyRuleId, type PolicySet, type PolicySeverity } from "@/lib/impact/policies";

const fetchPolicies = async (url: string): Promise<PoliciesViewBody> => {
  const parsed = policiesViewSchema.safeParse(await fetchJson<unknown>(url));
  if (!parsed.success) throw new ApiError(500, "bad_response", "The server's answer was not a policy set");
  return parsed.data;
};

function RuleRow({ rule, value, canWrite, onChange }: { rule: PolicyRuleId; value: PolicySet["rules"][PolicyRuleId]; canWrite: boolean; onChange: (next: PolicySet["rules"][PolicyRuleId]) => void }) {
  const info = RULE_INFO[rule];
  const param = info.parameter;
  const paramValue = param ? (value as Record<string, unknown>)[param.name] : undefined;
  const title = info.title.replace("{n}", param ? String(paramValue) : "");
  return (
    <li className="grid gap-3 border-t border-line py-3 first:border-t-0 md:grid-cols-[1fr_9rem_9rem]" data-testid={`policy-${rule}`}>
      <div>
        <label className="flex items-center gap-2 text-sm font-medium">
          <input type="checkbox" checked={value.enabled} disabled={!canWrite} onChange={(e) => onChange({ ...value, enabled: e.target.checked })} aria-label={`${title}: on`} />
          {title}
          {!value.enabled ? <Badge>off</Badge> : value.severity === "block" ? <Badge tone="down">blocks</Badge> : <Badge tone="degraded">warns</Badge>}
        </label>
        <p className="mt-1 text-xs text-muted">
          {info.description.replace("{n}", param ? String(paramValue) : "")} {info.why}
        </p>
      </div>
      <div>
        <Label htmlFor={`sev-${rule}`}>When it fails</Label>
        <Select id={`sev-${rule}`} value={value.severity} disabled={!canWrite || !value.enabled} onChange={(e) => onChange({ ...value, severity: e.target.value as PolicySeverity })}>
          <option value="warn">warn only</option>
          <option value="block">block the push</option>
        </Select>
      </div>
      <div>
        {param && (
          <>
            <Label htmlFor={`param-${rule}`}>{param.name === "k" ? "K" : "N"}</Label>
            <TextInput
              id={`param-${rule}`}
              type="number"
              min={param.min}
              max={param.max}
              step={1}
              required
              className="font-mono"
              value={String(paramValue)}
              disabled={!canWrite || !value.enabled}
              onChange={(e) => onChange({ ...value, [param.name]: Number(e.target.value) } as PolicySet["rules"][PolicyRuleId])}
            />
            <p className="mt-1 text-xs text-faint">{param.label}</p>
          </>
        )}
      </div>
    </li>
  );
}

export function PoliciesScreen({ env, canWrite }: { env: string; canWrite: boolean }) {
  const { data, error, mutate } = useSWR<PoliciesViewBody, ApiError>(`/api/v1/environments/${env}/policies`, fetchPolicies);
  const [values, setValues] = useState<PolicySet | null>(null);
  const [message, setMessage] = useState<string | null>(null);
  const [saveError, setSaveError] = useState<string | null>(null);
  useEffect(() => {
    if (data) setValues(data.policies);
  }, [data]);

  async function save(next: PolicySet) {
    const res = await sendJson<PoliciesViewBody>(`/api/v1/environments/${env}/policies`, "PUT", next);
    if (!res.ok) {
      setMessage(null);
      return setSaveError(res.message);
    }
    setSaveError(null);
    setMessage("Saved. Dry runs and pushes are held to these policies from now on.");
    void mutate();
  }

  const v = values;
  const blocking = v ? POLICY_RULES.filter((r) => v.rules[r].enabled && v.rules[r].severity === "block").length : 0;
  return (
    <div className="space-y-6">
      <div>
        <h1 className="text-2xl font-semibold tracking-tight">
          Change policies for <span className="font-mono">{env}</span>
        </h1>
        <p className="mt-1 max-w-3xl text-sm text-muted">
          Every dry run with <span className="font-mono">impact=true</span> (the CI gate, and the preview on{" "}
          <Link className="text-brass underline underline-offset-4" href={`/environments/${env}/imports`}>
            Imports
          </Link>
          ) analyses the graph as the change would leave it and checks these rules. A rule that blocks fails the CI gate and refuses the push; an architect or admin can
          still push it with a reason, which is kept in the audit log. The analysis is only as good as the inventory: a policy cannot see a need nobody declared.
        </p>
      </div>
      {error && <FormError message={`Could not load the policies: ${error.message}`} />}
      {v && (
        <form
          aria-label="Change policies"
          className="space-y-6"
          onSubmit={(e) => {
            e.preventDefault();
            void save(v);
          }}
        >
          <Card
            title="Rules"
            action={
              <span className="text-xs text-muted" data-testid="policies-summary">
                {data?.custom ? "set for this environment" : "defaults"} · {blocking === 0 ? "nothing blocks" : `${blocking} rule${blocking === 1 ? "" : "s"} block${blocking === 1 ? "s" : ""}`}
              </span>
            }
          >
            <ul>
              {POLICY_RULES.map((rule) => (
                <RuleRow key={rule} rule={rule} value={v.rules[rule]} canWrite={canWrite} onChange={(next) => setValues({ ...v, rules: { ...v.rules, [rule]: next } })} />
              ))}
            </ul>
          </Card>
          <Card title="What counts as moved">
            <p className="mb-3 text-sm text-muted">The impact lists a component when its pinch score or its place in the ranking changes by more than this. Smaller moves are left out of the table.</p>
            <div className="grid gap-3 sm:grid-cols-3">
              <div>
                <Label htmlFor="mv-score" hint="points, 0–100">Pinch score change over</Label>
                <TextInput id="mv-score" type="number" min={0} max={100} step={0.5} required className="font-mono" value={String(v.movement.pinchScore)} disabled={!canWrite} onChange={(e) => setValues({ ...v, movement: { ...v.movement, pinchScore: Number(e.target.value) } })} />
              </div>
              <div>
                <Label htmlFor="mv-rank" hint="places">Rank change over</Label>
                <TextInput id="mv-rank" type="number" min={0} step={1} required className="font-mono" value={String(v.movement.rank)} disabled={!canWrite} onChange={(e) => setValues({ ...v, movement: { ...v.movement, rank: Number(e.target.value) } })} />
              </div>
              <div>
                <Label htmlFor="mv-window" hint="rank changes count only this near the top">Within the top</Label>
                <TextInput id="mv-window" type="number" min={1} step={1} required className="font-mono" value={String(v.movement.topWindow)} disabled={!canWrite} onChange={(e) => setValues({ ...v, movement: { ...v.movement, topWindow: Number(e.target.value) } })} />
              </div>
            </div>
          </Card>
          {canWrite ? (
            <div className="flex flex-wrap items-center gap-2">
              <Button type="submit" variant="primary" data-testid="policies-save">
                Save policies
              </Button>
              {data?.custom && (
                <Button type="button" variant="ghost" onClick={() => void save(data.defaults)}>
                  Back to defaults
                </Button>
              )}
            </div>
          ) : (
            <p className="text-sm text-muted">Architects and admins set these policies.</p>
          )}
          {message && (
            <p className="text-sm text-ok" role="status">
              {message}
            </p>
          )}
          <FormError message={saveError} />
        </form>
      )}
    </div>
  );
}
