"use client";
// The affected part of the graph in columns: what failed, then each wave of components that go
// down because of the previous wave, then the degraded ones. Plain SVG: a drill result must
// draw instantly, and a layered picture of ≤ a few hundred boxes needs no layout engine.
import Link from "next/link";
import { useMemo } from "react";
import type { MapEdge } from "@/components/map/types";

const COL_W = 168;
const ROW_H = 22;
const BOX_W = 148;
const PER_COLUMN = 16;

export function MiniMap({ env, failed, down, degraded, edges, undeclared }: { env: string; failed: string[]; down: string[]; degraded: string[]; edges: MapEdge[]; undeclared: ReadonlySet<string> }) {
  const layout = useMemo(() => {
    const downSet = new Set(down);
    const degradedSet = new Set(degraded);
    const dependents = new Map<string, string[]>();
    for (const e of edges) {
      const list = dependents.get(e.to) ?? [];
      list.push(e.from);
      dependents.set(e.to, list);
    }
    const depth = new Map<string, number>();
    let frontier = failed.filter((k) => downSet.has(k));
    for (const k of frontier) depth.set(k, 0);
    let d = 0;
    while (frontier.length) {
      d++;
      const next: string[] = [];
      for (const k of frontier)
        for (const dep of dependents.get(k) ?? [])
          if (downSet.has(dep) && !depth.has(dep)) {
            depth.set(dep, d);
            next.push(dep);
          }
      frontier = next;
    }
    // Down through an any_of group whose members all failed elsewhere: put them after the last wave.
    for (const k of down) if (!depth.has(k)) depth.set(k, d);
    const columns: string[][] = [];
    for (const [k, c] of depth) (columns[c] ??= []).push(k);
    if (degraded.length) columns.push([...degraded]);
    const dense = columns.filter((c) => c && c.length).map((c) => c.sort());
    const pos = new Map<string, { x: number; y: number }>();
    dense.forEach((col, ci) => col.slice(0, PER_COLUMN).forEach((k, ri) => pos.set(k, { x: ci * COL_W, y: 24 + ri * ROW_H })));
    const shown = edges.filter((e) => pos.has(e.from) && pos.has(e.to) && (downSet.has(e.to) || degradedSet.has(e.to)));
    const rows = Math.min(PER_COLUMN, Math.max(1, ...dense.map((c) => c.length)));
    return { columns: dense, pos, shown, width: dense.length * COL_W, height: 24 + rows * ROW_H + 22, degradedSet };
  }, [failed, down, degraded, edges]);

  if (!layout.columns.length) return null;
  const failedSet = new Set(failed);
  const label = (ci: number) => (ci === 0 ? "failed" : layout.degradedSet.size && ci === layout.columns.length - 1 ? "degraded" : `down, wave ${ci}`);
  return (
    <div className="overflow-x-auto" data-testid="drill-minimap">
      <svg width={layout.width} height={layout.height} role="group" aria-label={`Affected components in ${layout.columns.length} columns, from what failed to what it takes down`} className="text-[10px]">
        {layout.shown.map((e) => {
          const a = layout.pos.get(e.to)!;
          const b = layout.pos.get(e.from)!;
          return (
            <line
              key={`${e.from}>${e.to}`}
              x1={a.x + BOX_W}
              y1={a.y + 8}
              x2={b.x}
              y2={b.y + 8}
              stroke={e.strength === "soft" ? "var(--color-degraded)" : "var(--color-down)"}
              strokeOpacity={0.35}
              strokeDasharray={e.strength === "soft" ? "3 2" : undefined}
            />
          );
        })}
        {layout.columns.map((col, ci) => (
          <g key={ci}>
            <text x={ci * COL_W} y={12} className="fill-[var(--color-faint)] text-[10px] uppercase">
              {label(ci)} ({col.length})
            </text>
            {col.slice(0, PER_COLUMN).map((k) => {
              const p = layout.pos.get(k)!;
              const isFailed = failedSet.has(k);
              const isDegraded = layout.degradedSet.has(k);
              const tone = isDegraded ? "var(--color-degraded)" : "var(--color-down)";
              return (
                <Link key={k} href={`/environments/${env}/components/${encodeURIComponent(k)}`}>
                  <g transform={`translate(${p.x},${p.y})`}>
                    <title>{`${k}${undeclared.has(k) ? " (undeclared: needed by something, declared by no source)" : ""}`}</title>
                    <rect width={BOX_W} height={17} rx={isFailed ? 0 : 4} fill={isFailed ? tone : "var(--color-raised)"} fillOpacity={isFailed ? 0.85 : 1} stroke={undeclared.has(k) ? "var(--color-undeclared)" : tone} strokeDasharray={undeclared.has(k) ? "3 2" : undefined} />
                    <text x={6} y={12} className={`font-mono ${isFailed ? "fill-[var(--color-on-brass)]" : "fill-[var(--color-ink)]"}`}>
                      {k.length > 22 ? `${k.slice(0, 21)}…` : k}
                    </text>
                  </g>
                </Link>
              );
            })}
            {col.length > PER_COLUMN && (
              <text x={ci * COL_W} y={24 + PER_COLUMN * ROW_H + 12} className="fill-[var(--color-muted)]">
                +{col.length - PER_COLUMN} more
              </text>
            )}
          </g>
        ))}
      </svg>
    </div>
  );
}
