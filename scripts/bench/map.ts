// The map at estate scale: the worker's layouts (lib/map/estate.ts, ELK in Node as the worker runs
// it), a view composed from them as the browser does when a team or every team is expanded, and a
// component's 2-hop neighbourhood laid out as the browser's web worker would. The first view in
// headless Chromium is printed by tests/e2e/map-large.test.ts.
import ELK from "elkjs/lib/elk.bundled.js";
import type { MapGraph } from "../../lib/api/schemas/map";
import { buildElkGraph, layoutInputFromView, readElkLayout } from "../../lib/map/elk";
import { bundleHubs, composeStored, layoutEstate } from "../../lib/map/estate";
import { NO_FILTERS, buildView, teamSlots } from "../../lib/map/view";
import { generateGraph } from "./generate";

function mapGraphOf(n: number, seed = 7): MapGraph {
  const g = generateGraph({ n, seed });
  return {
    environment: "bench",
    snapshot: null,
    teams: [],
    nodes: g.nodes.map((x) => ({ key: x.key, name: x.key, kind: "service", team: x.team ?? null, tier: x.tier, replicas: x.replicas, zones: x.zones, undeclared: false, metrics: null })),
    edges: g.edges.map((e) => ({ from: e.from, to: e.to, strength: e.strength === "soft" ? "soft" : "hard", group: null, inCycle: false })),
  };
}

const ms = (t0: number) => `${Math.round(performance.now() - t0).toLocaleString()} ms`;

export async function benchMap(sizes: readonly number[]): Promise<void> {
  for (const n of sizes) {
    const graph = mapGraphOf(n);
    const slots = teamSlots(graph);
    let t0 = performance.now();
    const stored = await layoutEstate({ graph, elk: new ELK(), pause: () => new Promise((r) => setImmediate(r)) });
    console.log(`map ${n.toLocaleString()} components, ${slots.length} teams: worker layout of every view (${Object.keys(stored).length} views, ${(JSON.stringify(stored).length / 1024).toFixed(0)} KiB) ${ms(t0)}`);

    t0 = performance.now();
    const teamView = bundleHubs(buildView(graph, { filters: NO_FILTERS, focus: null, grouping: { byTeam: true, collapsed: new Set(slots) } })).view;
    composeStored(teamView, stored);
    console.log(`map ${n.toLocaleString()}: team view from stored positions (view + composition) ${ms(t0)}`);
    t0 = performance.now();
    const all = bundleHubs(buildView(graph, { filters: NO_FILTERS, focus: null, grouping: { byTeam: true, collapsed: new Set() } })).view;
    const composed = composeStored(all, stored);
    console.log(`map ${n.toLocaleString()}: every team expanded from stored positions (view + composition, ${Object.keys(composed?.boxes ?? {}).length.toLocaleString()} boxes) ${ms(t0)}`);

    const focusKey = graph.nodes[Math.floor(n / 2)]!.key;
    t0 = performance.now();
    const focus = bundleHubs(buildView(graph, { filters: NO_FILTERS, focus: { key: focusKey, hops: 2 }, grouping: { byTeam: false, collapsed: new Set() } })).view;
    readElkLayout(await new ELK().layout(buildElkGraph(layoutInputFromView(focus))));
    console.log(`map ${n.toLocaleString()}: 2-hop focus on ${focusKey} (${focus.items.length} components) selected and laid out by ELK ${ms(t0)}`);
  }
}
