// Export of the current map view as a standalone SVG (and PNG drawn from it), written with
// plain string building and canvas APIs: html-to-image is not a dependency, and building the
// SVG from our own shape paths gives a clean file rather than a screenshot of the DOM.
import { polylinePath, type Box } from "./layout";
import { KIND_LABEL, shapePaths } from "./shapes";
import type { NodePaint } from "./colour";
import type { ComponentKind, Strength } from "@/lib/inventory/types";
import type { Position } from "./types";

/** The same line styles as map.css, as SVG attributes. */
const EDGE_DASH: Record<Strength | "inferred", string> = {
  hard: "",
  soft: ' stroke-dasharray="6 4"',
  startup: ' stroke-dasharray="1.5 4" stroke-linecap="round"',
  inferred: ' stroke-dasharray="10 3 2 3"',
};

export interface ExportTheme {
  canvas: string;
  surface: string;
  line: string;
  ink: string;
  muted: string;
  brass: string;
  /** sky blue: the "splits the graph" badge, the same tone as on screen */
  info: string;
  cycle: string;
  undeclared: string;
}

export const DEFAULT_EXPORT_THEME: ExportTheme = {
  canvas: "#0e1419",
  surface: "#151d24",
  line: "#2b3843",
  ink: "#e7edf1",
  muted: "#9fb0bd",
  brass: "#d9a441",
  info: "#56b4e9",
  cycle: "#cc79a7",
  undeclared: "#999999",
};

/** The light theme's tokens (app/globals.css, [data-theme="light"]), for a light export from a dark screen. */
export const LIGHT_EXPORT_THEME: ExportTheme = {
  canvas: "#f4f1ea",
  surface: "#fbfaf6",
  line: "#d9d3c5",
  ink: "#1a2128",
  muted: "#4f5d68",
  brass: "#a4731a",
  info: "#1a6896",
  cycle: "#974274",
  undeclared: "#626262",
};

/** What an exported picture says about itself: where it comes from, when, and how to read it. */
export interface TitleBlock {
  title: string;
  /** e.g. "Environment production · snapshot #12 (pushed 2026-12-01 10:00 UTC)" */
  lines: string[];
  legend: { label: string; colour: string }[];
  /** one-line note under the legend (scale, caution) */
  note: string | null;
}

export interface ExportNode {
  id: string;
  box: Box;
  kind: ComponentKind | "team";
  title: string;
  subtitle: string;
  paint: NodePaint;
  articulation: boolean;
}

export interface ExportEdge {
  points: Position[];
  strength: Strength;
  inferred: boolean;
  inCycle: boolean;
}

export interface ExportGroup {
  box: Box;
  title: string;
}

