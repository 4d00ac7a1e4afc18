"use client";
// Custom React Flow nodes and edge for the map. Decoration (palette, selection) comes from
// context so a colour-mode change does not rebuild the node array.
import { createContext, memo, useContext } from "react";
import { BaseEdge, Handle, Position, getSmoothStepPath, type EdgeProps, type NodeProps } from "@xyflow/react";
import type { ComponentFlowNode, GroupFlowNode, MapFlowEdge, TeamFlowNode } from "./layout";
import { polylineMidpoint, polylinePath } from "./layout";
import { paintNode, type Palette } from "./colour";
import { KIND_LABEL, shapePaths, textInset } from "./shapes";
import { teamSlotOf } from "./view";
import type { HubBundle } from "@/lib/map/estate";
import { trafficLine } from "@/components/ui/format";

export interface Decor {
  palette: Palette;
  teamNames: ReadonlyMap<string, string>;
  selected: string | null;
  /** components adjacent to the selection: their edges are drawn emphasised */
  focus: string | null;
  onToggleTeam(team: string): void;
  /** An incident overlay: each marked component's role in it. */
  marks?: ReadonlyMap<string, IncidentMark>;
  /** nodes drawn as hubs: their dependents are a count marker, not a fan of lines */
  hubs: ReadonlyMap<string, HubBundle>;
  onOpenHub(id: string): void;
  /** "why does A need B": the chain's nodes and its edges (`from->to`) */
  chain: { nodes: ReadonlySet<string>; edges: ReadonlySet<string> } | null;
  /** per collapsed team: members, worst pinch score, single points */
  teamStats: ReadonlyMap<string, TeamStats>;
}

export interface TeamStats {
  count: number;
  worstPinch: number | null;
  /** components with one replica or fewer than two zones whose failure takes something down */
  singlePoints: number;
}

function HubMarker({ id, hub, onOpen, label }: { id: string; hub: HubBundle; onOpen(id: string): void; label: string }) {
  return (
    <button
      type="button"
      className="pp-hub nodrag"
      data-testid="hub-marker"
      onClick={(e) => {
        e.stopPropagation();
        onOpen(id);
      }}
      title={`${hub.sources.length} ${label} need it (${hub.needs} needs): their lines are bundled into this marker. Click for the list.`}
      aria-label={`${hub.sources.length} ${label} need ${id.replace(/^team:/, "")}: show the list`}
    >
      ⇡ {hub.sources.length}
    </button>
  );
}

export type IncidentMark = "origin" | "silent" | "firing" | "predicted";
const MARK_LABEL: Record<IncidentMark, string> = { origin: "probable origin", silent: "silent suspect", firing: "firing", predicted: "likely next" };

export const DecorContext = createContext<Decor | null>(null);

function useDecor(): Decor {
  const d = useContext(DecorContext);
  if (!d) throw new Error("map nodes rendered outside MapCanvas");
  return d;
}

const hidden = { opacity: 0, pointerEvents: "none" as const };

