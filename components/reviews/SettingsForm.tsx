"use client";
// How the analysis reads needs that no file declares (lib/inventory/settings.ts): inferred from
// configuration, seen only in traces, and which graph it ranks; and which alert labels name a component.
import { useEffect, useState } from "react";
import useSWR from "swr";
import { Button } from "@/components/ui/Button";
import { Card } from "@/components/ui/Card";
import { FormError, Label, Select, TextInput } from "@/components/ui/Field";
import { sendJson } from "@/components/ui/send-json";
import { fetchJson, type ApiError } from "@/lib/client/fetcher";
import type { EnvironmentSettings } from "@/lib/inventory/settings";

interface SettingsView {
  settings: EnvironmentSettings;
  defaults: EnvironmentSettings;
  requeued?: { snapshot: number } | null;
}

const VIEW_LABEL = { auto: "both when both exist (default)", declared: "declared and inferred needs only", observed: "traced calls only", both: "both" } as const;

export function SettingsForm({ env, canWrite }: { env: string; canWrite: boolean }) {
  const { data, error, mutate } = useSWR<SettingsView, ApiError>(`/api/v1/environments/${env}/settings`, fetchJson);
  const [values, setValues] = useState<EnvironmentSettings | null>(null);
  const [message, setMessage] = useState<string | null>(null);
  const [saveError, setSaveError] = useState<string | null>(null);
  // Typed as text so that a comma can be typed; split into the list on save.
  const [labelsText, setLabelsText] = useState("");
  useEffect(() => {
    if (data) {
      setValues(data.settings);
      setLabelsText(data.settings.alertLabels.join(", "));
    }
  }, [data]);

  async function save(next: EnvironmentSettings) {
    const res = await sendJson<SettingsView>(`/api/v1/environments/${env}/settings`, "PATCH", next);
    if (!res.ok || !res.data) {
      setMessage(null);
      return setSaveError(res.message);
    }
    setSaveError(null);
    setMessage(res.data.requeued ? `Saved. Snapshot #${res.data.requeued.snapshot} is queued for analysis under these settings.` : "Saved.");
    void mutate();
  }

  const v = values;
  return (
    <Card title="How needs count, and how alerts name components">
      {error && <FormError message={`Could not load the settings: ${error.message}`} />}
      {v && (
        <form
          aria-label="Analysis settings"
          className="space-y-3"
          onSubmit={(e) => {
            e.preventDefault();
            void save({ ...v, alertLabels: labelsText.split(",").map((x) => x.trim()).filter(Boolean) });
          }}
        >
          <div className="grid gap-3 sm:grid-cols-2">
            <div>
              <Label htmlFor="s-inferred" hint="a host name in configuration named it">Inferred needs count as</Label>
              <Select id="s-inferred" value={v.inferredNeeds} disabled={!canWrite} onChange={(e) => setValues({ ...v, inferredNeeds: e.target.value as "hard" | "soft" })}>
                <option value="hard">hard (down when unmet)</option>
                <option value="soft">soft (degraded when unmet)</option>
              </Select>
            </div>
            <div>
              <Label htmlFor="s-observed" hint="traces saw calls; no file declares it">Needs seen only in traces count as</Label>
              <Select id="s-observed" value={v.observedNeeds} disabled={!canWrite} onChange={(e) => setValues({ ...v, observedNeeds: e.target.value as "hard" | "soft" })}>
                <option value="soft">soft (degraded when unmet)</option>
                <option value="hard">hard (down when unmet)</option>
              </Select>
            </div>
            <div>
              <Label htmlFor="s-view">Rank and drill on</Label>
              <Select
                id="s-view"
                value={v.analysisView ?? "auto"}
                disabled={!canWrite}
                onChange={(e) => setValues({ ...v, analysisView: e.target.value === "auto" ? null : (e.target.value as "declared" | "observed" | "both") })}
              >
                {Object.entries(VIEW_LABEL).map(([value, label]) => (
                  <option key={value} value={value}>
                    {label}
                  </option>
                ))}
              </Select>
            </div>
            <div>
              <Label htmlFor="s-window" hint="traffic older than this is forgotten">Trace window (days)</Label>
              <TextInput id="s-window" type="number" min={1} max={90} required value={v.traceWindowDays} disabled={!canWrite} onChange={(e) => setValues({ ...v, traceWindowDays: Number(e.target.value) })} className="font-mono" />
            </div>
            <div className="sm:col-span-2">
              <Label htmlFor="s-alert-labels" hint="Alertmanager alerts: the first of these labels whose value is a component key or alias names the component">
                Alert labels that name a component
              </Label>
              <TextInput id="s-alert-labels" required value={labelsText} disabled={!canWrite} onChange={(e) => setLabelsText(e.target.value)} placeholder="service, app, job" className="font-mono" />
            </div>
          </div>
          {canWrite ? (
            <Button type="submit" variant="primary">
              Save
            </Button>
          ) : (
            <p className="text-xs text-muted">Architects and admins set these.</p>
          )}
          {message && <p className="text-sm text-ok" role="status">{message}</p>}
          <FormError message={saveError} />
        </form>
      )}
    </Card>
  );
}
