"use client";
// The dependency map: React Flow canvas over positions the worker stored for the snapshot
// (lib/map/estate.ts composes any team-grouped view from them), or over an ELK layout computed in a
// web worker for what only the browser knows (a filter, a focus, a chain).
import "@xyflow/react/dist/style.css";
import "./map.css";
import { Background, BackgroundVariant, Controls, MarkerType, MiniMap, Panel, ReactFlow, ReactFlowProvider, applyNodeChanges, useReactFlow, useStore, type NodeChange } from "@xyflow/react";
import { useCallback, useEffect, useId, useMemo, useRef, useState, useSyncExternalStore, type CSSProperties, type ReactNode } from "react";
import { GraphViewBadge } from "@/components/analysis/SnapshotMeta";
import type { ChainResponse } from "@/lib/api/schemas/analysis";
import { TEAM_VIEW_ABOVE, bundleHubs, composeStored, type StoredViews } from "@/lib/map/estate";
import { buildLegend, buildPalette, MODE_LABELS, OKABE_ITO, paintNode, UNDECLARED } from "./colour";
import { downloadBlob, svgToPng } from "./export";
import { buildExport, exportTheme, titleBlockFor, type ExportBackground } from "./export-view";
import { Inspector, inspectorLinks } from "./Inspector";
import { toFlow, type MapFlowEdge, type MapFlowNode } from "./layout";
import { LayoutStatus } from "./LayoutStatus";
import { FilterMenu } from "./MapFilters";
import { LegendPanel } from "./MapLegend";
import { edgeTypes, nodeTypes, DecorContext, type Decor, type IncidentMark, type TeamStats } from "./nodes";
import { KIND_LABEL } from "./shapes";
import { COLOUR_MODES, type ColourMode, type MapGraph, type PinnedPositions, type Position } from "./types";
import { useElkLayout } from "./useElkLayout";
import { useMapKeyboard } from "./useMapKeyboard";
import { NO_FILTERS, buildAdjacency, groupNodeId, groupSelection, teamNodeId, selectComponents, teamName, teamSlotOf, teamSlots, type GroupingSpec, type MapFilters, type Selection } from "./view";

export interface MapCanvasProps {
  graph: MapGraph;
  focus?: string | null;
  /** colour mode to open with (`?colour=` in the URL) */
  colour?: ColourMode | null;
  canEdit: boolean;
  onSelect?(key: string | null): void;
  onPinPositions?(positions: Record<string, { x: number; y: number }>): void;
  pinned?: Record<string, { x: number; y: number }>;
  renderInspector?(key: string): ReactNode;
  /** An incident drawn over the map (components/incidents): each marked component's role. */
  marks?: ReadonlyMap<string, IncidentMark>;
  /** Positions the worker stored for this snapshot (GET …/map/layouts); null while none. */
  stored?: StoredViews | null;
  /** "Why does A need B" (`?chain=a,b`): the chain to highlight. */
  chain?: ChainResponse | null;
  onClearChain?(): void;
}

export function MapCanvas(props: MapCanvasProps) {
  return (
    <ReactFlowProvider>
      <MapCanvasInner {...props} />
    </ReactFlowProvider>
  );
}

function subscribeTheme(onChange: () => void): () => void {
  const obs = new MutationObserver(onChange);
  obs.observe(document.documentElement, { attributes: true, attributeFilter: ["data-theme"] });
  return () => obs.disconnect();
}
const readTheme = (): "dark" | "light" => (document.documentElement.dataset.theme === "light" ? "light" : "dark");

function useDataTheme(): "dark" | "light" {
  return useSyncExternalStore(subscribeTheme, readTheme, () => "dark");
}

/** Above this many nodes on the canvas the overview (minimap) starts hidden: it shows specks, and covers nodes. */
const MINIMAP_OFF_ABOVE = 120;

/**
 * Semantic zoom: how much component labels grow as the map zooms out, so that a key stays about
 * 11 px on screen (common practice for small labels); the subtitle and badges go at "far".
 */
