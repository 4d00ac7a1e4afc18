"use client";
// How the analysis reads needs that no file declares (lib/inventory/settings.ts): inferred from
// configuration, seen only in traces, and which graph it ranks; and which alert labels name a component.
import { useState } from "react";
import { Card } from "@/components/ui/Card";
import { FormError } from "@/components/ui/Field";
import { ApiForm, FormProblem, SubmitButton, submitWith, useApiForm } from "@/components/ui/form/api-form";
import { InputField, SelectInput } from "@/components/ui/form/fields";
import { settingsFormSchema, settingsViewSchema, type SettingsView } from "@/lib/api/schemas/environments";
import { sendJson, useApi } from "@/lib/client/api";

const VIEW_LABEL = { auto: "both when both exist (default)", declared: "declared and inferred needs only", observed: "traced calls only", both: "both" } as const;

function Form({ env, view, canWrite, saved, onSaved }: { env: string; view: SettingsView; canWrite: boolean; saved: string | null; onSaved: (v: SettingsView) => void }) {
  const s = view.settings;
  const form = useApiForm(settingsFormSchema, { ...s, analysisView: s.analysisView ?? "auto", alertLabels: s.alertLabels.join(", ") });
  const onSubmit = submitWith(form, (settings) => sendJson(settingsViewSchema, `/api/v1/environments/${env}/settings`, "PATCH", settings), onSaved);
  return (
    <ApiForm form={form} onSubmit={onSubmit} label="Analysis settings" className="space-y-3">
      <div className="grid gap-3 sm:grid-cols-2">
        <SelectInput
          name="inferredNeeds"
          label="Inferred needs count as"
          hint="a host name in configuration named it"
          disabled={!canWrite}
          options={[
            { value: "hard", label: "hard (down when unmet)" },
            { value: "soft", label: "soft (degraded when unmet)" },
          ]}
        />
        <SelectInput
          name="observedNeeds"
          label="Needs seen only in traces count as"
          hint="traces saw calls; no file declares it"
          disabled={!canWrite}
          options={[
            { value: "soft", label: "soft (degraded when unmet)" },
            { value: "hard", label: "hard (down when unmet)" },
          ]}
        />
        <SelectInput name="analysisView" label="Rank and drill on" disabled={!canWrite} options={Object.entries(VIEW_LABEL).map(([value, label]) => ({ value, label }))} />
        <InputField name="traceWindowDays" label="Trace window (days)" hint="traffic older than this is forgotten" type="number" number min={1} max={90} disabled={!canWrite} controlClassName="font-mono" />
        <InputField
          name="alertLabels"
          label="Alert labels that name a component"
          hint="Alertmanager alerts: the first of these labels whose value is a component key or alias names the component"
          placeholder="service, app, job"
          disabled={!canWrite}
          className="sm:col-span-2"
          controlClassName="font-mono"
        />
      </div>
      <FormProblem />
      {canWrite ? <SubmitButton working="Saving…">Save</SubmitButton> : <p className="text-xs text-muted">Architects and admins set these.</p>}
      {/* Inside the form (which remounts with the saved values), so it reads as this form's answer. */}
      {saved && (
        <p className="text-sm text-ok" role="status">
          {saved}
        </p>
      )}
    </ApiForm>
  );
}

export function SettingsForm({ env, canWrite }: { env: string; canWrite: boolean }) {
  const { data, error, mutate } = useApi(settingsViewSchema, `/api/v1/environments/${env}/settings`);
  const [message, setMessage] = useState<string | null>(null);
  const [version, setVersion] = useState(0);
  return (
    <Card title="How needs count, and how alerts name components">
      {error && <FormError message={`Could not load the settings: ${error.message}`} />}
      {data && (
        <Form
          key={version}
          env={env}
          view={data}
          canWrite={canWrite}
          saved={message}
          onSaved={(v) => {
            setMessage(v.requeued ? `Saved. Snapshot #${v.requeued.snapshot} is queued for analysis under these settings.` : "Saved.");
            void mutate(v, { revalidate: false });
            setVersion((n) => n + 1);
          }}
        />
      )}
    </Card>
  );
}
