"use client";
// The dependency map: React Flow canvas over an ELK layout computed in a worker.
import "@xyflow/react/dist/style.css";
import "./map.css";
import {
  Background,
  BackgroundVariant,
  Controls,
  MarkerType,
  MiniMap,
  Panel,
  ReactFlow,
  ReactFlowProvider,
  applyNodeChanges,
  useReactFlow,
  type NodeChange,
} from "@xyflow/react";
import { useCallback, useEffect, useId, useMemo, useRef, useState, useSyncExternalStore, type KeyboardEvent, type ReactNode } from "react";
import { COMPONENT_KINDS, TIERS, type ComponentKind, type Tier } from "@/lib/inventory/types";
import { GraphViewBadge } from "@/components/analysis/SnapshotMeta";
import { buildLegend, buildPalette, MODE_LABELS, paintNode, UNDECLARED, type Legend } from "./colour";
import { DEFAULT_EXPORT_THEME, downloadBlob, kindSubtitle, renderSvg, svgToPng, type ExportEdge, type ExportNode, type ExportTheme } from "./export";
import { Inspector, inspectorLinks } from "./Inspector";
import { arrowDir, nextSelection } from "./keyboard";
import { toFlow, type Box, type MapFlowEdge, type MapFlowNode } from "./layout";
import { PHASE_LABEL } from "./layout-protocol";
import { edgeTypes, nodeTypes, DecorContext, type Decor, type IncidentMark } from "./nodes";
import { KIND_LABEL, NODE_H, NODE_W, shapePaths } from "./shapes";
import { COLOUR_MODES, type ColourMode, type MapGraph, type PinnedPositions, type Position } from "./types";
import { useElkLayout } from "./useElkLayout";
import {
  DENSE_TEAM_VIEW_EDGES,
  FULL_LAYOUT_LIMIT,
  PINCH_VIEW_SIZE,
  NO_FILTERS,
  buildAdjacency,
  groupSelection,
  selectComponents,
  teamName,
  teamSlotOf,
  teamSlots,
  type GroupingSpec,
  type MapFilters,
  type Selection,
} from "./view";

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

/** Toggle one value in a filter set where null means "all of the universe". */
function toggleIn<T>(current: ReadonlySet<T> | null, value: T, universe: readonly T[]): ReadonlySet<T> | null {
  const next = new Set(current ?? universe);
  if (next.has(value)) next.delete(value);
  else next.add(value);
  return universe.every((u) => next.has(u)) ? null : next;
}

function readExportTheme(): ExportTheme {
  const css = getComputedStyle(document.documentElement);
  const v = (name: string, fallback: string) => css.getPropertyValue(name).trim() || fallback;
  const d = DEFAULT_EXPORT_THEME;
  return {
    canvas: v("--pp-canvas", d.canvas),
    surface: v("--pp-surface", d.surface),
    line: v("--pp-line", d.line),
    ink: v("--pp-ink", d.ink),
    muted: v("--pp-muted", d.muted),
    brass: v("--pp-brass", d.brass),
    info: v("--pp-info", d.info),
    cycle: d.cycle,
    undeclared: d.undeclared,
  };
}

const ALL_KINDS: readonly ComponentKind[] = [...COMPONENT_KINDS, "undeclared"];

