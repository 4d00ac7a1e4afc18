"use client";
// Pinch-score weights of one environment: score = 100 × (b·B + r·R + s·S) (DESIGN §3).
import { useEffect, useState } from "react";
import useSWR from "swr";
import { Button } from "@/components/ui/Button";
import { Card } from "@/components/ui/Card";
import { FormError, Label, TextInput } from "@/components/ui/Field";
import { sendJson } from "@/components/ui/send-json";
import { fetchJson, type ApiError } from "@/lib/client/fetcher";
import type { WeightsView } from "@/lib/data/weights";

type Weights = WeightsView["weights"];
const FIELDS: Array<{ name: keyof Weights; label: string; hint: string }> = [
  { name: "betweenness", label: "B · betweenness", hint: "share of shortest paths through it" },
  { name: "reach", label: "R · reach", hint: "tier-weighted share of what goes down with it" },
  { name: "single", label: "S · single instance", hint: "one replica or fewer than two zones" },
];

export function WeightsForm({ env, canWrite }: { env: string; canWrite: boolean }) {
  const { data, error, mutate } = useSWR<WeightsView, ApiError>(`/api/v1/environments/${env}/weights`, fetchJson);
  const [values, setValues] = useState<Record<keyof Weights, string>>({ betweenness: "", reach: "", single: "" });
  const [message, setMessage] = useState<string | null>(null);
  const [saveError, setSaveError] = useState<string | null>(null);

  useEffect(() => {
    if (data) setValues({ betweenness: String(data.weights.betweenness), reach: String(data.weights.reach), single: String(data.weights.single) });
  }, [data]);

  async function save(weights: Weights) {
    const res = await sendJson<WeightsView & { requeued: { snapshot: number } | null }>(`/api/v1/environments/${env}/weights`, "PUT", weights);
    if (!res.ok || !res.data) {
      setMessage(null);
      return setSaveError(res.message);
    }
    setSaveError(null);
    setMessage(res.data.requeued ? `Saved. Snapshot #${res.data.requeued.snapshot} is queued for analysis with these weights; scores update when it finishes.` : "Saved. Scores use them from the next snapshot.");
    void mutate();
  }

  const parsed: Weights = { betweenness: Number(values.betweenness), reach: Number(values.reach), single: Number(values.single) };
  return (
    <Card title="Pinch-score weights" action={data && <span className="text-xs text-muted">{data.custom ? "set for this environment" : "defaults"}</span>}>
      {error && <FormError message={`Could not load the weights: ${error.message}`} />}
      <form
        aria-label="Pinch-score weights"
        onSubmit={(e) => {
          e.preventDefault();
          void save(parsed);
        }}
        className="space-y-3"
      >
        <p className="font-mono text-xs text-muted">
          score = 100 × ({values.betweenness || "b"}·B + {values.reach || "r"}·R + {values.single || "s"}·S)
        </p>
        <div className="grid gap-3 sm:grid-cols-3">
          {FIELDS.map((f) => (
            <div key={f.name}>
              <Label htmlFor={`w-${f.name}`}>{f.label}</Label>
              <TextInput
                id={`w-${f.name}`}
                type="number"
                min={0}
                max={1}
                step={0.05}
                required
                value={values[f.name]}
                disabled={!canWrite}
                onChange={(e) => setValues((v) => ({ ...v, [f.name]: e.target.value }))}
                className="font-mono"
              />
              <p className="mt-1 text-xs text-faint">{f.hint}</p>
            </div>
          ))}
        </div>
        {canWrite ? (
          <div className="flex flex-wrap items-center gap-2">
            <Button type="submit" variant="primary">
              Save and re-analyse
            </Button>
            {data?.custom && (
              <Button type="button" variant="ghost" onClick={() => void save(data.defaults)}>
                Back to defaults
              </Button>
            )}
          </div>
        ) : (
          <p className="text-xs text-muted">Architects and admins set these.</p>
        )}
        {message && <p className="text-sm text-ok" role="status">{message}</p>}
        <FormError message={saveError} />
      </form>
    </Card>
  );
}