export const ComponentNode = memo(function ComponentNode(props: NodeProps<ComponentFlowNode>) {
  const decor = useDecor();
  const { node } = props.data.item;
  const w = props.width ?? 184;
  const h = props.height ?? 60;
  const paint = paintNode(node, decor.palette);
  const shape = shapePaths(node.kind, w, h);
  const inset = textInset(node.kind);
  const selected = decor.selected === node.key;
  const mark = decor.marks?.get(node.key);
  const showTeam = decor.palette.mode === "team";
  const teamLabel = decor.teamNames.get(teamSlotOf(node)) ?? "";
  const sub = showTeam ? `${KIND_LABEL[node.kind]} · ${teamLabel}` : `${KIND_LABEL[node.kind]} · tier ${node.tier}`;
  const hub = decor.hubs.get(node.key);
  return (
    <div
      className="pp-node"
      data-kind={node.kind}
      data-selected={selected || undefined}
      data-focus={decor.focus === node.key || undefined}
      data-incident={mark}
      data-chain={decor.chain?.nodes.has(node.key) || undefined}
      style={{ width: w, height: h }}
      title={`${node.key}: ${node.name} (${KIND_LABEL[node.kind]}, tier ${node.tier}${teamLabel ? `, ${teamLabel}` : ""})`}
    >
      <Handle type="target" position={Position.Top} isConnectable={false} style={hidden} />
      <svg width={w} height={h} className="pp-node-shape" aria-hidden="true" overflow="visible">
        <path
          d={shape.outline}
          fill={paint.fill}
          className={paint.dashed ? "pp-outline pp-outline-dashed" : "pp-outline"}
        />
        {shape.detail ? <path d={shape.detail} fill="none" stroke={paint.text} strokeOpacity={0.45} /> : null}
      </svg>
      <div className="pp-node-text" style={{ color: paint.text, paddingLeft: inset.left, paddingRight: inset.right }}>
        <span className="pp-node-name">{node.undeclared ? `? ${node.key}` : node.key}</span>
        <span className="pp-node-kind">{sub}</span>
      </div>
      {mark ? <span className="pp-incident">{MARK_LABEL[mark]}</span> : null}
      {node.metrics?.articulation ? (
        <span className="pp-badge" title="Removing it disconnects parts of the estate (an articulation point)">
          splits the graph
        </span>
      ) : null}
      {hub ? <HubMarker id={node.key} hub={hub} onOpen={decor.onOpenHub} label="components" /> : null}
      {props.data.pinned ? (
        <span className="pp-pin" title="Position pinned">
          pinned
        </span>
      ) : null}
      <Handle type="source" position={Position.Bottom} isConnectable={false} style={hidden} />
    </div>
  );
});

const TeamNode = memo(function TeamNode(props: NodeProps<TeamFlowNode>) {
  const decor = useDecor();
  const { item } = props.data;
  const fill = decor.palette.mode === "team" ? (decor.palette.teamColours.get(item.team) ?? "var(--pp-raised)") : "var(--pp-raised)";
  const stats = decor.teamStats.get(item.team);
  const hub = decor.hubs.get(item.id);
  const detail = `${stats?.worstPinch != null ? `worst pinch ${Math.round(stats.worstPinch)}` : "not analysed"}${stats ? ` · ${stats.singlePoints} single` : ""}`;
  return (
    <div
      className="pp-team"
      data-testid="team-box"
      data-team={item.team}
      data-selected={decor.selected === item.id || undefined}
      style={{ width: props.width, height: props.height }}
      title={`${item.name}: ${item.members.length} components${stats?.worstPinch != null ? `, worst pinch score ${Math.round(stats.worstPinch)}` : ""}${stats ? `, ${stats.singlePoints} single points of failure (one replica or one zone, taking something down)` : ""}. Click to expand.`}
    >
      <Handle type="target" position={Position.Top} isConnectable={false} style={hidden} />
      <span className="pp-team-swatch" style={{ background: fill }} aria-hidden="true" />
      <span className="pp-team-name">{item.name}</span>
      <span className="pp-team-count">{item.members.length} components</span>
      <span className="pp-team-count">{detail}</span>
      {hub ? <HubMarker id={item.id} hub={hub} onOpen={decor.onOpenHub} label="teams" /> : null}
      <button
        type="button"
        className="pp-team-toggle nodrag"
        onClick={(e) => {
          e.stopPropagation();
          decor.onToggleTeam(item.team);
        }}
        aria-label={`Expand team ${item.name}`}
      >
        +
      </button>
      <Handle type="source" position={Position.Bottom} isConnectable={false} style={hidden} />
    </div>
  );
});

