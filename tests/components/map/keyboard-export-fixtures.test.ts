import { describe, expect, it } from "vitest";
import { demoMapGraph } from "./fixtures";
import { DEFAULT_EXPORT_THEME, escapeXml, renderSvg } from "@/components/map/export";
import { arrowDir, nextSelection } from "@/components/map/keyboard";
import { shapePaths } from "@/components/map/shapes";
import { MAP_KINDS, mapGraphSchema } from "@/components/map/types";
import { buildAdjacency } from "@/components/map/view";

// These check Pinchpoint's own design decisions (no outside reference exists for them).
describe("keyboard movement", () => {
  //      top
  //     /   \
  //  left   right      (top needs left and right; left needs bottom)
  //    |
  //  bottom
  const positions = new Map([
    ["top", { x: 100, y: 0 }],
    ["left", { x: 0, y: 100 }],
    ["right", { x: 200, y: 100 }],
    ["bottom", { x: 0, y: 200 }],
  ]);
  const adjacency = buildAdjacency([
    { from: "top", to: "left" },
    { from: "top", to: "right" },
    { from: "left", to: "bottom" },
  ]);
  const go = (current: string | null, key: string) => nextSelection({ current, dir: arrowDir(key) ?? "down", positions, adjacency });
  it("starts at the top-left component", () => expect(go(null, "ArrowDown")).toBe("top"));
  it("down follows a need, up follows a dependent", () => {
    expect(go("left", "ArrowDown")).toBe("bottom");
    expect(go("bottom", "ArrowUp")).toBe("left");
    expect(go("right", "ArrowUp")).toBe("top");
  });
  it("left and right step along the row", () => {
    expect(go("left", "ArrowRight")).toBe("right");
    expect(go("right", "ArrowLeft")).toBe("left");
  });
  it("with no edge that way, moves to the nearest component in that direction; stays at the edge of the map", () => {
    expect(go("right", "ArrowDown")).toBe("bottom");
    expect(go("top", "ArrowUp")).toBe("top");
  });
  it("ignores other keys", () => expect(arrowDir("Enter")).toBeNull());
});

describe("shapes", () => {
  it("every kind has a closed outline, and no two kinds share one", () => {
    const outlines = MAP_KINDS.map((k) => shapePaths(k, 184, 60).outline);
    for (const o of outlines) expect(o.trim().endsWith("Z")).toBe(true);
    // undeclared differs from service by corner radius and, in the renderer, by its dashed grey stroke
    expect(new Set(outlines).size).toBe(MAP_KINDS.length);
  });
});

describe("SVG export", () => {
  it("escapes text and draws one shape per node, soft edges dashed, cycle edges marked", () => {
    const { svg, width, height } = renderSvg({
      title: "Map <production> & \"friends\"",
      theme: DEFAULT_EXPORT_THEME,
      groups: [],
      nodes: [
        { id: "a", box: { x: 0, y: 0, width: 184, height: 60 }, kind: "datastore", title: "Orders <db>", subtitle: "datastore", paint: { fill: "#21918c", text: "#ffffff", dashed: false }, articulation: true },
        { id: "b", box: { x: 0, y: 120, width: 184, height: 60 }, kind: "undeclared", title: "? legacy", subtitle: "undeclared", paint: { fill: "transparent", text: "#999999", dashed: true }, articulation: false },
      ],
      edges: [
        { points: [{ x: 92, y: 60 }, { x: 92, y: 120 }], strength: "soft", inferred: false, inCycle: false },
        { points: [{ x: 50, y: 60 }, { x: 50, y: 120 }], strength: "hard", inferred: false, inCycle: true },
      ],
    });
    expect(escapeXml(`<a href="x">&'`)).toBe("&lt;a href=&quot;x&quot;&gt;&amp;&apos;");
    expect(svg).toContain("Orders &lt;db&gt;");
    expect(svg).not.toContain("Orders <db>");
    expect(svg).toContain("&amp; &quot;friends&quot;");
    expect(svg.match(/stroke-dasharray="6 4"/g)).toHaveLength(1);
    expect(svg).toContain("url(#pp-arrow-cycle)");
    expect(svg).toContain(">splits<");
    expect(svg.match(/stroke-dasharray="5 3"/g)).toHaveLength(1);
    expect([width, height]).toEqual([184 + 48, 180 + 48]);
  });
});

describe("demo fixture", () => {
  it("is deterministic, valid against the API schema, and self-consistent", () => {
    const a = demoMapGraph(150);
    expect(demoMapGraph(150)).toEqual(a);
    expect(mapGraphSchema.safeParse(a).success).toBe(true);
    const keys = new Set(a.nodes.map((n) => n.key));
    expect(keys.size).toBe(a.nodes.length);
    expect(a.nodes.filter((n) => !n.undeclared)).toHaveLength(150);
    expect(a.nodes.some((n) => n.undeclared)).toBe(true);
    expect(a.nodes.some((n) => n.team === null && !n.undeclared)).toBe(true);
    for (const e of a.edges) expect(keys.has(e.from) && keys.has(e.to) && e.from !== e.to).toBe(true);
    expect(a.edges.filter((e) => e.inCycle)).toHaveLength(2);
    expect(demoMapGraph(3).nodes.length).toBeGreaterThanOrEqual(3);
  });
});