export function escapeXml(s: string): string {
  return s.replace(/[<>&"']/g, (c) => ({ "<": "&lt;", ">": "&gt;", "&": "&amp;", '"': "&quot;", "'": "&apos;" })[c] ?? c);
}

function clip(s: string, max: number): string {
  return s.length > max ? `${s.slice(0, max - 1)}…` : s;
}

export function renderSvg(args: {
  nodes: readonly ExportNode[];
  edges: readonly ExportEdge[];
  groups: readonly ExportGroup[];
  theme: ExportTheme;
  title: string;
  titleBlock?: TitleBlock;
  margin?: number;
}): { svg: string; width: number; height: number } {
  const { nodes, edges, groups, theme } = args;
  const m = args.margin ?? 24;
  const tb = args.titleBlock;
  // The title block sits above the drawing, never over it: its height is added to the picture.
  const legendRows = tb ? Math.ceil(tb.legend.length / 4) : 0;
  const blockH = tb ? 30 + tb.lines.length * 16 + legendRows * 16 + (tb.note ? 16 : 0) + 12 : 0;
  let minX = Infinity;
  let minY = Infinity;
  let maxX = -Infinity;
  let maxY = -Infinity;
  for (const b of [...nodes.map((n) => n.box), ...groups.map((g) => g.box)]) {
    minX = Math.min(minX, b.x);
    minY = Math.min(minY, b.y);
    maxX = Math.max(maxX, b.x + b.width);
    maxY = Math.max(maxY, b.y + b.height);
  }
  if (!Number.isFinite(minX)) [minX, minY, maxX, maxY] = [0, 0, 0, 0];
  const width = Math.max(Math.ceil(maxX - minX + 2 * m), tb ? 640 : 0);
  const height = Math.ceil(maxY - minY + 2 * m + blockH);
  const ox = m - minX;
  const oy = m - minY + blockH;
  const out: string[] = [];
  out.push(
    `<svg xmlns="http://www.w3.org/2000/svg" width="${width}" height="${height}" viewBox="0 0 ${width} ${height}" font-family="Inter, system-ui, sans-serif">`,
    `<title>${escapeXml(args.title)}</title>`,
    `<defs><marker id="pp-arrow" viewBox="0 0 10 10" refX="9" refY="5" markerWidth="7" markerHeight="7" orient="auto-start-reverse"><path d="M0,0 L10,5 L0,10 z" fill="${theme.muted}"/></marker>`,
    `<marker id="pp-arrow-cycle" viewBox="0 0 10 10" refX="9" refY="5" markerWidth="7" markerHeight="7" orient="auto-start-reverse"><path d="M0,0 L10,5 L0,10 z" fill="${theme.cycle}"/></marker></defs>`,
    `<rect width="100%" height="100%" fill="${theme.canvas}"/>`,
  );
  if (tb) {
    out.push(`<g class="pp-title-block" transform="translate(${m},${m})">`, `<text x="0" y="16" font-size="17" font-weight="700" fill="${theme.ink}">${escapeXml(tb.title)}</text>`);
    let y = 34;
    for (const line of tb.lines) {
      out.push(`<text x="0" y="${y}" font-size="12" fill="${theme.muted}">${escapeXml(line)}</text>`);
      y += 16;
    }
    tb.legend.forEach((item, i) => {
      const x = (i % 4) * 170;
      const ly = y + Math.floor(i / 4) * 16;
      out.push(`<rect x="${x}" y="${ly - 9}" width="10" height="10" rx="2" fill="${item.colour}" stroke="${theme.line}"/>`, `<text x="${x + 15}" y="${ly}" font-size="11" fill="${theme.ink}">${escapeXml(clip(item.label, 24))}</text>`);
    });
    y += legendRows * 16;
    if (tb.note) out.push(`<text x="0" y="${y}" font-size="10" fill="${theme.muted}">${escapeXml(tb.note)}</text>`);
    out.push(`<line x1="0" y1="${blockH - 8}" x2="${width - 2 * m}" y2="${blockH - 8}" stroke="${theme.line}"/>`, `</g>`);
  }
  out.push(`<g transform="translate(${ox},${oy})">`);
  for (const g of groups) {
    const b = g.box;
    out.push(
      `<rect x="${b.x}" y="${b.y}" width="${b.width}" height="${b.height}" rx="8" fill="${theme.surface}" stroke="${theme.line}"/>`,
      `<text x="${b.x + 12}" y="${b.y + 21}" font-size="13" font-weight="600" fill="${theme.muted}">${escapeXml(g.title)}</text>`,
    );
  }
  for (const e of edges) {
    if (e.points.length < 2) continue;
    const stroke = e.inCycle ? theme.cycle : theme.muted;
    out.push(
      `<path d="${polylinePath(e.points)}" fill="none" stroke="${stroke}" stroke-width="${e.inCycle ? 2 : 1.3}"${EDGE_DASH[e.inferred ? "inferred" : e.strength]} marker-end="url(#${e.inCycle ? "pp-arrow-cycle" : "pp-arrow"})"/>`,
    );
  }
  for (const n of nodes) {
    const b = n.box;
    const kind: ComponentKind = n.kind === "team" ? "service" : n.kind;
    const p = shapePaths(kind, b.width, b.height);
    const stroke = n.paint.dashed ? theme.undeclared : theme.line;
    out.push(`<g transform="translate(${b.x},${b.y})">`);
    out.push(
      `<path d="${p.outline}" fill="${n.paint.fill === "transparent" ? "none" : n.paint.fill}" stroke="${stroke}" stroke-width="${n.kind === "team" ? 2 : 1.2}"${n.paint.dashed ? ' stroke-dasharray="5 3"' : ""}/>`,
    );
    if (p.detail) out.push(`<path d="${p.detail}" fill="none" stroke="${n.paint.text}" stroke-opacity="0.45"/>`);
    out.push(
      `<text x="${b.width / 2}" y="${b.height / 2 - 2}" text-anchor="middle" font-size="13" font-weight="600" fill="${n.paint.text}">${escapeXml(clip(n.title, 24))}</text>`,
      `<text x="${b.width / 2}" y="${b.height / 2 + 14}" text-anchor="middle" font-size="10" fill="${n.paint.text}" fill-opacity="0.85">${escapeXml(clip(n.subtitle, 32))}</text>`,
    );
    if (n.articulation) {
      out.push(
        `<g transform="translate(${b.width - 44},-9)"><rect width="48" height="16" rx="8" fill="${theme.info}"/><text x="24" y="12" text-anchor="middle" font-size="10" font-weight="700" fill="#0e1419">splits</text></g>`,
      );
    }
    out.push(`</g>`);
  }
  out.push(`</g></svg>`);
  return { svg: out.join("\n"), width, height };
}

export function kindSubtitle(kind: ComponentKind, extra: string | null): string {
  return extra ? `${KIND_LABEL[kind]} · ${extra}` : KIND_LABEL[kind];
}

/** Browser only: rasterise the SVG at `scale` via an <img> and a canvas. */
export async function svgToPng(svg: string, width: number, height: number, scale = 2): Promise<Blob> {
  // Canvas size limits differ by browser (≈ 16k px a side, or 268M px area); stay well under.
  const s = Math.max(0.25, Math.min(scale, 8192 / Math.max(width, height, 1)));
  const url = URL.createObjectURL(new Blob([svg], { type: "image/svg+xml;charset=utf-8" }));
  try {
    const img = new Image();
    img.decoding = "async";
    await new Promise<void>((resolve, reject) => {
      img.onload = () => resolve();
      img.onerror = () => reject(new Error("could not render the SVG for PNG export"));
      img.src = url;
    });
    const canvas = document.createElement("canvas");
    canvas.width = Math.round(width * s);
    canvas.height = Math.round(height * s);
    const ctx = canvas.getContext("2d");
    if (!ctx) throw new Error("no 2D canvas available for PNG export");
    ctx.scale(s, s);
    ctx.drawImage(img, 0, 0, width, height);
    return await new Promise<Blob>((resolve, reject) =>
      canvas.toBlob((b) => (b ? resolve(b) : reject(new Error("PNG encoding failed"))), "image/png"),
    );
  } finally {
    URL.revokeObjectURL(url);
  }
}

export function downloadBlob(blob: Blob, filename: string): void {
  const url = URL.createObjectURL(blob);
  const a = document.createElement("a");
  a.href = url;
  a.download = filename;
  document.body.appendChild(a);
  a.click();
  a.remove();
  // Revoke on the next tick: some browsers start the download asynchronously.
  setTimeout(() => URL.revokeObjectURL(url), 0);
}