function useZoomStyle(): { style: CSSProperties; level: "far" | "mid" | "near" } {
  const zoom = useStore((s) => s.transform[2]);
  const scale = Math.min(2.8, Math.max(1, 0.85 / Math.max(zoom, 0.05)));
  return { style: { ["--pp-label-scale" as string]: scale.toFixed(2) }, level: zoom < 0.5 ? "far" : zoom < 0.85 ? "mid" : "near" };
}

function MapCanvasInner(props: MapCanvasProps) {
  const { graph, canEdit } = props;
  const rf = useReactFlow<MapFlowNode, MapFlowEdge>();
  const theme = useDataTheme();
  const ids = useId();
  const zoom = useZoomStyle();

  const [colourMode, setColourMode] = useState<ColourMode>(props.colour ?? "betweenness");
  const [filters, setFilters] = useState<MapFilters>(NO_FILTERS);
  const [focusKey, setFocusKey] = useState<string | null>(props.focus ?? null);
  const [focusProp, setFocusProp] = useState<string | null>(props.focus ?? null);
  if ((props.focus ?? null) !== focusProp) {
    setFocusProp(props.focus ?? null);
    setFocusKey(props.focus ?? null);
  }
  const [hops, setHops] = useState(2);
  /** null = automatic: the team-to-team view above TEAM_VIEW_ABOVE components, else flat */
  const [grouping, setGrouping] = useState<GroupingSpec | null>(null);
  const [selected, setSelected] = useState<string | null>(null);
  const [inspecting, setInspecting] = useState<string | null>(null);
  const [openHub, setOpenHub] = useState<string | null>(null);
  const [search, setSearch] = useState("");
  const [notice, setNotice] = useState<string | null>(null);
  const [localPins, setLocalPins] = useState<PinnedPositions>({});
  const [pinsCleared, setPinsCleared] = useState(false);
  const [showMinimap, setShowMinimap] = useState<boolean | null>(null);
  const [exportBg, setExportBg] = useState<ExportBackground | null>(null);
  const [pinnedProp, setPinnedProp] = useState(props.pinned);
  if (props.pinned !== pinnedProp) {
    setPinnedProp(props.pinned);
    setPinsCleared(false);
  }
  const pendingCentre = useRef<string | null>(null);

  const slots = useMemo(() => teamSlots(graph), [graph]);
  const teamNames = useMemo(() => new Map(slots.map((s) => [s, teamName(graph, s)])), [graph, slots]);
  const byKey = useMemo(() => new Map(graph.nodes.map((n) => [n.key, n])), [graph]);
  const allKeys = useMemo(() => graph.nodes.map((n) => n.key), [graph]);

  // The chain asked about replaces the view: its components, in order, and the needs between them.
  const chainPath = props.chain?.path ?? null;
  const chainSets = useMemo(() => {
    if (!chainPath) return null;
    const edges = new Set<string>();
    for (let i = 1; i < chainPath.length; i++) edges.add(`${chainPath[i - 1]}->${chainPath[i]}`);
    return { nodes: new Set(chainPath), edges };
  }, [chainPath]);

  const requestedFocus = useMemo(() => (focusKey ? { key: focusKey, hops } : null), [focusKey, hops]);
  const selection: Selection = useMemo(() => {
    if (chainSets) {
      return { nodes: graph.nodes.filter((n) => chainSets.nodes.has(n.key)), edges: graph.edges.filter((e) => chainSets.edges.has(`${e.from}->${e.to}`)), focus: null };
    }
    return selectComponents(graph, filters, requestedFocus);
  }, [graph, filters, requestedFocus, chainSets]);
  const autoTeams = grouping === null && !chainSets && !selection.focus && selection.nodes.length > TEAM_VIEW_ABOVE;
  const effGrouping: GroupingSpec = useMemo(
    () => grouping ?? (autoTeams ? { byTeam: true, collapsed: new Set(slots) } : { byTeam: false, collapsed: new Set<string>() }),
    [grouping, autoTeams, slots],
  );
  const bundled = useMemo(() => bundleHubs(groupSelection(graph, selection, effGrouping)), [graph, selection, effGrouping]);
  const view = bundled.view;
  const hubs = bundled.hubs;

  // Stored positions when they cover this view (no filter, focus or chain); else ELK in the browser.
  const fromStore = useMemo(() => (filters === NO_FILTERS && !selection.focus && !chainSets ? composeStored(view, props.stored ?? null) : null), [filters, selection.focus, chainSets, view, props.stored]);
  const layout = useElkLayout(fromStore ? null : view);

  const pins = useMemo(() => (pinsCleared ? localPins : { ...(props.pinned ?? {}), ...localPins }), [pinsCleared, localPins, props.pinned]);
  const laid = fromStore ?? (layout.status === "done" ? layout.result : null);
  const flow = useMemo(() => (laid ? { ...toFlow(view, laid, pins), boxes: laid.boxes } : null), [laid, view, pins]);

  // React Flow needs its own node state for dragging; reset it whenever a new layout arrives.
  const [rfNodes, setRfNodes] = useState<MapFlowNode[]>([]);
  const [shownFlow, setShownFlow] = useState<typeof flow>(null);
  if (flow && flow !== shownFlow) {
    setShownFlow(flow);
    setRfNodes(flow.nodes);
  }
  const onNodesChange = useCallback((changes: NodeChange<MapFlowNode>[]) => setRfNodes((ns) => applyNodeChanges(changes, ns)), []);

  const rfEdges = useMemo(
    () =>
      (shownFlow?.edges ?? []).map((e) => ({
        ...e,
        markerEnd: {
          type: MarkerType.ArrowClosed,
          width: 14,
          height: 14,
          // A hex, not var(): React Flow builds the marker's element id from this string.
          color: e.data?.edge.inCycle ? "#cc79a7" : theme === "light" ? "#4f5d68" : "#9fb0bd",
        },
      })),
    [shownFlow, theme],
  );

  const toggleTeam = useCallback(
    (team: string) => {
      setGrouping(() => {
        const collapsed = new Set(effGrouping.collapsed);
        // An expanded team is shown whole once it is laid out; a collapsed one, among its neighbours.
        if (collapsed.has(team)) {
          collapsed.delete(team);
          pendingCentre.current = groupNodeId(team);
        } else {
          collapsed.add(team);
          pendingCentre.current = teamNodeId(team);
        }
        return { byTeam: true, collapsed };
      });
    },
    [effGrouping],
  );

  const palette = useMemo(() => buildPalette(graph.nodes, colourMode, slots), [graph.nodes, colourMode, slots]);
  const legend = useMemo(() => buildLegend(palette, teamNames), [palette, teamNames]);
  const teamStats = useMemo(() => {
    const stats = new Map<string, TeamStats>();
    for (const n of graph.nodes) {
      const slot = teamSlotOf(n);
      const s = stats.get(slot) ?? { count: 0, worstPinch: null, singlePoints: 0 };
      s.count += 1;
      if (n.metrics) {
        s.worstPinch = Math.max(s.worstPinch ?? 0, n.metrics.pinchScore);
        if ((n.replicas <= 1 || n.zones.length < 2) && n.metrics.blastDown > 0) s.singlePoints += 1;
      }
      stats.set(slot, s);
    }
    return stats;
  }, [graph.nodes]);
  const decor: Decor = useMemo(
    () => ({ palette, teamNames, selected, focus: selection.focus, onToggleTeam: toggleTeam, marks: props.marks, hubs, onOpenHub: setOpenHub, chain: chainSets, teamStats }),
    [palette, teamNames, selected, selection.focus, toggleTeam, props.marks, hubs, chainSets, teamStats],
  );

  // Absolute centres of navigable nodes, for keyboard movement and centring.
  const centres = useMemo(() => {
    const abs = new Map<string, Position>();
    const m = new Map<string, Position>();
    for (const n of rfNodes) {
      const parent = n.parentId ? abs.get(n.parentId) : undefined;
      const p = { x: n.position.x + (parent?.x ?? 0), y: n.position.y + (parent?.y ?? 0) };
      abs.set(n.id, p);
      if (n.type !== "teamGroup") m.set(n.id, { x: p.x + (n.width ?? 0) / 2, y: p.y + (n.height ?? 0) / 2 });
    }
    return m;
  }, [rfNodes]);
  const viewAdjacency = useMemo(() => buildAdjacency(view.edges.map((e) => ({ from: e.source, to: e.target }))), [view.edges]);

  const centreOn = useCallback(
    (id: string) => {
      const c = centres.get(id);
      if (!c) return false;
      void rf.setCenter(c.x, c.y, { zoom: Math.max(rf.getZoom(), 0.9), duration: 250 });
      return true;
    },
    [centres, rf],
  );

  const [announcement, setAnnouncement] = useState("");
  const select = useCallback(
    (id: string | null) => {
      setSelected(id);
      const node = id ? byKey.get(id) : undefined;
      props.onSelect?.(node ? node.key : null);
      if (!id) setAnnouncement("Selection cleared");
      else if (node) {
        const out = viewAdjacency.out.get(id)?.length ?? 0;
        const inn = viewAdjacency.in.get(id)?.length ?? 0;
        setAnnouncement(`${node.key} (${node.name}), ${KIND_LABEL[node.kind]}, ${teamNames.get(teamSlotOf(node)) ?? ""}. Needs ${out}, dependents ${inn} on the map.`);
      } else setAnnouncement(`Team ${id.replace(/^team:/, "")}, collapsed. Enter expands it.`);
    },
    [byKey, props, teamNames, viewAdjacency],
  );

  // After a new layout: centre a component asked for by search, else fit the view at a zoom where labels still read.
  useEffect(() => {
    if (!shownFlow) return;
    const frame = requestAnimationFrame(() => {
      const want = pendingCentre.current;
      if (want?.startsWith("group:") || want?.startsWith("team:")) {
        pendingCentre.current = null;
        void rf.fitView({ nodes: [{ id: want }], padding: 0.15, duration: 200, minZoom: 0.3, maxZoom: 1 });
      } else if (want && centreOn(want)) pendingCentre.current = null;
      else void rf.fitView({ padding: 0.08, duration: 200, minZoom: 0.3 });
    });
    return () => cancelAnimationFrame(frame);
    // centreOn changes with every drag; only a new layout should re-fit.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [shownFlow]);

  /** Jump to a component wherever it is: on the canvas, inside a collapsed team, or hidden by filters. */
  const jumpTo = useCallback(
    (key: string) => {
      const node = byKey.get(key);
      if (!node) return;
      setNotice(null);
      select(key);
      if (centres.has(key)) {
        centreOn(key);
        return;
      }
      pendingCentre.current = key;
      const slot = teamSlotOf(node);
      if (selection.nodes.some((n) => n.key === key) && effGrouping.collapsed.has(slot)) {
        const collapsed = new Set(effGrouping.collapsed);
        collapsed.delete(slot);
        setGrouping({ byTeam: true, collapsed });
        setNotice(`Opened team ${teamNames.get(slot) ?? slot} to show ${key}.`);
      } else {
        setFocusKey(key);
        setNotice(`${key} was hidden by the filters or the focus; showing its neighbourhood (${hops} hops).`);
      }
    },
    [byKey, centres, centreOn, effGrouping, hops, select, selection.nodes, teamNames],
  );

  function runSearch() {
    const q = search.trim().toLowerCase();
    if (!q) return;
    const exact = graph.nodes.find((n) => n.key === q) ?? graph.nodes.find((n) => n.name.toLowerCase() === q);
    const partial = exact ? [exact] : graph.nodes.filter((n) => n.key.includes(q) || n.name.toLowerCase().includes(q));
    const hit = partial[0];
    if (!hit) {
      setNotice(`No component matches “${search.trim()}”.`);
      return;
    }
    jumpTo(hit.key);
    if (partial.length > 1) setNotice(`${partial.length} components match; showing ${hit.key}.`);
  }

  const onKeyDown = useMapKeyboard({ selected, inspecting, centres, adjacency: viewAdjacency, view, select, centreOn, toggleTeam, setInspecting });

  function onDragStop(id: string, position: Position, parentId: string | undefined) {
    if (parentId || !byKey.has(id)) return;
    const next = { ...pins, [id]: { x: Math.round(position.x), y: Math.round(position.y) } };
    setLocalPins((p) => ({ ...p, [id]: { x: Math.round(position.x), y: Math.round(position.y) } }));
    if (canEdit) props.onPinPositions?.(next);
  }

  function clearPins() {
    setLocalPins({});
    setPinsCleared(true);
    if (canEdit) props.onPinPositions?.({});
  }

  function exportView(format: "svg" | "png") {
    const background = exportBg ?? theme;
    const chainLabel = props.chain ? `${props.chain.from} needs ${props.chain.to}` : null;
    const titleBlock = titleBlockFor({ environment: graph.environment, snapshot: graph.snapshot, legend, now: new Date(), focus: selection.focus, chain: chainLabel });
    const { svg, width, height } = buildExport({ nodes: rfNodes, edges: rfEdges, laid: shownFlow?.boxes ?? {}, palette, teamNames, theme: exportTheme(background), titleBlock });
    const base = `pinchpoint-${graph.environment}-map${selection.focus ? `-${selection.focus}` : ""}`;
    if (format === "svg") downloadBlob(new Blob([svg], { type: "image/svg+xml" }), `${base}.svg`);
    else
      svgToPng(svg, width, height)
        .then((blob) => downloadBlob(blob, `${base}.png`))
        .catch((err: unknown) => setNotice(err instanceof Error ? err.message : "PNG export failed"));
  }

  const selectedComponent = selected ? byKey.get(selected) : undefined;
  const inspected = inspecting ? byKey.get(inspecting) : undefined;
  const large = rfNodes.length > 400;
  // The overview helps only on a canvas bigger than the screen; on the team view it would cover boxes.
  const minimap = (showMinimap ?? (rfNodes.length <= MINIMAP_OFF_ABOVE && !view.items.some((i) => i.type === "team"))) && !inspected;
  const hub = openHub ? hubs.get(openHub) : undefined;
  const hubName = (id: string) => (id.startsWith("team:") ? (teamNames.get(id.slice(5)) ?? id.slice(5)) : id);
  const collapsedCount = [...effGrouping.collapsed].filter((s) => slots.includes(s)).length;

  return (
    <DecorContext.Provider value={decor}>
      <div className="pp-map flex h-full min-h-[480px] w-full flex-col bg-canvas text-ink" data-theme-mode={theme} data-zoom={zoom.level} style={zoom.style}>
        <div className="pp-toolbar flex flex-wrap items-center gap-2 border-b border-line bg-surface px-3 py-2 text-sm" role="toolbar" aria-label="Map controls">
          <form
            role="search"
            className="flex items-center gap-1"
            onSubmit={(e) => {
              e.preventDefault();
              runSearch();
            }}
          >
            <label htmlFor={`${ids}-search`} className="sr-only">
              Find a component by key or name
            </label>
            <input
              id={`${ids}-search`}
              list={`${ids}-keys`}
              value={search}
              onChange={(e) => setSearch(e.target.value)}
              placeholder="Find component…"
              className="w-48 rounded border border-line bg-raised px-2 py-1 font-mono text-ink placeholder:text-faint"
              aria-label="Find a component by key or name; Enter centres the map on it"
            />
            <datalist id={`${ids}-keys`}>{graph.nodes.length <= 5000 ? graph.nodes.map((n) => <option key={n.key} value={n.key} />) : null}</datalist>
            <button type="submit" className="pp-btn" aria-label="Go to component">
              Go
            </button>
          </form>

          <label className="flex items-center gap-1">
            <span className="text-muted">Colour</span>
            <select value={colourMode} onChange={(e) => setColourMode(e.target.value as ColourMode)} className="pp-select" aria-label="Colour components by">
              {COLOUR_MODES.map((m) => (
                <option key={m} value={m}>
                  {MODE_LABELS[m]}
                </option>
              ))}
            </select>
          </label>

          <FilterMenu filters={filters} setFilters={setFilters} slots={slots} teamNames={teamNames} />

          <div className="flex items-center gap-1" role="group" aria-label="Focus">
            <button type="button" className="pp-btn" disabled={!selectedComponent} onClick={() => selectedComponent && setFocusKey(selectedComponent.key)} aria-label="Focus on the selected component's neighbourhood">
              Focus
            </button>
            <select value={hops} onChange={(e) => setHops(Number(e.target.value))} className="pp-select" aria-label="Focus depth in hops">
              {[1, 2, 3].map((h) => (
                <option key={h} value={h}>
                  {h} {h === 1 ? "hop" : "hops"}
                </option>
              ))}
            </select>
            {selection.focus ? (
              <button type="button" className="pp-btn" onClick={() => setFocusKey(null)} aria-label={`Clear focus on ${selection.focus}`}>
                Clear focus: <span className="font-mono">{selection.focus}</span>
              </button>
            ) : null}
          </div>

          <div className="flex items-center gap-1" role="group" aria-label="Grouping">
            <label className="pp-check">
              <input
                type="checkbox"
                checked={effGrouping.byTeam}
                onChange={() => setGrouping({ byTeam: !effGrouping.byTeam, collapsed: effGrouping.byTeam ? new Set() : effGrouping.collapsed })}
                aria-label="Group components by team"
              />
              By team
            </label>
            {effGrouping.byTeam ? (
              <>
                <button type="button" className="pp-btn" onClick={() => setGrouping({ byTeam: true, collapsed: new Set(slots) })}>
                  Collapse all teams
                </button>
                <button type="button" className="pp-btn" onClick={() => setGrouping({ byTeam: true, collapsed: new Set() })}>
                  Expand all teams
                </button>
              </>
            ) : null}
          </div>

          <div className="ml-auto flex items-center gap-1" role="group" aria-label="Export and pins">
            <label className="pp-check">
              <input type="checkbox" checked={minimap} onChange={() => setShowMinimap(!minimap)} aria-label="Show the overview map" />
              Overview
            </label>
            {Object.keys(pins).length > 0 ? (
              <button type="button" className="pp-btn" onClick={clearPins} aria-label="Clear pinned positions">
                Unpin all
              </button>
            ) : null}
            <select value={exportBg ?? theme} onChange={(e) => setExportBg(e.target.value as ExportBackground)} className="pp-select" aria-label="Export background">
              <option value="dark">dark</option>
              <option value="light">light</option>
            </select>
            <button type="button" className="pp-btn" onClick={() => exportView("svg")} disabled={rfNodes.length === 0} aria-label="Export the current view as SVG">
              SVG
            </button>
            <button type="button" className="pp-btn" onClick={() => exportView("png")} disabled={rfNodes.length === 0} aria-label="Export the current view as PNG">
              PNG
            </button>
          </div>
        </div>

        <div className="relative flex flex-wrap items-center gap-3 border-b border-line bg-surface px-3 py-1 text-xs text-muted">
          <LegendPanel legend={legend} />
          <span data-testid="map-count" data-count={view.componentCount} role="status">
            Showing {view.componentCount.toLocaleString()} of {graph.nodes.length.toLocaleString()} components, {view.edges.length.toLocaleString()} lines
            {hubs.size > 0 ? ` (+ ${hubs.size} bundled into hub markers)` : ""}
            {effGrouping.byTeam ? ` · ${collapsedCount > 0 ? `${collapsedCount} of ${slots.length} teams collapsed` : "grouped by team"}` : ""}
          </span>
          {graph.snapshot ? <span>snapshot #{graph.snapshot.number}</span> : <span className="text-degraded">no snapshot yet</span>}
          {graph.graphView ? <GraphViewBadge graphView={graph.graphView} /> : null}
          {fromStore ? <span data-testid="layout-source">positions stored for this snapshot</span> : layout.status === "done" ? <span>laid out in {(layout.ms / 1000).toFixed(1)} s{layout.cached ? " (cached)" : ""}</span> : null}
          {palette.mode === "team" && slots.length > OKABE_ITO.length ? <span className="text-degraded">Team colours repeat after {OKABE_ITO.length} teams: every box and node names its team.</span> : null}
          {!canEdit && Object.keys(localPins).length > 0 ? <span>Moved positions are kept for this visit only; saving them needs lead, architect or admin.</span> : null}
          {notice ? (
            <span className="text-info" role="status">
              {notice}
            </span>
          ) : null}
        </div>

        {props.chain ? <ChainBanner chain={props.chain} onClear={props.onClearChain} /> : null}
        {autoTeams ? (
          <div className="pp-banner" role="note">
            <strong>{selection.nodes.length.toLocaleString()} components</strong> in {slots.length} teams: each team is one box with its count, worst pinch score and single points. Click a team to
            open it in place, search for a component, or{" "}
            <button type="button" className="pp-link" onClick={() => setGrouping({ byTeam: true, collapsed: new Set() })}>
              expand every team
            </button>
            .
          </div>
        ) : null}

        <div className="flex min-h-0 flex-1">
          <div
            className="pp-map-canvas relative min-w-0 flex-1"
            tabIndex={0}
            role="application"
            aria-roledescription="dependency map"
            aria-label="Dependency map. Arrow keys: down to what the selected component needs, up to its dependents, left and right to neighbours. Enter opens the inspector, Escape clears."
            aria-describedby={`${ids}-live`}
            onKeyDown={onKeyDown}
          >
            <ReactFlow<MapFlowNode, MapFlowEdge>
              nodes={rfNodes}
              edges={rfEdges}
              nodeTypes={nodeTypes}
              edgeTypes={edgeTypes}
              onNodesChange={onNodesChange}
              onNodeClick={(_, n) => {
                if (n.type === "teamGroup") return;
                select(n.id);
                if (n.type === "component") setInspecting(n.id);
                if (n.type === "team") toggleTeam(n.data.item.team);
              }}
              onPaneClick={() => {
                select(null);
                setOpenHub(null);
              }}
              onNodeDragStop={(_, n) => onDragStop(n.id, n.position, n.parentId)}
              colorMode={theme}
              nodesConnectable={false}
              elementsSelectable={false}
              nodesFocusable={false}
              edgesFocusable={false}
              disableKeyboardA11y
              deleteKeyCode={null}
              selectionKeyCode={null}
              multiSelectionKeyCode={null}
              onlyRenderVisibleElements={large}
              minZoom={0.05}
              maxZoom={2.5}
              fitView
            >
              <Background variant={BackgroundVariant.Dots} gap={24} size={1} color="var(--pp-line)" />
              <Controls showInteractive={false} aria-label="Zoom and fit" position="bottom-right" />
              {minimap ? (
                <MiniMap<MapFlowNode>
                  ariaLabel="Overview of the whole map"
                  pannable
                  zoomable
                  position="bottom-left"
                  nodeColor={(n) => {
                    if (n.type === "component") {
                      const p = paintNode(n.data.item.node, palette);
                      return p.dashed ? UNDECLARED : p.fill;
                    }
                    if (n.type === "team") return palette.teamColours.get(n.data.item.team) ?? "#6c7f8d";
                    return "transparent";
                  }}
                  nodeStrokeColor={(n) => (n.type === "teamGroup" ? "#6c7f8d" : "transparent")}
                />
              ) : null}
              {!laid ? (
                <Panel position="top-center">
                  <LayoutStatus state={layout} count={view.items.length} onClearFilters={filters === NO_FILTERS ? undefined : () => setFilters(NO_FILTERS)} />
                </Panel>
              ) : null}
              {hub && openHub ? (
                <Panel position="top-right">
                  <HubList
                    title={hubName(openHub)}
                    sources={hub.sources.map((s) => ({ ...s, label: hubName(s.id) }))}
                    needs={hub.needs}
                    onPick={(id) => {
                      setOpenHub(null);
                      if (id.startsWith("team:")) toggleTeam(id.slice(5));
                      else jumpTo(id);
                    }}
                    onClose={() => setOpenHub(null)}
                  />
                </Panel>
              ) : null}
            </ReactFlow>
          </div>
          {inspected ? (
            <div className="w-96 max-w-[45%] shrink-0 border-l border-line">
              {props.renderInspector ? (
                props.renderInspector(inspected.key)
              ) : (
                <Inspector environment={graph.environment} node={inspected} {...inspectorLinks(graph, inspected.key)} teams={graph.teams} canEdit={false} onSelect={jumpTo} onClose={() => setInspecting(null)} allKeys={allKeys} />
              )}
            </div>
          ) : null}
        </div>
        <div id={`${ids}-live`} aria-live="polite" className="sr-only">
          {announcement}
        </div>
      </div>
    </DecorContext.Provider>
  );
}

/** The dependents bundled into a hub's marker, heaviest first. */
function HubList(props: { title: string; sources: { id: string; label: string; count: number; inCycle: boolean }[]; needs: number; onPick(id: string): void; onClose(): void }) {
  return (
    <section className="pp-hub-list" aria-label={`Who needs ${props.title}`} data-testid="hub-list">
      <header className="flex items-center justify-between gap-2">
        <h3 className="text-sm font-semibold">
          {props.sources.length} need <span className="font-mono">{props.title}</span>
          <span className="ml-1 font-normal text-muted">({props.needs} needs)</span>
        </h3>
        <button type="button" className="pp-btn" onClick={props.onClose} aria-label="Close the list">
          ×
        </button>
      </header>
      <ul className="mt-1 max-h-72 overflow-y-auto">
        {props.sources.map((s) => (
          <li key={s.id}>
            <button type="button" className="w-full rounded px-1.5 py-0.5 text-left font-mono text-xs hover:bg-raised" onClick={() => props.onPick(s.id)}>
              {s.label}
              {s.count > 1 ? <span className="ml-1 text-muted">×{s.count}</span> : null}
              {s.inCycle ? <span className="ml-1 text-cycle">↻</span> : null}
            </button>
          </li>
        ))}
      </ul>
    </section>
  );
}

/** "Why does A need B": the chain's hops with strength and how each is known, above the canvas. */
function ChainBanner({ chain, onClear }: { chain: ChainResponse; onClear?: () => void }) {
  return (
    <div className="pp-banner" role="note" data-testid="chain-banner">
      {chain.path ? (
        <>
          <strong>
            Why <span className="font-mono">{chain.from}</span> needs <span className="font-mono">{chain.to}</span>:
          </strong>{" "}
          {chain.hops.map((h, i) => (
            <span key={`${h.from}-${h.to}`} className="whitespace-nowrap">
              {i === 0 ? <span className="font-mono">{h.from}</span> : null} → <span className="font-mono">{h.to}</span>{" "}
              <span className="text-muted">
                ({h.strength}
                {h.anyOf ? ", one of alternatives" : ""}, {h.provenance.join("+")})
              </span>{" "}
            </span>
          ))}
          {chain.hardAllTheWay ? <span className="text-down"> Hard all the way: {chain.from} goes down when {chain.to} fails.</span> : null}
        </>
      ) : (
        <span>
          <span className="font-mono">{chain.from}</span> does not need <span className="font-mono">{chain.to}</span>
          {chain.reversed ? ` (the other way round: ${chain.to} needs ${chain.from})` : ""}.
        </span>
      )}{" "}
      {onClear ? (
        <button type="button" className="pp-link" onClick={onClear}>
          Show the whole map
        </button>
      ) : null}
    </div>
  );
}
