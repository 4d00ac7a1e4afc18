// Colour scales for the map. Measures use the viridis stops of the theme (sequential,
// colour-blind safe); teams and tiers use the Okabe–Ito categorical set.
import type { Tier } from "@/lib/inventory/types";
import type { ColourMode, MapNode } from "./types";
import { UNOWNED, teamSlotOf } from "./view";

/** Same hexes as --color-ramp-0..4 in app/globals.css (viridis stops, van der Walt & Smith 2015). */
export const RAMP = ["#440154", "#3b528b", "#21918c", "#5ec962", "#fde725"] as const;

/** Okabe & Ito (2008), "Color Universal Design": the seven hues other than black, which vanishes on the dark canvas. */
export const OKABE_ITO = ["#56b4e9", "#e69f00", "#009e73", "#f0e442", "#0072b2", "#d55e00", "#cc79a7"] as const;

/** Warm for the most critical tier, cool for the least; green is left out so tier 4 never reads as "healthy". */
export const TIER_COLOURS: Record<Tier, string> = { 1: "#d55e00", 2: "#e69f00", 3: "#f0e442", 4: "#56b4e9" };

const NO_DATA = "#6c7f8d";
export const UNDECLARED = "#999999";
// Pure black, not the canvas ink: mid-ramp teal (#21918c) reaches 4.5:1 only against black.
const DARK_TEXT = "#000000";
const LIGHT_TEXT = "#ffffff";

export type MeasureMode = Exclude<ColourMode, "tier" | "team">;

export const MODE_LABELS: Record<ColourMode, string> = {
  betweenness: "Betweenness",
  pinchScore: "Pinch score",
  blastDown: "Takes down",
  entriesDominated: "Entry points it dominates",
  tier: "Tier",
  team: "Team",
};

function hexToRgb(hex: string): [number, number, number] {
  const h = hex.replace("#", "").padEnd(6, "0");
  return [parseInt(h.slice(0, 2), 16), parseInt(h.slice(2, 4), 16), parseInt(h.slice(4, 6), 16)];
}

function rgbToHex(r: number, g: number, b: number): string {
  const c = (v: number) => Math.round(Math.min(255, Math.max(0, v))).toString(16).padStart(2, "0");
  return `#${c(r)}${c(g)}${c(b)}`;
}

/**
 * Colour at t ∈ [0, 1] on the ramp, linear in sRGB between the five stops. An approximation
 * of full viridis (which is defined on 256 samples); good enough for reading levels.
 */
export function rampColour(t: number): string {
  const x = Number.isFinite(t) ? Math.min(1, Math.max(0, t)) : 0;
  const pos = x * (RAMP.length - 1);
  const i = Math.min(RAMP.length - 2, Math.floor(pos));
  const f = pos - i;
  const a = hexToRgb(RAMP[i] ?? RAMP[0]);
  const b = hexToRgb(RAMP[i + 1] ?? RAMP[4]);
  return rgbToHex(a[0] + (b[0] - a[0]) * f, a[1] + (b[1] - a[1]) * f, a[2] + (b[2] - a[2]) * f);
}

/** WCAG 2.x relative luminance. */
export function luminance(hex: string): number {
  const lin = (v: number) => {
    const s = v / 255;
    return s <= 0.04045 ? s / 12.92 : ((s + 0.055) / 1.055) ** 2.4;
  };
  const [r, g, b] = hexToRgb(hex);
  return 0.2126 * lin(r) + 0.7152 * lin(g) + 0.0722 * lin(b);
}

export function contrastRatio(a: string, b: string): number {
  const la = luminance(a);
  const lb = luminance(b);
  return (Math.max(la, lb) + 0.05) / (Math.min(la, lb) + 0.05);
}

/** Dark or white text, whichever contrasts more with the fill. */
export function textOn(fill: string): string {
  return contrastRatio(fill, DARK_TEXT) >= contrastRatio(fill, LIGHT_TEXT) ? DARK_TEXT : LIGHT_TEXT;
}

export interface MeasureScale {
  mode: MeasureMode;
  max: number;
  /**
   * sqrt for heavy-tailed measures (betweenness, blast radius): a linear scale would paint
   * almost every component the bottom colour (common practice for skewed counts).
   */
  transform: "linear" | "sqrt";
}

function measureValue(node: MapNode, mode: MeasureMode): number | null {
  return node.metrics ? (node.metrics[mode] ?? null) : null;
}

