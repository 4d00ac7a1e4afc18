import { describe, expect, it } from "vitest";
import {
  OKABE_ITO,
  RAMP,
  TIER_COLOURS,
  buildLegend,
  buildPalette,
  contrastRatio,
  luminance,
  measureScale,
  paintNode,
  rampColour,
  scaleInverse,
  scaleT,
  textOn,
} from "@/components/map/colour";
import type { MapNode } from "@/components/map/types";
import { UNOWNED } from "@/components/map/view";

function node(key: string, betweenness: number, over: Partial<MapNode> = {}): MapNode {
  return {
    key, name: key, kind: "service", team: "t1", tier: 2, replicas: 2, zones: ["a", "b"], undeclared: false,
    metrics: { betweenness, pagerank: 0, eigenvector: 0, clustering: 0, blastDown: betweenness * 100, blastDegraded: 0, pinchScore: betweenness * 100, articulation: false, inCycle: false },
    ...over,
  };
}

describe("WCAG contrast helpers", () => {
  // WCAG 2.1 §1.4.3 definitions: relative luminance of white is 1, of black 0; their contrast is 21:1.
  it("luminance and contrast of black and white", () => {
    expect(luminance("#ffffff")).toBeCloseTo(1, 10);
    expect(luminance("#000000")).toBe(0);
    expect(contrastRatio("#000000", "#ffffff")).toBeCloseTo(21, 10);
  });
  it("text on the ramp is always at least 4.5:1 (WCAG AA for normal text)", () => {
    for (let t = 0; t <= 1; t += 0.05) {
      const fill = rampColour(t);
      expect(contrastRatio(fill, textOn(fill))).toBeGreaterThanOrEqual(4.5);
    }
  });
  it("text on every categorical hue is at least 4.5:1", () => {
    for (const c of [...OKABE_ITO, ...Object.values(TIER_COLOURS)]) expect(contrastRatio(c, textOn(c))).toBeGreaterThanOrEqual(4.5);
  });
});

describe("sequential ramp", () => {
  it("hits the theme's viridis stops at 0, ½ and 1 and clamps outside", () => {
    expect(rampColour(0)).toBe(RAMP[0]);
    expect(rampColour(0.5)).toBe(RAMP[2]);
    expect(rampColour(1)).toBe(RAMP[4]);
    expect(rampColour(-3)).toBe(RAMP[0]);
    expect(rampColour(7)).toBe(RAMP[4]);
    expect(rampColour(Number.NaN)).toBe(RAMP[0]);
  });
  it("interpolates linearly in sRGB between stops", () => {
    // halfway between #440154 and #3b528b: (0x44+0x3b)/2 = 63.5 → 64 (0x40), (0x01+0x52)/2 = 41.5 → 42, (0x54+0x8b)/2 = 111.5 → 112
    expect(rampColour(0.125)).toBe("#402a70");
  });
  it("betweenness uses a square-root scale over [0, max]; pinch score is linear over 0–100", () => {
    const nodes = [node("a", 0), node("b", 0.1), node("c", 0.4)];
    const s = measureScale(nodes, "betweenness");
    expect(s).toEqual({ mode: "betweenness", max: 0.4, transform: "sqrt" });
    expect(scaleT(s, 0.1)).toBeCloseTo(0.5, 10);
    expect(scaleInverse(s, 0.5)).toBeCloseTo(0.1, 10);
    const p = measureScale(nodes, "pinchScore");
    expect(p.max).toBe(100);
    expect(scaleT(p, 25)).toBe(0.25);
    expect(scaleT({ mode: "blastDown", max: 0, transform: "sqrt" }, 5)).toBe(0);
  });
  it("maps nodes to ramp colours, and missing metrics to the no-data grey", () => {
    const nodes = [node("a", 0), node("b", 0.1), node("c", 0.4), node("d", 0, { metrics: null })];
    const pal = buildPalette(nodes, "betweenness", ["t1"]);
    expect(paintNode(nodes[0] as MapNode, pal).fill).toBe(RAMP[0]);
    expect(paintNode(nodes[1] as MapNode, pal).fill).toBe(RAMP[2]);
    expect(paintNode(nodes[2] as MapNode, pal).fill).toBe(RAMP[4]);
    expect(paintNode(nodes[3] as MapNode, pal).fill).toBe("#6c7f8d");
  });
});

describe("categorical colours", () => {
  it("teams take Okabe–Ito hues in order, repeating after seven; unowned is grey", () => {
    const slots = ["a", "b", "c", "d", "e", "f", "g", "h", UNOWNED];
    const pal = buildPalette([], "team", slots);
    expect(pal.teamColours.get("a")).toBe(OKABE_ITO[0]);
    expect(pal.teamColours.get("g")).toBe(OKABE_ITO[6]);
    expect(pal.teamColours.get("h")).toBe(OKABE_ITO[0]);
    expect(pal.teamColours.get(UNOWNED)).toBe("#6c7f8d");
    const legend = buildLegend(pal, new Map([["a", "Alpha"]]));
    expect(legend.kind === "categories" && legend.note).toMatch(/repeat/);
  });
  it("tiers use their fixed hue; undeclared placeholders are dashed grey whatever the mode", () => {
    const pal = buildPalette([], "tier", []);
    expect(paintNode(node("x", 0, { tier: 1 }), pal).fill).toBe(TIER_COLOURS[1]);
    const u = paintNode(node("u", 0, { kind: "undeclared", undeclared: true }), pal);
    expect(u).toEqual({ fill: "transparent", text: "#999999", dashed: true });
  });
  it("ramp legend labels invert the scale", () => {
    const pal = buildPalette([node("a", 0), node("b", 0.4)], "betweenness", []);
    const legend = buildLegend(pal, new Map());
    expect(legend.kind === "ramp" && legend.ticks.map((t) => t.label)).toEqual(["0.0%", "10%", "40%"]);
  });
});
