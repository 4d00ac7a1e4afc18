// The impact comparison on seeded random before/after graphs, every measure it reads recomputed in
// this run by Debian's python3-networkx (tests/impact/reference/impact_reference.py):
// networkx.betweenness_centrality (ranks and pinch scores), articulation_points and bridges of the
// undirected projection, strongly_connected_components of the hard needs (cycles), ancestors along
// hard needs (who is down when a component fails) and immediate_dominators from each entry point.
import { execFileSync } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { analyse } from "@/lib/analysis";
import { tierWeight } from "@/lib/analysis/blast-radius";
import { buildGraph } from "@/lib/analysis/graph";
import { isSinglePoint } from "@/lib/analysis/pinch-score";
import { mulberry32 } from "@/lib/analysis/random";
import type { AnalysisInput } from "@/lib/analysis/types";
import type { Tier } from "@/lib/inventory/types";
import { compareSides, sideFromAnalysis, type ComponentFacts, type ImpactComparison, type ImpactSide } from "@/lib/impact/compare";
import { DEFAULT_POLICIES } from "@/lib/impact/policies";

const PYTHON = process.env.PINCHPOINT_PYTHON ?? "/usr/bin/python3";
const SCRIPT = join(__dirname, "reference", "impact_reference.py");
const CASES = 120;

interface GraphSpec {
  edges: Array<[number, number, boolean]>;
  tier: Tier[];
  replicas: number[];
  zones: string[][];
}
interface Case {
  id: number;
  n: number;
  before: GraphSpec;
  after: GraphSpec;
}
interface RefSide {
  betweenness: number[];
  articulation: number[];
  bridges: Array<[number, number]>;
  hardCycles: number[][];
  hardEdges: Array<[number, number]>;
  down: number[][];
  entries: number[];
  idom: Record<string, Record<string, number>>;
}

const key = (i: number): string => `c${String(i).padStart(2, "0")}`;

function randomCase(id: number): Case {
  const rand = mulberry32(7000 + id);
  const n = 6 + Math.floor(rand() * 14);
  const pick = () => Math.floor(rand() * n);
  const pairs = new Map<string, [number, number, boolean]>();
  const m = Math.floor(n * (0.8 + rand() * 1.2));
  for (let e = 0; e < m; e++) {
    const u = pick();
    const v = pick();
    if (u !== v) pairs.set(`${u},${v}`, [u, v, rand() < 0.75]);
  }
  const tier = Array.from({ length: n }, () => (1 + Math.floor(rand() * 4)) as Tier);
  const replicas = Array.from({ length: n }, () => 1 + Math.floor(rand() * 3));
  const zones = Array.from({ length: n }, () => (rand() < 0.5 ? ["a", "b"] : rand() < 0.5 ? ["a"] : []));
  const before: GraphSpec = { edges: [...pairs.values()], tier, replicas, zones };
  // The change: a few needs added, removed and re-strengthened, a tier and a replica count edited.
  const next = new Map([...pairs].map(([k, e]) => [k, [...e] as [number, number, boolean]]));
  for (let i = 0, adds = 1 + Math.floor(rand() * 4); i < adds; i++) {
    const u = pick();
    const v = pick();
    if (u !== v) next.set(`${u},${v}`, [u, v, rand() < 0.8]);
  }
  const existing = [...next.keys()];
  for (let i = 0, drops = Math.floor(rand() * 3); i < drops && existing.length; i++) next.delete(existing[Math.floor(rand() * existing.length)]!);
  const flip = [...next.values()][Math.floor(rand() * next.size)];
  if (flip) flip[2] = !flip[2];
  const tierAfter = [...tier];
  tierAfter[pick()] = (1 + Math.floor(rand() * 4)) as Tier;
  const replicasAfter = [...replicas];
  replicasAfter[pick()] = 1 + Math.floor(rand() * 3);
  return { id, n, before, after: { edges: [...next.values()], tier: tierAfter, replicas: replicasAfter, zones } };
}

function inputOf(n: number, g: GraphSpec): AnalysisInput {
  return {
    nodes: Array.from({ length: n }, (_, i) => ({ key: key(i), tier: g.tier[i]!, replicas: g.replicas[i]!, zones: g.zones[i]!, team: null })),
    edges: g.edges.map(([u, v, hard]) => ({ from: key(u), to: key(v), strength: hard ? "hard" : "soft", group: null })),
  };
}

