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
  margin?: number;
}): { svg: string; width: number; height: number } {
  const { nodes, edges, groups, theme } = args;
  const m = args.margin ?? 24;
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
  const width = Math.ceil(maxX - minX + 2 * m);
  const height = Math.ceil(maxY - minY + 2 * m);
  const ox = m - minX;
  const oy = m - minY;
  const out: string[] = [];
  out.push(
    `<svg xmlns="http://www.w3.org/2000/svg" width="${width}" height="${height}" viewBox="0 0 ${width} ${height}" font-family="Inter, system-ui, sans-serif">`,
    `<title>${escapeXml(args.title)}</title>`,
    `<defs><marker id="pp-arrow" viewBox="0 0 10 10" refX="9" refY="5" markerWidth="7" markerHeight="7" orient="auto-start-reverse"><path d="M0,0 L10,5 L0,10 z" fill="${theme.muted}"/></marker>`,
    `<marker id="pp-arrow-cycle" viewBox="0 0 10 10" refX="9" refY="5" markerWidth="7" markerHeight="7" orient="auto-start-reverse"><path d="M0,0 L10,5 L0,10 z" fill="${theme.cycle}"/></marker></defs>`,
    `<rect width="100%" height="100%" fill="${theme.canvas}"/>`,
    `<g transform="translate(${ox},${oy})">`,
  );
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