function MapCanvasInner(props: MapCanvasProps) {
  const { graph, canEdit } = props;
  const rf = useReactFlow<MapFlowNode, MapFlowEdge>();
  const theme = useDataTheme();
  const ids = useId();

  const [colourMode, setColourMode] = useState<ColourMode>(props.colour ?? "betweenness");
  const [filters, setFilters] = useState<MapFilters>(NO_FILTERS);
  const [focusKey, setFocusKey] = useState<string | null>(props.focus ?? null);
  const [focusProp, setFocusProp] = useState<string | null>(props.focus ?? null);
  if ((props.focus ?? null) !== focusProp) {
    setFocusProp(props.focus ?? null);
    setFocusKey(props.focus ?? null);
  }
  const [hops, setHops] = useState(2);
  /** null = automatic: flat, or teams collapsed when the view is too big to lay out at once */
  const [grouping, setGrouping] = useState<GroupingSpec | null>(null);
  const [layoutAll, setLayoutAll] = useState(false);
  const [selected, setSelected] = useState<string | null>(null);
  const [inspecting, setInspecting] = useState<string | null>(null);
  const [search, setSearch] = useState("");
  const [notice, setNotice] = useState<string | null>(null);
  const [localPins, setLocalPins] = useState<PinnedPositions>({});
  const [pinsCleared, setPinsCleared] = useState(false);
  const [pinnedProp, setPinnedProp] = useState(props.pinned);
  if (props.pinned !== pinnedProp) {
    setPinnedProp(props.pinned);
    setPinsCleared(false);
  }
  const pendingCentre = useRef<string | null>(null);

  const slots = useMemo(() => teamSlots(graph), [graph]);
  const teamNames = useMemo(() => new Map(slots.map((s) => [s, teamName(graph, s)])), [graph, slots]);
  const byKey = useMemo(() => new Map(graph.nodes.map((n) => [n.key, n])), [graph]);

  const allCollapsed = useMemo(() => new Set(slots), [slots]);
  const requestedFocus = useMemo(() => (focusKey ? { key: focusKey, hops } : null), [focusKey, hops]);
  const requestedSelection = useMemo(() => selectComponents(graph, filters, requestedFocus), [graph, filters, requestedFocus]);
  // Too big to lay out, and even the team view too dense (teams that all need each other): open on
  // the components with the highest betweenness and the links among them instead, and say so.
  const denseFallback = useMemo(() => {
    if (focusKey || grouping !== null || layoutAll || requestedSelection.nodes.length <= FULL_LAYOUT_LIMIT) return null;
    const teamView = groupSelection(graph, requestedSelection, { byTeam: true, collapsed: allCollapsed });
    if (teamView.edges.length <= DENSE_TEAM_VIEW_EDGES) return null;
    const top = [...requestedSelection.nodes]
      .sort((a, b) => (b.metrics?.betweenness ?? 0) - (a.metrics?.betweenness ?? 0) || a.key.localeCompare(b.key))
      .slice(0, PINCH_VIEW_SIZE);
    const keep = new Set(top.map((n) => n.key));
    const selection: Selection = { nodes: top, edges: requestedSelection.edges.filter((e) => keep.has(e.from) && keep.has(e.to)), focus: null };
    return { selection, teamEdges: teamView.edges.length };
  }, [focusKey, grouping, layoutAll, requestedSelection, graph, allCollapsed]);
  const selection = denseFallback?.selection ?? requestedSelection;
  const tooBig = selection.nodes.length > FULL_LAYOUT_LIMIT;
  const autoCollapsed = grouping === null && tooBig && !layoutAll;
  const effGrouping: GroupingSpec = useMemo(
    () => grouping ?? (autoCollapsed ? { byTeam: true, collapsed: allCollapsed } : { byTeam: false, collapsed: new Set<string>() }),
    [grouping, autoCollapsed, allCollapsed],
  );
  const view = useMemo(() => groupSelection(graph, selection, effGrouping), [graph, selection, effGrouping]);
  const layout = useElkLayout(view);

  const pins = useMemo(() => (pinsCleared ? localPins : { ...(props.pinned ?? {}), ...localPins }), [pinsCleared, localPins, props.pinned]);
  const laid = layout.status === "done" ? layout.result : null;
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
        if (collapsed.has(team)) collapsed.delete(team);
        else collapsed.add(team);
        return { byTeam: true, collapsed };
      });
    },
    [effGrouping],
  );

  const palette = useMemo(() => buildPalette(graph.nodes, colourMode, slots), [graph.nodes, colourMode, slots]);
  const legend = useMemo(() => buildLegend(palette, teamNames), [palette, teamNames]);
  const decor: Decor = useMemo(
    () => ({ palette, teamNames, selected, focus: selection.focus, onToggleTeam: toggleTeam, marks: props.marks }),
    [palette, teamNames, selected, selection.focus, toggleTeam, props.marks],
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
        setAnnouncement(`${node.name}, ${KIND_LABEL[node.kind]}, ${teamNames.get(teamSlotOf(node)) ?? ""}. Needs ${out}, dependents ${inn} on the map.`);
      } else setAnnouncement(`Team ${id.replace(/^team:/, "")}, collapsed. Enter expands it.`);
    },
    [byKey, props, teamNames, viewAdjacency],
  );

  // After a new layout: centre a component asked for by search, else fit the whole view.
  useEffect(() => {
    if (!shownFlow) return;
    const frame = requestAnimationFrame(() => {
      const want = pendingCentre.current;
      if (want && centreOn(want)) pendingCentre.current = null;
      else void rf.fitView({ padding: 0.08, duration: 200 });
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

  function onKeyDown(e: KeyboardEvent<HTMLDivElement>) {
    if (e.target !== e.currentTarget && (e.target as HTMLElement).closest("button, input, select, textarea")) return;
    const dir = arrowDir(e.key);
    if (dir) {
      e.preventDefault();
      const next = nextSelection({ current: selected, dir, positions: centres, adjacency: viewAdjacency });
      if (next) {
        select(next);
        centreOn(next);
      }
      return;
    }
    if (e.key === "Enter" && selected) {
      e.preventDefault();
      const teamItem = view.items.find((i) => i.id === selected && i.type === "team");
      if (teamItem && teamItem.type === "team") toggleTeam(teamItem.team);
      else setInspecting(selected);
      return;
    }
    if (e.key === "Escape") {
      e.preventDefault();
      if (inspecting) setInspecting(null);
      else select(null);
    }
  }

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
    const boxes = new Map<string, Box>();
    for (const n of rfNodes) {
      const parent = n.parentId ? boxes.get(n.parentId) : undefined;
      boxes.set(n.id, { x: n.position.x + (parent?.x ?? 0), y: n.position.y + (parent?.y ?? 0), width: n.width ?? 0, height: n.height ?? 0 });
    }
    const nodes: ExportNode[] = [];
    const groups = [];
    for (const n of rfNodes) {
      const box = boxes.get(n.id);
      if (!box) continue;
      if (n.type === "teamGroup") groups.push({ box, title: `${n.data.group.name} (${n.data.group.memberCount})` });
      else if (n.type === "team") {
        const fill = palette.mode === "team" ? (palette.teamColours.get(n.data.item.team) ?? "#1d2730") : "#1d2730";
        nodes.push({ id: n.id, box, kind: "team", title: n.data.item.name, subtitle: `${n.data.item.members.length} components · collapsed`, paint: { fill, text: palette.mode === "team" ? "#0e1419" : "#e7edf1", dashed: false }, articulation: false });
      } else {
        const c = n.data.item.node;
        nodes.push({ id: n.id, box, kind: c.kind, title: c.undeclared ? `? ${c.key}` : c.name, subtitle: kindSubtitle(c.kind, palette.mode === "team" ? (teamNames.get(teamSlotOf(c)) ?? null) : `tier ${c.tier}`), paint: paintNode(c, palette), articulation: c.metrics?.articulation ?? false });
      }
    }
    const laid = shownFlow?.boxes ?? {};
    const same = (a: Box | undefined, b: Box | undefined) => !!a && !!b && Math.abs(a.x - b.x) < 1 && Math.abs(a.y - b.y) < 1;
    const edges: ExportEdge[] = rfEdges.flatMap((e) => {
      const s = boxes.get(e.source);
      const t = boxes.get(e.target);
      if (!s || !t || !e.data) return [];
      const route = e.data.route && same(s, laid[e.source]) && same(t, laid[e.target]) ? e.data.route : null;
      const sx = s.x + s.width / 2;
      const tx = t.x + t.width / 2;
      const sy = s.y + s.height;
      const midY = (sy + t.y) / 2;
      const points = route ?? [{ x: sx, y: sy }, { x: sx, y: midY }, { x: tx, y: midY }, { x: tx, y: t.y }];
      return [{ points, strength: e.data.edge.strength, inferred: e.data.edge.inferred, inCycle: e.data.edge.inCycle }];
    });
    const { svg, width, height } = renderSvg({ nodes, edges, groups, theme: readExportTheme(), title: `Pinchpoint map: ${graph.environment}` });
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
  const edgeCount = view.edges.length;

  return (
    <DecorContext.Provider value={decor}>
      <div className="pp-map flex h-full min-h-[480px] w-full flex-col bg-canvas text-ink" data-theme-mode={theme}>
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
            <datalist id={`${ids}-keys`}>
              {graph.nodes.length <= 5000 ? graph.nodes.map((n) => <option key={n.key} value={n.key} />) : null}
            </datalist>
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

          <details className="pp-menu">
            <summary className="pp-btn" aria-label="Filters">
              Filters{filters === NO_FILTERS ? "" : " •"}
            </summary>
            <div className="pp-menu-body">
              <fieldset>
                <legend>Teams</legend>
                {slots.map((s) => (
                  <label key={s} className="pp-check">
                    <input type="checkbox" checked={!filters.teams || filters.teams.has(s)} onChange={() => setFilters((f) => ({ ...f, teams: toggleIn(f.teams, s, slots) }))} />
                    {teamNames.get(s) ?? s}
                  </label>
                ))}
              </fieldset>
              <fieldset>
                <legend>Tiers</legend>
                {TIERS.map((t: Tier) => (
                  <label key={t} className="pp-check">
                    <input type="checkbox" checked={!filters.tiers || filters.tiers.has(t)} onChange={() => setFilters((f) => ({ ...f, tiers: toggleIn(f.tiers, t, TIERS) }))} />
                    Tier {t}
                  </label>
                ))}
              </fieldset>
              <fieldset>
                <legend>Kinds</legend>
                {ALL_KINDS.map((k) => (
                  <label key={k} className="pp-check">
                    <input type="checkbox" checked={!filters.kinds || filters.kinds.has(k)} onChange={() => setFilters((f) => ({ ...f, kinds: toggleIn(f.kinds, k, ALL_KINDS) }))} />
                    {KIND_LABEL[k]}
                  </label>
                ))}
              </fieldset>
              <fieldset>
                <legend>Dependencies</legend>
                <label className="pp-check">
                  <input type="checkbox" checked={filters.hard} onChange={() => setFilters((f) => ({ ...f, hard: !f.hard }))} />
                  hard (down when unmet)
                </label>
                <label className="pp-check">
                  <input type="checkbox" checked={filters.soft} onChange={() => setFilters((f) => ({ ...f, soft: !f.soft }))} />
                  soft (degraded when unmet)
                </label>
                <label className="pp-check">
                  <input type="checkbox" checked={filters.startup} onChange={() => setFilters((f) => ({ ...f, startup: !f.startup }))} />
                  start-up only (boot order)
                </label>
              </fieldset>
              <button type="button" className="pp-btn" onClick={() => setFilters(NO_FILTERS)} aria-label="Clear all filters">
                Clear filters
              </button>
            </div>
          </details>

          <div className="flex items-center gap-1" role="group" aria-label="Focus">
            <button
              type="button"
              className="pp-btn"
              disabled={!selectedComponent}
              onClick={() => selectedComponent && setFocusKey(selectedComponent.key)}
              aria-label="Focus on the selected component's neighbourhood"
            >
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
                <button type="button" className="pp-btn" onClick={() => setGrouping({ byTeam: true, collapsed: new Set(slots) })} aria-label="Collapse every team">
                  Collapse all
                </button>
                <button type="button" className="pp-btn" onClick={() => setGrouping({ byTeam: true, collapsed: new Set() })} aria-label="Expand every team">
                  Expand all
                </button>
              </>
            ) : null}
          </div>

          <div className="ml-auto flex items-center gap-1" role="group" aria-label="Export and pins">
            {Object.keys(pins).length > 0 ? (
              <button type="button" className="pp-btn" onClick={clearPins} aria-label="Clear pinned positions">
                Unpin all
              </button>
            ) : null}
            <button type="button" className="pp-btn" onClick={() => exportView("svg")} disabled={rfNodes.length === 0} aria-label="Export the current view as SVG">
              SVG
            </button>
            <button type="button" className="pp-btn" onClick={() => exportView("png")} disabled={rfNodes.length === 0} aria-label="Export the current view as PNG">
              PNG
            </button>
          </div>
        </div>

        <div className="flex flex-wrap items-center gap-3 border-b border-line bg-surface px-3 py-1 text-xs text-muted">
          <span data-testid="map-count" data-count={view.componentCount} role="status">
            Showing {view.componentCount.toLocaleString()} of {graph.nodes.length.toLocaleString()} components, {edgeCount.toLocaleString()} dependencies
            {effGrouping.byTeam ? ` · ${effGrouping.collapsed.size > 0 ? `${[...effGrouping.collapsed].filter((s) => slots.includes(s)).length} teams collapsed` : "grouped by team"}` : ""}
          </span>
          {graph.snapshot ? <span>snapshot #{graph.snapshot.number}</span> : <span className="text-degraded">no snapshot yet</span>}
          {graph.graphView ? <GraphViewBadge graphView={graph.graphView} /> : null}
          {layout.status === "done" ? <span>laid out in {(layout.ms / 1000).toFixed(1)} s{layout.cached ? " (cached)" : ""}</span> : null}
          {!canEdit && Object.keys(localPins).length > 0 ? <span>Moved positions are kept for this visit only; saving them needs lead, architect or admin.</span> : null}
          {notice ? (
            <span className="text-info" role="status">
              {notice}
            </span>
          ) : null}
        </div>

        {denseFallback ? (
          <div className="pp-banner" role="note">
            <strong>{requestedSelection.nodes.length.toLocaleString()} components</strong> is more than the map lays out at once, and the team view is too tangled to
            read ({denseFallback.teamEdges.toLocaleString()} links between teams). Showing the {PINCH_VIEW_SIZE} components most dependency paths run through, and the
            links among them: search for a component to focus on it, or{" "}
            <button type="button" className="pp-link" onClick={() => setGrouping({ byTeam: true, collapsed: allCollapsed })}>
              show the team view anyway
            </button>
            .
          </div>
        ) : null}
        {autoCollapsed ? (
          <div className="pp-banner" role="note">
            <strong>{selection.nodes.length.toLocaleString()} components</strong> is more than the map lays out at once ({FULL_LAYOUT_LIMIT}). Showing each team as one
            node: expand a team, focus on a component, or{" "}
            <button type="button" className="pp-link" onClick={() => setLayoutAll(true)} aria-label="Lay out every component; this can take a minute">
              lay out all of them (slow: can take a minute)
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
              }}
              onNodeDoubleClick={(_, n) => {
                if (n.type === "team") toggleTeam(n.data.item.team);
              }}
              onPaneClick={() => select(null)}
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
              {/* bottom-left, away from where the layout starts drawing; hidden while the inspector narrows the canvas */}
              {inspected ? null : (
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
              )}
              <Panel position="top-left">
                <LegendPanel legend={legend} />
              </Panel>
              {layout.status !== "done" ? (
                <Panel position="top-center">
                  <LayoutStatus state={layout} count={view.items.length} onClearFilters={filters === NO_FILTERS ? undefined : () => setFilters(NO_FILTERS)} />
                </Panel>
              ) : null}
            </ReactFlow>
          </div>
          {inspected ? (
            <div className="w-96 max-w-[45%] shrink-0 border-l border-line">
              {props.renderInspector ? (
                props.renderInspector(inspected.key)
              ) : (
                <Inspector
                  environment={graph.environment}
                  node={inspected}
                  {...inspectorLinks(graph, inspected.key)}
                  teams={graph.teams}
                  canEdit={false}
                  onSelect={jumpTo}
                  onClose={() => setInspecting(null)}
                />
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

function LayoutStatus(props: { state: ReturnType<typeof useElkLayout>; count: number; onClearFilters?: () => void }) {
  const s = props.state;
  return (
    <div className="pp-progress" role="status" aria-live="polite">
      {s.status === "running" ? (
        <>
          <span className="pp-spinner" aria-hidden="true" />
          <span>
            {PHASE_LABEL[s.phase]} ({props.count.toLocaleString()} nodes) · {(s.elapsedMs / 1000).toFixed(1)} s
          </span>
          <button type="button" className="pp-btn" onClick={s.cancel} aria-label="Cancel the layout">
            Cancel
          </button>
        </>
      ) : s.status === "cancelled" ? (
        <>
          <span>Layout cancelled.</span>
          <button type="button" className="pp-btn" onClick={s.retry} aria-label="Lay out again">
            Lay out again
          </button>
        </>
      ) : s.status === "error" ? (
        <>
          <span className="text-down">Layout failed: {s.message}</span>
          <button type="button" className="pp-btn" onClick={s.retry} aria-label="Retry the layout">
            Retry
          </button>
        </>
      ) : (
        <>
          <span>Nothing to show{props.onClearFilters ? ": the filters hide every component." : "."}</span>
          {props.onClearFilters ? (
            <button type="button" className="pp-btn" onClick={props.onClearFilters}>
              Clear filters
            </button>
          ) : null}
        </>
      )}
    </div>
  );
}

const LEGEND_KINDS: readonly ComponentKind[] = ALL_KINDS;

function LegendPanel({ legend }: { legend: Legend }) {
  return (
    <details className="pp-legend">
      <summary aria-label="Legend">Legend · {legend.title}</summary>
      {legend.kind === "ramp" ? (
        <div className="mt-1">
          <div className="pp-ramp" style={{ background: `linear-gradient(to right, ${legend.stops.join(", ")})` }} aria-hidden="true" />
          <div className="flex justify-between text-[10px] text-muted">
            {legend.ticks.map((t) => (
              <span key={t.t}>{t.label}</span>
            ))}
          </div>
          <p className="text-[10px] text-faint">{legend.note} Grey: not analysed.</p>
        </div>
      ) : (
        <ul className="mt-1 grid grid-cols-2 gap-x-3 gap-y-0.5">
          {legend.items.map((i) => (
            <li key={i.label} className="flex items-center gap-1.5 text-[11px]">
              <span className="pp-swatch" style={{ background: i.colour }} aria-hidden="true" />
              {i.label}
            </li>
          ))}
          {legend.note ? <li className="col-span-2 text-[10px] text-faint">{legend.note}</li> : null}
        </ul>
      )}
      <ul className="mt-2 grid grid-cols-2 gap-x-3 gap-y-0.5" aria-label="Shapes by kind">
        {LEGEND_KINDS.map((k) => {
          // Drawn at node size and scaled down by the viewBox: the fixed-pixel corners and rims of
          // the node shapes would swamp a 28-pixel box and make cache, service and datastore alike.
          const p = shapePaths(k, NODE_W, NODE_H);
          return (
            <li key={k} className="flex items-center gap-1.5 text-[11px]">
              <svg width={48} height={Math.round((48 * NODE_H) / NODE_W)} viewBox={`-2 -2 ${NODE_W + 4} ${NODE_H + 4}`} aria-hidden="true" overflow="visible">
                <path d={p.outline} vectorEffect="non-scaling-stroke" className={k === "undeclared" ? "pp-legend-shape pp-outline-dashed" : "pp-legend-shape"} />
                {p.detail ? <path d={p.detail} fill="none" vectorEffect="non-scaling-stroke" className="pp-legend-edge" /> : null}
              </svg>
              {KIND_LABEL[k]}
            </li>
          );
        })}
      </ul>
      <ul className="mt-2 space-y-0.5 text-[11px]" aria-label="Edges and badges">
        <li className="flex items-center gap-1.5">
          <svg width={30} height={8} aria-hidden="true"><line x1={0} y1={4} x2={30} y2={4} className="pp-legend-edge" /></svg>hard need
        </li>
        <li className="flex items-center gap-1.5">
          <svg width={30} height={8} aria-hidden="true"><line x1={0} y1={4} x2={30} y2={4} className="pp-legend-edge pp-edge-soft" /></svg>soft need
        </li>
        <li className="flex items-center gap-1.5">
          <svg width={30} height={8} aria-hidden="true"><line x1={0} y1={4} x2={30} y2={4} className="pp-legend-edge pp-edge-startup" /></svg>needed only to start
        </li>
        <li className="flex items-center gap-1.5">
          <svg width={30} height={8} aria-hidden="true"><line x1={0} y1={4} x2={30} y2={4} className="pp-legend-edge pp-edge-inferred" /></svg>inferred from configuration
        </li>
        <li className="flex items-center gap-1.5">
          <svg width={30} height={8} aria-hidden="true"><line x1={0} y1={4} x2={30} y2={4} className="pp-legend-edge pp-legend-cycle" /></svg>in a cycle (↻)
        </li>
        <li className="flex items-center gap-1.5">
          <span className="pp-edge-traffic-key font-mono text-[10px]">12/min</span>calls seen in traces (and their error rate)
        </li>
        <li className="flex items-center gap-1.5">
          <span className="pp-badge pp-badge-inline">splits the graph</span>removing it disconnects parts of the estate
        </li>
      </ul>
    </details>
  );
}


