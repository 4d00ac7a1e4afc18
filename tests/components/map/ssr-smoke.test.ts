// Server-render smoke test: the canvas, the inspector and each custom node render without
// throwing (no browser here; the ELK worker and React Flow's measuring only run in one).
import { createElement } from "react";
import { renderToString } from "react-dom/server";
import { ReactFlowProvider } from "@xyflow/react";
import { describe, expect, it } from "vitest";
import { MapCanvas } from "@/components/map/MapCanvas";
import { Inspector, inspectorLinks } from "@/components/map/Inspector";
import { demoMapGraph } from "./fixtures";
import { DecorContext, ComponentNode } from "@/components/map/nodes";
import { buildPalette } from "@/components/map/colour";

describe("server render", () => {
  const g = demoMapGraph(40);
  it("MapCanvas renders its toolbar and count", () => {
    const html = renderToString(createElement(MapCanvas, { graph: g, canEdit: true, focus: null }));
    expect(html).toContain("Find a component");
    expect(html).toContain(`data-count="${g.nodes.length}"`);
  });
  it("Inspector renders measures, links and the edit form", () => {
    const node = g.nodes.find((n) => n.metrics) ?? g.nodes[0];
    if (!node) throw new Error("empty fixture");
    const html = renderToString(
      createElement(Inspector, { environment: "production", node, ...inspectorLinks(g, node.key), teams: g.teams, canEdit: true, onSave: async () => null }),
    );
    expect(html).toContain("Share of the shortest dependency paths");
    expect(html).toContain(`/environments/production/drills?fail=${node.key}`);
    expect(html).toContain("Owner team");
  });
  it("a component node renders its kind label", () => {
    const node = g.nodes.find((n) => n.kind === "datastore") ?? g.nodes[0];
    if (!node) throw new Error("empty fixture");
    const decor = { palette: buildPalette(g.nodes, "betweenness", []), teamNames: new Map(), selected: null, focus: null, onToggleTeam: () => {}, hubs: new Map(), onOpenHub: () => {}, chain: null, teamStats: new Map() };
    const props = { id: node.key, data: { item: { type: "component" as const, id: node.key, node, parent: null }, pinned: false }, width: 184, height: 60 };
    const html = renderToString(
      createElement(ReactFlowProvider, null, createElement(DecorContext.Provider, { value: decor }, createElement(ComponentNode as unknown as (p: typeof props) => null, props))),
    );
    expect(html).toContain(node.kind);
  });
});