const GroupNode = memo(function GroupNode(props: NodeProps<GroupFlowNode>) {
  const decor = useDecor();
  const { group } = props.data;
  const colour = decor.palette.mode === "team" ? decor.palette.teamColours.get(group.team) : undefined;
  return (
    <div className="pp-group" data-testid="team-group" data-team={group.team} style={{ width: props.width, height: props.height }}>
      <div className="pp-group-header" title={`${group.name}: ${group.memberCount} components`}>
        <span className="pp-group-title">
          {colour ? <span className="pp-team-swatch-inline" style={{ background: colour }} aria-hidden="true" /> : null}
          {group.name} <span className="pp-group-count">({group.memberCount})</span>
        </span>
        <button
          type="button"
          className="pp-team-toggle nodrag"
          onClick={() => decor.onToggleTeam(group.team)}
          aria-label={`Collapse team ${group.name}`}
        >
          Collapse
        </button>
      </div>
    </div>
  );
});

const RoutedEdge = memo(function RoutedEdge(props: EdgeProps<MapFlowEdge>) {
  const decor = useDecor();
  const data = props.data;
  const edge = data?.edge;
  const route = data?.route ?? null;
  // A pinned or dragged endpoint makes ELK's route stale; fall back to a step path from the handles.
  // Handles sit centred on the node border, a few pixels off the box, hence the tolerance.
  const tol = 8;
  const stale =
    !route ||
    !data?.expect ||
    Math.abs(props.sourceX - data.expect.sx) > tol ||
    Math.abs(props.sourceY - data.expect.sy) > tol ||
    Math.abs(props.targetX - data.expect.tx) > tol ||
    Math.abs(props.targetY - data.expect.ty) > tol;
  const [stepPath] = getSmoothStepPath({
    sourceX: props.sourceX,
    sourceY: props.sourceY,
    targetX: props.targetX,
    targetY: props.targetY,
    sourcePosition: props.sourcePosition,
    targetPosition: props.targetPosition,
    borderRadius: 4,
  });
  const path = !stale && route ? polylinePath(route) : stepPath;
  const mid = !stale && route ? polylineMidpoint(route) : { x: (props.sourceX + props.targetX) / 2, y: (props.sourceY + props.targetY) / 2 };
  const touched = decor.selected !== null && (props.source === decor.selected || props.target === decor.selected);
  const onChain = decor.chain?.edges.has(`${props.source}->${props.target}`) ?? false;
  const cls = ["pp-edge", edge && edge.strength !== "hard" ? `pp-edge-${edge.strength}` : "", edge?.inferred ? "pp-edge-inferred" : "", edge?.inCycle ? "pp-edge-cycle" : "", touched ? "pp-edge-touched" : "", onChain ? "pp-edge-chain" : ""]
    .filter(Boolean)
    .join(" ");
  return (
    <>
      <BaseEdge id={props.id} path={path} markerEnd={props.markerEnd} className={cls} interactionWidth={0} />
      {edge?.inCycle && mid ? (
        <g className="pp-cycle-mark" transform={`translate(${mid.x},${mid.y})`}>
          <title>Dependency cycle</title>
          <circle r={8} />
          <text textAnchor="middle" dy="3.5">
            ↻
          </text>
        </g>
      ) : null}
      {edge?.traffic && mid ? (
        <text className={`pp-edge-traffic${edge.traffic.errorRate >= 0.01 ? " pp-edge-traffic-errors" : ""}`} x={mid.x + 10} y={mid.y + 12}>
          <title>{`Seen in traces: ${trafficLine(edge.traffic)} over the trace window`}</title>
          {trafficLine(edge.traffic)}
        </text>
      ) : null}
      {edge && edge.count > 1 && mid ? (
        <text className="pp-edge-count" x={mid.x + 10} y={mid.y - 6}>
          {edge.count}
        </text>
      ) : null}
    </>
  );
});

export const nodeTypes = { component: ComponentNode, team: TeamNode, teamGroup: GroupNode };
export const edgeTypes = { routed: RoutedEdge };
