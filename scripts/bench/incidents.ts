// Probable-origin ranking (lib/analysis/origin.ts) for 200 firing components on a generated
// 20,000-component estate (scripts/bench/generate.ts). The graph is built once per snapshot and
// cached by the app (lib/data/snapshot-graph.ts), so its build is timed apart from the ranking.
import { blastRadius } from "../../lib/analysis/blast-radius";
import { buildGraph } from "../../lib/analysis/graph";
import { probableOrigin } from "../../lib/analysis/origin";
import { mulberry32 } from "../../lib/analysis/random";
import { generateGraph } from "./generate";

const ms = (t0: number): number => Math.round((performance.now() - t0) * 10) / 10;

export function benchIncidents(n: number, firingCount: number, runs = 5): void {
  const t0 = performance.now();
  const graph = buildGraph(generateGraph({ n, seed: 42 }));
  console.log(`estate n=${graph.n} m=${graph.edgeCount}: graph built in ${ms(t0)} ms (once per snapshot, cached)`);
  const rand = mulberry32(18);
  const randomKey = () => graph.keys[Math.floor(rand() * graph.n)]!;
  // An origin whose failure takes down at least the firing count: most alerts are its victims.
  let origin = -1;
  let radius: number[] = [];
  for (let v = graph.n - 1; v >= 0 && origin < 0; v--) {
    const down = blastRadius(graph, { components: [v] }).down;
    if (down.length >= firingCount * 2 && down.length <= n / 4) {
      origin = v;
      radius = down.filter((x) => x !== v);
    }
  }
  const victims = (k: number) => radius.slice(0, k).map((v) => graph.keys[v]!);
  const noise = (k: number) => Array.from({ length: k }, randomKey);
  const scenarios: Array<[string, string[]]> = [
    [`one origin (${graph.keys[origin]}, blast radius ${radius.length + 1}), 179 of its victims and 20 unrelated alerts`, [graph.keys[origin]!, ...victims(firingCount - 21), ...noise(20)]],
    ["the same victims with the origin silent (not alerting)", [...victims(firingCount - 20), ...noise(20)]],
    [`${firingCount} components picked at random`, noise(firingCount)],
  ];
  for (const [label, firing] of scenarios) {
    const times: number[] = [];
    let summary = "";
    for (let i = 0; i < runs; i++) {
      const t = performance.now();
      const r = probableOrigin(graph, firing);
      times.push(ms(t));
      const hidden = graph.keys[origin]!;
      const where = [r.origins.findIndex((o) => o.key === hidden), r.silent.findIndex((x) => x.key === hidden), r.pagerank.findIndex((p) => p.key === hidden)].map((i) => (i < 0 ? "–" : String(i + 1)));
      summary =
        `${r.firing.length} firing, ${r.origins.length} origin(s) explaining ${r.explainedCount}, ${r.unexplained.length} unexplained, ${r.silent.length} silent suspect(s)` +
        `${r.silent[0] ? ` (first ${r.silent[0].key}, explains ${r.silent[0].explains.length})` : ""}; ${hidden} is origin #${where[0]}, silent suspect #${where[1]}, walk #${where[2]}`;
    }
    times.sort((a, b) => a - b);
    console.log(`${label}: median ${times[Math.floor(runs / 2)]} ms, max ${times[runs - 1]} ms over ${runs} runs — ${summary}`);
  }
}