export function measureScale(nodes: readonly MapNode[], mode: MeasureMode): MeasureScale {
  if (mode === "pinchScore") return { mode, max: 100, transform: "linear" };
  // A count of entry points: few distinct values, read directly.
  if (mode === "entriesDominated") {
    let max = 0;
    for (const n of nodes) max = Math.max(max, measureValue(n, mode) ?? 0);
    return { mode, max, transform: "linear" };
  }
  let max = 0;
  for (const n of nodes) max = Math.max(max, measureValue(n, mode) ?? 0);
  return { mode, max, transform: "sqrt" };
}

export function scaleT(scale: MeasureScale, value: number): number {
  if (scale.max <= 0) return 0;
  const r = Math.min(1, Math.max(0, value / scale.max));
  return scale.transform === "sqrt" ? Math.sqrt(r) : r;
}

export function scaleInverse(scale: MeasureScale, t: number): number {
  const r = scale.transform === "sqrt" ? t * t : t;
  return r * scale.max;
}

export interface NodePaint {
  fill: string;
  text: string;
  /** dashed grey outline for placeholders nobody declared */
  dashed: boolean;
}

export interface Palette {
  mode: ColourMode;
  scale: MeasureScale | null;
  teamColours: Map<string, string>;
}

export function buildPalette(nodes: readonly MapNode[], mode: ColourMode, teamOrder: readonly string[]): Palette {
  const teamColours = new Map<string, string>();
  teamOrder.forEach((slot, i) => {
    teamColours.set(slot, slot === UNOWNED ? NO_DATA : (OKABE_ITO[i % OKABE_ITO.length] ?? NO_DATA));
  });
  const scale = mode === "tier" || mode === "team" ? null : measureScale(nodes, mode);
  return { mode, scale, teamColours };
}

export function paintNode(node: MapNode, palette: Palette): NodePaint {
  if (node.undeclared || node.kind === "undeclared") return { fill: "transparent", text: UNDECLARED, dashed: true };
  let fill: string;
  if (palette.mode === "tier") fill = TIER_COLOURS[node.tier];
  else if (palette.mode === "team") fill = palette.teamColours.get(teamSlotOf(node)) ?? NO_DATA;
  else {
    const v = measureValue(node, palette.mode);
    fill = v === null || !palette.scale ? NO_DATA : rampColour(scaleT(palette.scale, v));
  }
  return { fill, text: textOn(fill), dashed: false };
}

export type Legend =
  | { kind: "ramp"; title: string; stops: string[]; ticks: { t: number; label: string }[]; note: string }
  | { kind: "categories"; title: string; items: { label: string; colour: string }[]; note: string | null };

function formatMeasure(mode: MeasureMode, v: number): string {
  if (mode === "betweenness") return `${(v * 100).toFixed(v * 100 < 10 ? 1 : 0)}%`;
  return Math.round(v).toString();
}

export function buildLegend(palette: Palette, teamNames: ReadonlyMap<string, string>): Legend {
  if (palette.mode === "tier") {
    return {
      kind: "categories",
      title: "Tier",
      items: ([1, 2, 3, 4] as const).map((t) => ({
        label: t === 1 ? "Tier 1 (most critical)" : t === 4 ? "Tier 4 (least)" : `Tier ${t}`,
        colour: TIER_COLOURS[t],
      })),
      note: null,
    };
  }
  if (palette.mode === "team") {
    const items = [...palette.teamColours].map(([slot, colour]) => ({ label: teamNames.get(slot) ?? slot, colour }));
    return {
      kind: "categories",
      title: "Team",
      items,
      note: items.length > OKABE_ITO.length ? "Colours repeat after seven teams; each node also names its team." : null,
    };
  }
  const scale = palette.scale ?? { mode: palette.mode, max: 0, transform: "linear" as const };
  const ticks = [0, 0.5, 1].map((t) => ({ t, label: formatMeasure(palette.mode as MeasureMode, scaleInverse(scale, t)) }));
  return {
    kind: "ramp",
    title: MODE_LABELS[palette.mode],
    stops: [...RAMP],
    ticks,
    note:
      scale.transform === "sqrt"
        ? "Square-root scale: small differences at the low end stay visible."
        : palette.mode === "entriesDominated"
          ? "Entry points (tier 1, nothing depends on them) from which every path to something passes through the component."
          : "Linear scale 0–100.",
  };
}
