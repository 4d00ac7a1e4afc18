"use client";
// The open incident over the map (?incident=current): the probable origins, silent suspects,
// firing components and what will likely fail next, each marked on its node with a word; the map
// focuses on the first origin unless the URL names a focus.
import Link from "next/link";
import { useMemo, type ReactNode } from "react";
import type { IncidentMark } from "@/components/map/nodes";
import { currentIncidentResponseSchema } from "@/lib/api/schemas/incidents";
import { useApi } from "@/lib/client/api";
import { INCIDENT_REFRESH_MS } from "./refresh";

export function useIncidentOverlay(env: string, on: boolean): { marks: ReadonlyMap<string, IncidentMark> | undefined; focus: string | null; legend: ReactNode } {
  const current = useApi(currentIncidentResponseSchema, on ? `/api/v1/environments/${env}/incidents/current` : null, { refreshInterval: INCIDENT_REFRESH_MS });
  const data = current.data;
  const marks = useMemo(() => {
    if (!data) return undefined;
    const m = new Map<string, IncidentMark>();
    const r = data.result;
    // Later roles never overwrite earlier ones: an origin is firing too, but is shown as the origin.
    const set = (k: string, mark: IncidentMark) => void (m.has(k) || m.set(k, mark));
    for (const o of r.origins) set(o.key, "origin");
    for (const s of r.silent) if (s.kind === "component") set(s.key, "silent");
    for (const k of r.firing) set(k, "firing");
    for (const k of [...r.predicted.down, ...r.predicted.degraded]) set(k, "predicted");
    return m;
  }, [data]);
  if (!on) return { marks: undefined, focus: null, legend: null };
  const r = data?.result;
  const legend = (
    <p className="text-xs text-muted" data-testid="incident-overlay">
      {!data ? (
        current.error ? `Could not load the incident: ${current.error.message}` : "Loading the incident…"
      ) : !data.incident ? (
        "No incident is open: nothing to draw."
      ) : (
        <>
          <span className="font-semibold text-down">Incident #{data.incident.number}</span> drawn over the map: probable origin{r!.origins.length === 1 ? "" : "s"} {r!.origins.map((o) => o.key).join(", ") || "none"} · {r!.firing.length} firing · {data.predictedTotal.down + data.predictedTotal.degraded} likely next
          {r!.silent.length > 0 && ` · ${r!.silent.length} silent suspect${r!.silent.length === 1 ? "" : "s"}`}. A probability from the declared graph, not a diagnosis.{" "}
          <Link href={`/environments/${env}/incidents`} className="text-brass hover:underline">
            Incident screen
          </Link>
        </>
      )}
    </p>
  );
  return { marks, focus: r?.origins[0]?.key ?? null, legend };
}
