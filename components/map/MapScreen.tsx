"use client";

// The map screen: fetches the graph, pins and notes, and wires the canvas and inspector to the API.
import { usePathname, useRouter, useSearchParams } from "next/navigation";
import { useCallback, useMemo } from "react";
import { When } from "@/components/ui/When";
import { annotationResultSchema, componentDetailResponseSchema } from "@/lib/api/schemas/components";
import { mapGraphSchema, mapLayoutsResponseSchema, positionsResponseSchema } from "@/lib/api/schemas/map";
import { chainResponseSchema } from "@/lib/api/schemas/analysis";
import { sendJson, useApi } from "@/lib/client/api";
import { ReviewBadge } from "@/components/reviews/ReviewBadge";
import { useReviews } from "@/components/reviews/useReviews";
import { Inspector, inspectorLinks, type InspectorSave } from "./Inspector";
import { MapCanvas } from "./MapCanvas";
import type { ColourMode, MapGraph, PinnedPositions } from "./types";
import { useIncidentOverlay } from "@/components/incidents/MapOverlay";

function InspectorFor({ env, graph, nodeKey, canEdit, onSelect, onWhy }: { env: string; graph: MapGraph; nodeKey: string; canEdit: boolean; onSelect(key: string): void; onWhy(target: string): void }) {
  const detail = useApi(componentDetailResponseSchema, `/api/v1/environments/${env}/components/${encodeURIComponent(nodeKey)}`);
  const reviews = useReviews(env);
  const node = graph.nodes.find((n) => n.key === nodeKey);
  if (!node) return null;
  const { needs, dependents } = inspectorLinks(graph, nodeKey);
  async function onSave(value: InspectorSave) {
    const res = await sendJson(annotationResultSchema, `/api/v1/environments/${env}/components/${encodeURIComponent(nodeKey)}`, "PATCH", { team: value.team, notes: value.notes });
    if (!res.ok) return res.error;
    await detail.mutate();
    return null;
  }
  return (
    <Inspector
      environment={env}
      node={node}
      needs={needs}
      dependents={dependents}
      teams={graph.teams}
      notes={detail.data ? detail.data.notes : undefined}
      canEdit={canEdit}
      onSave={onSave}
      onSelect={onSelect}
      badge={<ReviewBadge review={reviews.byKey[nodeKey]} />}
      onWhy={onWhy}
      allKeys={graph.nodes.map((n) => n.key)}
    />
  );
}

export function MapScreen({ env, focus, colour, canEdit, incident = false }: { env: string; focus: string | null; colour?: ColourMode | null; canEdit: boolean; incident?: boolean }) {
  const overlay = useIncidentOverlay(env, incident);
  const router = useRouter();
  const pathname = usePathname();
  const search = useSearchParams();
  const graph = useApi(mapGraphSchema, `/api/v1/environments/${env}/graph`, { revalidateOnFocus: false });
  const pins = useApi(positionsResponseSchema, `/api/v1/environments/${env}/map/positions`, { revalidateOnFocus: false });
  const pinned = useMemo(() => pins.data?.positions ?? {}, [pins.data]);
  const layouts = useApi(mapLayoutsResponseSchema, `/api/v1/environments/${env}/map/layouts`, { revalidateOnFocus: false });
  // ?chain=a,b: why does a need b (the chain of needs, highlighted on the map).
  const chainParam = search.get("chain");
  const [chainFrom, chainTo] = chainParam ? chainParam.split(",", 2) : [];
  const chain = useApi(chainResponseSchema, chainFrom && chainTo ? `/api/v1/environments/${env}/chain?from=${encodeURIComponent(chainFrom)}&to=${encodeURIComponent(chainTo)}` : null, { revalidateOnFocus: false });

  const setParamInUrl = useCallback(
    (name: "focus" | "chain", value: string | null) => {
      const next = new URLSearchParams(search.toString());
      if (value) next.set(name, value);
      else next.delete(name);
      const qs = next.toString();
      router.replace(qs ? `${pathname}?${qs}` : pathname, { scroll: false });
    },
    [pathname, router, search],
  );

  const onPinPositions = useCallback(
    async (positions: PinnedPositions) => {
      if (!canEdit) return;
      const res = await sendJson(positionsResponseSchema, `/api/v1/environments/${env}/map/positions`, "PUT", positions);
      if (res.ok) await pins.mutate(res.data, { revalidate: false });
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
  // Stored positions are waited for (briefly: one small query), so the browser does not start ELK for nothing.
  if (!graph.data || (!layouts.data && !layouts.error)) return <p className="text-muted" aria-busy="true">Loading the dependency graph…</p>;
  const stored = layouts.data && graph.data.snapshot && layouts.data.snapshot?.number === graph.data.snapshot.number && Object.keys(layouts.data.views).length > 0 ? layouts.data.views : null;
  const data = graph.data;
  return (
    <div className="flex h-[calc(100vh-7.5rem)] min-h-[520px] flex-col gap-2">
      <p className="text-xs text-muted" data-testid="map-caution">
        {data.snapshot ? (
          <>
            Snapshot #{data.snapshot.number}, pushed <When at={data.snapshot.createdAt} />.{" "}
          </>
        ) : (
          "No snapshot yet. "
        )}
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
          stored={stored}
          chain={chainFrom && chainTo ? (chain.data ?? null) : null}
          onClearChain={() => setParamInUrl("chain", null)}
          renderInspector={(key) => <InspectorFor env={env} graph={data} nodeKey={key} canEdit={canEdit} onSelect={(k) => setParamInUrl("focus", k)} onWhy={(target) => setParamInUrl("chain", `${key},${target}`)} />}
        />
      </div>
    </div>
  );
}
