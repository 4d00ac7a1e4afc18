"use client";

// The map screen: fetches the graph, pins and notes, and wires the canvas and inspector to the API.
import { usePathname, useRouter, useSearchParams } from "next/navigation";
import { useCallback, useMemo } from "react";
import useSWR from "swr";
import { fetchJson, type ApiError } from "@/lib/client/fetcher";
import { ageOf, dateTime } from "@/components/ui/format";
import { ReviewBadge } from "@/components/reviews/ReviewBadge";
import { useReviews } from "@/components/reviews/useReviews";
import { Inspector, inspectorLinks, type InspectorSave } from "./Inspector";
import { MapCanvas } from "./MapCanvas";
import { mapGraphSchema, type ColourMode, type MapGraph, type PinnedPositions } from "./types";
import { useIncidentOverlay } from "@/components/incidents/MapOverlay";

async function fetchGraph(url: string): Promise<MapGraph> {
  return mapGraphSchema.parse(await fetchJson<unknown>(url));
}

function InspectorFor({ env, graph, nodeKey, canEdit, onSelect }: { env: string; graph: MapGraph; nodeKey: string; canEdit: boolean; onSelect(key: string): void }) {
  const detail = useSWR<{ notes: string | null }, ApiError>(`/api/v1/environments/${env}/components/${nodeKey}`, fetchJson);
  const reviews = useReviews(env);
  const node = graph.nodes.find((n) => n.key === nodeKey);
  if (!node) return null;
  const { needs, dependents } = inspectorLinks(graph, nodeKey);
  async function onSave(value: InspectorSave) {
    const res = await fetch(`/api/v1/environments/${env}/components/${nodeKey}`, {
      method: "PATCH",
      headers: { "content-type": "application/json" },
      body: JSON.stringify({ team: value.team || null, notes: value.notes || null }),
    });
    if (!res.ok) {
      const body = (await res.json().catch(() => null)) as { message?: string } | null;
      throw new Error(body?.message ?? `Saving failed (${res.status})`);
    }
    await detail.mutate();
  }
  return (
    <Inspector
      environment={env}
      node={node}
      needs={needs}
      dependents={dependents}
      teams={graph.teams}
      notes={detail.data?.notes ?? null}
      canEdit={canEdit}
      onSave={onSave}
      onSelect={onSelect}
      badge={<ReviewBadge review={reviews.byKey[nodeKey]} />}
    />
  );
}

export function MapScreen({ env, focus, colour, canEdit, incident = false }: { env: string; focus: string | null; colour?: ColourMode | null; canEdit: boolean; incident?: boolean }) {
  const overlay = useIncidentOverlay(env, incident);
  const router = useRouter();
  const pathname = usePathname();
  const search = useSearchParams();
  const graph = useSWR<MapGraph, ApiError>(`/api/v1/environments/${env}/graph`, fetchGraph, { revalidateOnFocus: false });
  const pins = useSWR<{ positions: PinnedPositions }, ApiError>(`/api/v1/environments/${env}/map/positions`, fetchJson, { revalidateOnFocus: false });
  const pinned = useMemo(() => pins.data?.positions ?? {}, [pins.data]);

  const setFocusInUrl = useCallback(
    (key: string | null) => {
      const next = new URLSearchParams(search.toString());
      if (key) next.set("focus", key);
      else next.delete("focus");
      const qs = next.toString();
      router.replace(qs ? `${pathname}?${qs}` : pathname, { scroll: false });
    },
    [pathname, router, search],
  );

  const onPinPositions = useCallback(
    async (positions: PinnedPositions) => {
      if (!canEdit) return;
      await fetch(`/api/v1/environments/${env}/map/positions`, { method: "PUT", headers: { "content-type": "application/json" }, body: JSON.stringify(positions) });
      await pins.mutate({ positions }, { revalidate: false });
    },
    [canEdit, env, pins],
  );

  if (graph.error) {
    return (
      <p role="alert" className="rounded-md border border-down/50 bg-down/10 px-3 py-2 text-sm">
        {graph.error.status === 404 ? `Nothing has been pushed to ${env} yet.` : `Could not load the map: ${graph.error.message}`}
      </p>
    );
  }
  if (!graph.data) return <p className="text-muted" aria-busy="true">Loading the dependency graph…</p>;
  const data = graph.data;
  return (
    <div className="flex h-[calc(100vh-7.5rem)] min-h-[520px] flex-col gap-2">
      <p className="text-xs text-muted" data-testid="map-caution">
        {data.snapshot ? `Snapshot #${data.snapshot.number}, pushed ${ageOf(data.snapshot.createdAt)} (${dateTime(data.snapshot.createdAt)}). ` : "No snapshot yet. "}
        The map is only as good as the inventory: it shows what was declared, nothing more; undeclared components (needed by something, declared by no source) are drawn dashed.
      </p>
      {overlay.legend}
      <div className="min-h-0 flex-1 overflow-hidden rounded-lg border border-line">
        <MapCanvas
          graph={data}
          focus={focus ?? overlay.focus}
          marks={overlay.marks}
          colour={colour ?? null}
          canEdit={canEdit}
          pinned={pinned}
          onPinPositions={onPinPositions}
          renderInspector={(key) => <InspectorFor env={env} graph={data} nodeKey={key} canEdit={canEdit} onSelect={(k) => setFocusInUrl(k)} />}
        />
      </div>
    </div>
  );
}