async function sideOf(n: number, g: GraphSpec): Promise<ImpactSide> {
  const input = inputOf(n, g);
  const graph = buildGraph(input);
  const components = new Map<string, ComponentFacts>(input.nodes.map((x) => [x.key, { key: x.key, name: x.key, kind: "service", tier: x.tier, team: null }]));
  return sideFromAnalysis({ input, graph, result: await analyse(graph), components });
}

function runReference(cases: Case[]): Array<{ id: number; before: RefSide; after: RefSide }> {
  const dir = mkdtempSync(join(tmpdir(), "pinchpoint-impact-nx-"));
  try {
    const file = join(dir, "batch.json");
    writeFileSync(file, JSON.stringify({ cases }));
    try {
      return (JSON.parse(execFileSync(PYTHON, [SCRIPT, file], { encoding: "utf8", maxBuffer: 64 * 1024 * 1024 })) as { results: Array<{ id: number; before: RefSide; after: RefSide }> }).results;
    } catch (error) {
      throw new Error(`Debian's python3-networkx is needed for these checks (apt-get install -y python3-networkx): ${String(error)}`);
    }
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

const keys = (xs: Iterable<number>): string[] => [...xs].map(key).sort();
const pairKeys = (xs: Array<[number, number]>): string[] => xs.map(([a, b]) => `${key(Math.min(a, b))}-${key(Math.max(a, b))}`).sort();

/** Pinch score of DESIGN §3 from networkx's betweenness and ancestors (weights 0.4/0.4/0.2). */
function pinchScores(n: number, g: GraphSpec, r: RefSide): number[] {
  const maxB = Math.max(...r.betweenness);
  const total = g.tier.reduce((s, t) => s + tierWeight(t), 0);
  return Array.from({ length: n }, (_, v) => {
    const b = maxB > 0 ? r.betweenness[v]! / maxB : 0;
    const reach = r.down[v]!.reduce((s, u) => s + tierWeight(g.tier[u]!), 0) / total;
    const s = isSinglePoint(g.replicas[v]!, g.zones[v]!) ? 1 : 0;
    return 100 * (0.4 * b + 0.4 * reach + 0.2 * s);
  });
}

/** Components an entry cannot avoid, from networkx's immediate dominators: d ≠ entry with something below it. */
function chokepoints(idom: Record<string, number>): Map<string, number> {
  const count = new Map<number, number>();
  for (const start of Object.keys(idom).map(Number)) {
    let d = idom[String(start)];
    while (d !== undefined && String(d) in idom) {
      count.set(d, (count.get(d) ?? 0) + 1);
      d = idom[String(d)];
    }
  }
  return new Map([...count].map(([d, c]) => [key(d), c]));
}

describe(`impact comparison on ${CASES} seeded before/after graphs against networkx`, () => {
  const cases = Array.from({ length: CASES }, (_, i) => randomCase(i));
  const results = new Map<number, { before: ImpactSide; after: ImpactSide; c: ImpactComparison }>();
  let refs: Array<{ id: number; before: RefSide; after: RefSide }> = [];

  beforeAll(async () => {
    refs = runReference(cases);
    for (const k of cases) {
      const before = await sideOf(k.n, k.before);
      const after = await sideOf(k.n, k.after);
      results.set(k.id, { before, after, c: compareSides(before, after, { movement: DEFAULT_POLICIES.movement, detailedGrowth: Infinity }) });
    }
  }, 120_000);

  const each = (check: (k: Case, r: { before: RefSide; after: RefSide }, ours: { before: ImpactSide; after: ImpactSide; c: ImpactComparison }) => void) => {
    expect(refs).toHaveLength(CASES);
    for (const r of refs) check(cases[r.id]!, r, results.get(r.id)!);
  };

  it("the batch has new cycles, new articulation points, growing blast radii and dominator changes to compare", () => {
    const count = (f: (c: ImpactComparison) => boolean) => [...results.values()].filter((x) => f(x.c)).length;
    expect(count((c) => c.hardCycles.added.length > 0)).toBeGreaterThan(10);
    expect(count((c) => c.articulation.added.length > 0)).toBeGreaterThan(10);
    expect(count((c) => c.tier1Blast.length > 0)).toBeGreaterThan(20);
    expect(count((c) => c.dominators.entries.length > 0)).toBeGreaterThan(10);
    expect(count((c) => c.singlePointNeeds.length > 0)).toBeGreaterThan(10);
  });

  it("told which components the change touches (as the push does, from its snapshot diff), the comparison gives the same answer", () => {
    each((k, _r, ours) => {
      const touched = new Set<string>();
      const pairs = (g: GraphSpec) => new Map(g.edges.map(([u, v, hard]) => [`${u},${v}`, hard]));
      const [pb, pa] = [pairs(k.before), pairs(k.after)];
      for (const [id, hard] of pa) if (pb.get(id) !== hard) touched.add(key(Number(id.split(",")[0])));
      for (const id of pb.keys()) if (!pa.has(id)) touched.add(key(Number(id.split(",")[0])));
      for (let v = 0; v < k.n; v++) if (k.before.tier[v] !== k.after.tier[v] || k.before.replicas[v] !== k.after.replicas[v]) touched.add(key(v));
      touched.add(key(0)); // a superset is fine
      const hinted = compareSides(ours.before, ours.after, { movement: DEFAULT_POLICIES.movement, detailedGrowth: Infinity, changed: touched });
      expect(hinted, `case ${k.id}`).toEqual(ours.c);
    });
  });

  it("pinch scores before and after equal DESIGN §3 over networkx.betweenness_centrality and ancestors along hard needs", () => {
    each((k, r, ours) => {
      for (const [side, spec, ref] of [[ours.before, k.before, r.before], [ours.after, k.after, r.after]] as const) {
        const expected = pinchScores(k.n, spec, ref);
        for (let v = 0; v < k.n; v++) expect(side.measures.get(key(v))!.pinchScore, `case ${k.id} ${key(v)}`).toBeCloseTo(expected[v]!, 9);
      }
    });
  });

  it("ranks follow networkx's betweenness (ties by pinch score, then key)", () => {
    each((k, r, ours) => {
      for (const [side, spec, ref] of [[ours.before, k.before, r.before], [ours.after, k.after, r.after]] as const) {
        const score = pinchScores(k.n, spec, ref);
        const order = Array.from({ length: k.n }, (_, v) => v).sort((a, b) => side.measures.get(key(a))!.rank - side.measures.get(key(b))!.rank);
        for (let i = 1; i < order.length; i++) {
          const [a, b] = [order[i - 1]!, order[i]!];
          const db = ref.betweenness[a]! - ref.betweenness[b]!;
          // Non-increasing betweenness; on a tie (within float noise), non-increasing score; then key.
          expect(db, `case ${k.id} rank ${i}`).toBeGreaterThan(-1e-9);
          if (Math.abs(db) <= 1e-9) expect(score[a]! - score[b]!, `case ${k.id} rank ${i}`).toBeGreaterThan(-1e-9);
        }
      }
    });
  });

  it("new and removed articulation points and bridges equal networkx.articulation_points / bridges before and after", () => {
    each((k, r, { c }) => {
      const apB = new Set(keys(r.before.articulation));
      const apA = new Set(keys(r.after.articulation));
      expect(c.articulation, `case ${k.id}`).toEqual({ added: [...apA].filter((x) => !apB.has(x)).sort(), removed: [...apB].filter((x) => !apA.has(x)).sort() });
      const brB = new Set(pairKeys(r.before.bridges));
      const brA = new Set(pairKeys(r.after.bridges));
      expect({ added: c.bridges.added.map((p) => p.join("-")), removed: c.bridges.removed.map((p) => p.join("-")) }, `case ${k.id}`).toEqual({
        added: [...brA].filter((x) => !brB.has(x)).sort(),
        removed: [...brB].filter((x) => !brA.has(x)).sort(),
      });
    });
  });

  it("new and broken cycles of hard needs follow networkx.strongly_connected_components over hard needs; each new one is closed by hard needs the change added", () => {
    each((k, r, { c }) => {
      // New: not all members were already in one cycle; broken: not all members are still in one.
      const within = (cycles: number[][]) => (members: number[]) => cycles.some((x) => members.every((m) => x.includes(m)));
      const inBefore = within(r.before.hardCycles);
      const inAfter = within(r.after.hardCycles);
      const id = (xs: number[]) => keys(xs).join(",");
      expect(c.hardCycles.added.map((x) => x.members.join(",")).sort(), `case ${k.id}`).toEqual(r.after.hardCycles.filter((x) => !inBefore(x)).map(id).sort());
      expect(c.hardCycles.removed.map((x) => x.join(",")).sort(), `case ${k.id}`).toEqual(r.before.hardCycles.filter((x) => !inAfter(x)).map(id).sort());
      const hardBefore = new Set(r.before.hardEdges.map(([u, v]) => `${key(u)}>${key(v)}`));
      for (const cycle of c.hardCycles.added) {
        const inside = new Set(cycle.members);
        const expected = r.after.hardEdges.map(([u, v]) => [key(u), key(v)] as const).filter(([u, v]) => inside.has(u) && inside.has(v) && !hardBefore.has(`${u}>${v}`));
        expect(cycle.closedBy.map((x) => `${x.from}>${x.to}`).sort(), `case ${k.id}`).toEqual(expected.map(([u, v]) => `${u}>${v}`).sort());
        expect(cycle.closedBy.length, `case ${k.id}: a new cycle is closed by at least one new hard need`).toBeGreaterThan(0);
      }
    });
  });

  it("tier-1 blast radius changes: counts and who newly goes down equal networkx.ancestors along hard needs", () => {
    each((k, r, { c }) => {
      const tier1 = new Set<number>();
      for (let v = 0; v < k.n; v++) if (k.before.tier[v] === 1 || k.after.tier[v] === 1) tier1.add(v);
      const expected = [...tier1]
        .map((v) => {
          const b = new Set(keys(r.before.down[v]!));
          const a = new Set(keys(r.after.down[v]!));
          return { key: key(v), before: b.size, after: a.size, newly: [...a].filter((x) => !b.has(x)).sort(), gone: [...b].filter((x) => !a.has(x)).sort() };
        })
        .filter((x) => x.newly.length || x.gone.length || x.before !== x.after);
      // Degraded counts may change alone (a soft need), so compare the entries whose down sets changed.
      const ours = c.tier1Blast
        .filter((x) => x.before!.down !== x.after!.down || x.newlyDown?.length || x.noLongerDown?.length)
        .map((x) => ({ key: x.key, before: x.before!.down, after: x.after!.down, newly: x.newlyDown, gone: x.noLongerDown }));
      expect(ours, `case ${k.id}`).toEqual(expected.sort((x, y) => (x.key < y.key ? -1 : 1)));
    });
  });

  it("growth of what each failure takes down equals networkx.ancestors, largest first", () => {
    each((k, r, { c }) => {
      const growth = Array.from({ length: k.n }, (_, v) => ({ key: key(v), d: r.after.down[v]!.length - r.before.down[v]!.length })).filter((x) => x.d > 0);
      expect(new Set(c.downGrowth.map((g) => g.key)), `case ${k.id}`).toEqual(new Set(growth.map((g) => g.key)));
      for (let i = 1; i < c.downGrowth.length; i++) {
        const [a, b] = [c.downGrowth[i - 1]!, c.downGrowth[i]!];
        expect(a.after!.down - a.before!.down).toBeGreaterThanOrEqual(b.after!.down - b.before!.down);
      }
    });
  });

  it("entry points' unavoidable components change as networkx.immediate_dominators says, for every entry point", () => {
    each((k, r, { c }) => {
      const entriesB = new Set(r.before.entries.map(key));
      const entriesA = new Set(r.after.entries.map(key));
      const expected: Array<{ entry: string; added: string[]; removed: string[] }> = [];
      for (const e of new Set([...entriesA, ...entriesB])) {
        const v = String(Number(e.slice(1)));
        const b = entriesB.has(e) ? chokepoints(r.before.idom[v]!) : new Map<string, number>();
        const a = entriesA.has(e) ? chokepoints(r.after.idom[v]!) : new Map<string, number>();
        const added = [...a.keys()].filter((x) => !b.has(x)).sort();
        const removed = [...b.keys()].filter((x) => !a.has(x)).sort();
        if (added.length || removed.length || entriesA.has(e) !== entriesB.has(e)) expected.push({ entry: e, added, removed });
      }
      const ours = c.dominators.entries.map((x) => ({ entry: x.entry, added: x.added.map((y) => y.key).sort(), removed: x.removed.map((y) => y.key).sort() }));
      expect(ours.sort((x, y) => (x.entry < y.entry ? -1 : 1)), `case ${k.id}`).toEqual(expected.sort((x, y) => (x.entry < y.entry ? -1 : 1)));
      // And how much each newly unavoidable component dominates.
      for (const x of c.dominators.entries) {
        const v = String(Number(x.entry.slice(1)));
        if (!entriesA.has(x.entry)) continue;
        const a = chokepoints(r.after.idom[v]!);
        for (const d of x.added) expect(d.dominates, `case ${k.id} ${x.entry} ${d.key}`).toBe(a.get(d.key));
      }
    });
  });
});
