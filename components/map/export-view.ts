// The current view as an export: boxes and routes read from React Flow's nodes, a title block with
// environment, snapshot, time and legend, on the screen's theme or the other one.
import type { Legend } from "./colour";
import { paintNode, type Palette } from "./colour";
import { DEFAULT_EXPORT_THEME, LIGHT_EXPORT_THEME, kindSubtitle, renderSvg, type ExportEdge, type ExportNode, type ExportTheme, type TitleBlock } from "./export";
import type { Box, MapFlowEdge, MapFlowNode } from "./layout";
import { teamSlotOf } from "./view";

export type ExportBackground = "dark" | "light";

export function exportTheme(background: ExportBackground): ExportTheme {
  return background === "light" ? LIGHT_EXPORT_THEME : DEFAULT_EXPORT_THEME;
}

export function titleBlockFor(args: { environment: string; snapshot: { number: number; createdAt: string } | null; legend: Legend; now: Date; focus: string | null; chain: string | null }): TitleBlock {
  const { legend } = args;
  const items = legend.kind === "categories" ? legend.items : legend.ticks.map((t, i) => ({ label: `${legend.title} ${t.label}`, colour: legend.stops[Math.round((i * (legend.stops.length - 1)) / Math.max(1, legend.ticks.length - 1))] ?? "#888888" }));
  return {
    title: `Pinchpoint map: ${args.environment}${args.chain ? ` · why ${args.chain}` : args.focus ? ` · around ${args.focus}` : ""}`,
    lines: [
      `Environment ${args.environment} · ${args.snapshot ? `snapshot #${args.snapshot.number}, pushed ${args.snapshot.createdAt.replace("T", " ").slice(0, 16)} UTC` : "no snapshot"}`,
      `Exported ${args.now.toISOString().replace("T", " ").slice(0, 16)} UTC · colour: ${legend.title} · the map is only as good as the inventory`,
    ],
    legend: items,
    note: legend.note,
  };
}

export function buildExport(args: {
  nodes: readonly MapFlowNode[];
  edges: readonly MapFlowEdge[];
  laid: Record<string, Box>;
  palette: Palette;
  teamNames: ReadonlyMap<string, string>;
  theme: ExportTheme;
  titleBlock: TitleBlock;
}): { svg: string; width: number; height: number } {
  const { palette, teamNames, laid } = args;
  const boxes = new Map<string, Box>();
  for (const n of args.nodes) {
    const parent = n.parentId ? boxes.get(n.parentId) : undefined;
    boxes.set(n.id, { x: n.position.x + (parent?.x ?? 0), y: n.position.y + (parent?.y ?? 0), width: n.width ?? 0, height: n.height ?? 0 });
  }
  const nodes: ExportNode[] = [];
  const groups = [];
  const light = args.theme === LIGHT_EXPORT_THEME;
  for (const n of args.nodes) {
    const box = boxes.get(n.id);
    if (!box) continue;
    if (n.type === "teamGroup") groups.push({ box, title: `${n.data.group.name} (${n.data.group.memberCount})` });
    else if (n.type === "team") {
      const fill = palette.mode === "team" ? (palette.teamColours.get(n.data.item.team) ?? args.theme.surface) : args.theme.surface;
      nodes.push({ id: n.id, box, kind: "team", title: n.data.item.name, subtitle: `${n.data.item.members.length} components`, paint: { fill, text: palette.mode === "team" ? "#0e1419" : args.theme.ink, dashed: false }, articulation: false });
    } else {
      const c = n.data.item.node;
      const paint = paintNode(c, palette);
      nodes.push({ id: n.id, box, kind: c.kind, title: c.undeclared ? `? ${c.key}` : c.key, subtitle: kindSubtitle(c.kind, palette.mode === "team" ? (teamNames.get(teamSlotOf(c)) ?? null) : `tier ${c.tier}`), paint: paint.dashed && light ? { ...paint, text: args.theme.undeclared } : paint, articulation: c.metrics?.articulation ?? false });
    }
  }
  const same = (a: Box | undefined, b: Box | undefined) => !!a && !!b && Math.abs(a.x - b.x) < 1 && Math.abs(a.y - b.y) < 1;
  const edges: ExportEdge[] = args.edges.flatMap((e) => {
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
  return renderSvg({ nodes, edges, groups, theme: args.theme, title: args.titleBlock.title, titleBlock: args.titleBlock });
}
