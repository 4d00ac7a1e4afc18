"use client";
// Change policies of one environment (lib/impact/policies.ts): which rules a push's impact is held
// to, each blocking or only warning, and what counts as "moved" in the impact's table.
import Link from "next/link";
import { useState } from "react";
import { useWatch, type Control } from "react-hook-form";
import { Badge } from "@/components/ui/Badge";
import { Button } from "@/components/ui/Button";
import { Card } from "@/components/ui/Card";
import { FormError } from "@/components/ui/Field";
import { ApiForm, FormProblem, SubmitButton, submitWith, useApiForm } from "@/components/ui/form/api-form";
import { CheckboxField, InputField, SelectInput } from "@/components/ui/form/fields";
import { policiesViewSchema, type PoliciesViewBody } from "@/lib/api/schemas/policies";
import { sendJson, useApi } from "@/lib/client/api";
import { POLICY_RULES, RULE_INFO, policySetSchema, type PolicyRuleId, type PolicySet } from "@/lib/impact/policies";

function RuleRow({ rule, control, canWrite }: { rule: PolicyRuleId; control: Control<PolicySet>; canWrite: boolean }) {
  const info = RULE_INFO[rule];
  const param = info.parameter;
  const value = useWatch({ control, name: `rules.${rule}` }) as PolicySet["rules"][PolicyRuleId];
  const paramValue = param ? (value as Record<string, unknown>)[param.name] : undefined;
  const title = info.title.replace("{n}", param ? String(paramValue) : "");
  return (
    <li className="grid gap-3 border-t border-line py-3 first:border-t-0 md:grid-cols-[1fr_9rem_9rem]" data-testid={`policy-${rule}`}>
      <div>
        <div className="flex items-center gap-2 text-sm font-medium">
          <CheckboxField name={`rules.${rule}.enabled`} label={<span className="sr-only">{title}: on</span>} disabled={!canWrite} />
          {title}
          {!value.enabled ? <Badge>off</Badge> : value.severity === "block" ? <Badge tone="down">blocks</Badge> : <Badge tone="degraded">warns</Badge>}
        </div>
        <p className="mt-1 text-xs text-muted">
          {info.description.replace("{n}", param ? String(paramValue) : "")} {info.why}
        </p>
      </div>
      <SelectInput
        name={`rules.${rule}.severity`}
        label="When it fails"
        disabled={!canWrite}
        className={value.enabled ? "" : "opacity-60"}
        options={[
          { value: "warn", label: "warn only" },
          { value: "block", label: "block the push" },
        ]}
      />
      <div className={value.enabled ? "" : "opacity-60"}>
        {param && <InputField name={`rules.${rule}.${param.name}`} label={param.name === "k" ? "K" : "N"} type="number" number min={param.min} max={param.max} step={1} disabled={!canWrite} controlClassName="font-mono" help={param.label} />}
      </div>
    </li>
  );
}

function Summary({ control, custom }: { control: Control<PolicySet>; custom: boolean }) {
  const rules = useWatch({ control, name: "rules" });
  const blocking = POLICY_RULES.filter((r) => rules[r].enabled && rules[r].severity === "block").length;
  return (
    <span className="text-xs text-muted" data-testid="policies-summary">
      {custom ? "set for this environment" : "defaults"} · {blocking === 0 ? "nothing blocks" : `${blocking} rule${blocking === 1 ? "" : "s"} block${blocking === 1 ? "s" : ""}`}
    </span>
  );
}

function PoliciesForm({ env, view, canWrite, onSaved }: { env: string; view: PoliciesViewBody; canWrite: boolean; onSaved: (v: PoliciesViewBody) => void }) {
  const form = useApiForm(policySetSchema, view.policies);
  const url = `/api/v1/environments/${env}/policies`;
  const onSubmit = submitWith(form, (policies) => sendJson(policiesViewSchema, url, "PUT", policies), onSaved);
  const [resetError, setResetError] = useState<string | null>(null);
  const backToDefaults = async () => {
    const res = await sendJson(policiesViewSchema, url, "PUT", view.defaults);
    setResetError(res.ok ? null : res.error.detail);
    if (res.ok) onSaved(res.data);
  };
  return (
    <ApiForm form={form} onSubmit={onSubmit} label="Change policies" className="space-y-6">
      <Card title="Rules" action={<Summary control={form.control} custom={view.custom} />}>
        <ul>
          {POLICY_RULES.map((rule) => (
            <RuleRow key={rule} rule={rule} control={form.control} canWrite={canWrite} />
          ))}
        </ul>
      </Card>
      <Card title="What counts as moved">
        <p className="mb-3 text-sm text-muted">The impact lists a component when its pinch score or its place in the ranking changes by more than this. Smaller moves are left out of the table.</p>
        <div className="grid gap-3 sm:grid-cols-3">
          <InputField name="movement.pinchScore" label="Pinch score change over" hint="points, 0–100" type="number" number min={0} max={100} step={0.5} disabled={!canWrite} controlClassName="font-mono" />
          <InputField name="movement.rank" label="Rank change over" hint="places" type="number" number min={0} step={1} disabled={!canWrite} controlClassName="font-mono" />
          <InputField name="movement.topWindow" label="Within the top" hint="rank changes count only this near the top" type="number" number min={1} step={1} disabled={!canWrite} controlClassName="font-mono" />
        </div>
      </Card>
      <FormProblem />
      {canWrite ? (
        <div className="flex flex-wrap items-center gap-2">
          <SubmitButton testId="policies-save" working="Saving…">
            Save policies
          </SubmitButton>
          {view.custom && (
            <Button type="button" variant="ghost" onClick={() => void backToDefaults()}>
              Back to defaults
            </Button>
          )}
        </div>
      ) : (
        <p className="text-sm text-muted">Architects and admins set these policies.</p>
      )}
      <FormError message={resetError} />
    </ApiForm>
  );
}

export function PoliciesScreen({ env, canWrite }: { env: string; canWrite: boolean }) {
  const { data, error, mutate } = useApi(policiesViewSchema, `/api/v1/environments/${env}/policies`);
  const [message, setMessage] = useState<string | null>(null);
  // Saved policies mount the form again with them as its starting values.
  const [version, setVersion] = useState(0);
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
      {data && (
        <PoliciesForm
          key={version}
          env={env}
          view={data}
          canWrite={canWrite}
          onSaved={(v) => {
            setMessage("Saved. Dry runs and pushes are held to these policies from now on.");
            void mutate(v, { revalidate: false });
            setVersion((n) => n + 1);
          }}
        />
      )}
      {message && (
        <p className="text-sm text-ok" role="status">
          {message}
        </p>
      )}
    </div>
  );
}
