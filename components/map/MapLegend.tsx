"use client";
// The legend: colours of the current mode, shapes by kind, line styles. It opens over the toolbar
// row rather than sitting on the canvas, so it never covers a team's label.
import { COMPONENT_KINDS, type ComponentKind } from "@/lib/inventory/types";
import type { Legend } from "./colour";
import { KIND_LABEL, NODE_H, NODE_W, shapePaths } from "./shapes";

const ALL_KINDS: readonly ComponentKind[] = [...COMPONENT_KINDS, "undeclared"];
const LEGEND_KINDS: readonly ComponentKind[] = ALL_KINDS;

export function LegendPanel({ legend }: { legend: Legend }) {
  return (
    <details className="pp-legend" data-testid="map-legend">
      <summary>Legend · {legend.title}</summary>
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
          <span className="pp-hub pp-hub-inline">⇡ 97</span>needed by that many: their lines are bundled (click for the list)
        </li>
        <li className="flex items-center gap-1.5">
          <svg width={30} height={8} aria-hidden="true"><line x1={0} y1={4} x2={30} y2={4} className="pp-legend-edge pp-edge-chain" /></svg>the chain asked about (why A needs B)
        </li>
        <li className="flex items-center gap-1.5">
          <span className="pp-badge pp-badge-inline">splits the graph</span>removing it disconnects parts of the estate
        </li>
      </ul>
    </details>
  );
}
