"use client";
// Pinch-score weights of one environment: score = 100 × (b·B + r·R + s·S) (DESIGN §3).
import { useState } from "react";
import { useWatch } from "react-hook-form";
import { Button } from "@/components/ui/Button";
import { Card } from "@/components/ui/Card";
import { FormError } from "@/components/ui/Field";
import { ApiForm, FormProblem, SubmitButton, submitWith, useApiForm } from "@/components/ui/form/api-form";
import { InputField } from "@/components/ui/form/fields";
import { pinchWeightsSchema } from "@/lib/analysis/types";
import { weightsViewSchema, type WeightsView } from "@/lib/api/schemas/reviews";
import { sendJson, useApi } from "@/lib/client/api";

type Weights = WeightsView["weights"];
const FIELDS: Array<{ name: keyof Weights; label: string; hint: string }> = [
  { name: "betweenness", label: "B · betweenness", hint: "share of shortest paths through it" },
  { name: "reach", label: "R · reach", hint: "tier-weighted share of what goes down with it" },
  { name: "single", label: "S · single instance", hint: "one replica or fewer than two zones" },
];

const savedMessage = (v: WeightsView) =>
  v.requeued ? `Saved. Snapshot #${v.requeued.snapshot} is queued for analysis with these weights; scores update when it finishes.` : "Saved. Scores use them from the next snapshot.";

function Form({ view, canWrite, env, onSaved }: { view: WeightsView; canWrite: boolean; env: string; onSaved: (v: WeightsView) => void }) {
  const form = useApiForm(pinchWeightsSchema, view.weights);
  const values = useWatch({ control: form.control });
  const url = `/api/v1/environments/${env}/weights`;
  const onSubmit = submitWith(form, (weights) => sendJson(weightsViewSchema, url, "PUT", weights), onSaved);
  const [resetError, setResetError] = useState<string | null>(null);
  const backToDefaults = async () => {
    const res = await sendJson(weightsViewSchema, url, "PUT", view.defaults);
    setResetError(res.ok ? null : res.error.detail);
    if (res.ok) onSaved(res.data);
  };
  const shown = (n: number | undefined, letter: string) => (n === undefined || Number.isNaN(n) ? letter : String(n));
  return (
    <ApiForm form={form} onSubmit={onSubmit} label="Pinch-score weights" className="space-y-3">
      <p className="font-mono text-xs text-muted">
        score = 100 × ({shown(values.betweenness, "b")}·B + {shown(values.reach, "r")}·R + {shown(values.single, "s")}·S)
      </p>
      <div className="grid gap-3 sm:grid-cols-3">
        {FIELDS.map((f) => (
          <InputField key={f.name} name={f.name} label={f.label} help={f.hint} number type="number" min={0} max={1} step={0.05} disabled={!canWrite} controlClassName="font-mono" />
        ))}
      </div>
      <FormProblem />
      {canWrite ? (
        <div className="flex flex-wrap items-center gap-2">
          <SubmitButton working="Saving…">Save and re-analyse</SubmitButton>
          {view.custom && (
            <Button type="button" variant="ghost" onClick={() => void backToDefaults()}>
              Back to defaults
            </Button>
          )}
        </div>
      ) : (
        <p className="text-xs text-muted">Architects and admins set these.</p>
      )}
      <FormError message={resetError} />
    </ApiForm>
  );
}

export function WeightsForm({ env, canWrite }: { env: string; canWrite: boolean }) {
  const { data, error, mutate } = useApi(weightsViewSchema, `/api/v1/environments/${env}/weights`);
  const [message, setMessage] = useState<string | null>(null);
  // Saved weights mount the form again with them as its starting values.
  const [version, setVersion] = useState(0);
  return (
    <Card title="Pinch-score weights" action={data && <span className="text-xs text-muted">{data.custom ? "set for this environment" : "defaults"}</span>}>
      {error && <FormError message={`Could not load the weights: ${error.message}`} />}
      {data && (
        <Form
          key={version}
          view={data}
          canWrite={canWrite}
          env={env}
          onSaved={(v) => {
            setMessage(savedMessage(v));
            void mutate(v, { revalidate: false });
            setVersion((n) => n + 1);
          }}
        />
      )}
      {message && (
        <p className="mt-2 text-sm text-ok" role="status">
          {message}
        </p>
      )}
    </Card>
  );
}
