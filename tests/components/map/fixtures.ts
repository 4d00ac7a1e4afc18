// Seeded demo graphs in the invented Harbor Pantry estate, for the map tests.
// The metrics are plausible stand-ins derived from degree, not the analysis' real values.
import type { DeclaredKind, Tier } from "@/lib/inventory/types";
import type { MapEdge, MapGraph, MapNode } from "@/components/map/types";
import { mulberry32 as prng } from "@/lib/analysis/random";

const TEAMS = [
  ["storefront", "Storefront"],
  ["checkout", "Checkout"],
  ["catalogue", "Catalogue"],
  ["fulfilment", "Fulfilment"],
  ["couriers", "Couriers"],
  ["payments", "Payments"],
  ["identity", "Identity"],
  ["search", "Search"],
  ["platform", "Platform"],
  ["data", "Data"],
  ["messaging", "Messaging"],
  ["store-ops", "Store operations"],
] as const;

const WORDS = ["basket", "pantry", "aisle", "shelf", "crate", "route", "slot", "coupon", "receipt", "loyalty", "stock", "picker", "van", "depot", "price", "offer", "substitute", "fresh", "chiller", "label"];

interface Layer {
  share: number;
  kinds: DeclaredKind[];
  tier: Tier[];
}
// Top to bottom: entry points, services, background jobs, data, shared foundations.
const LAYERS: Layer[] = [
  { share: 0.08, kinds: ["gateway", "service"], tier: [1, 1, 2] },
  { share: 0.3, kinds: ["service"], tier: [1, 2, 2, 3] },
  { share: 0.22, kinds: ["service", "service", "job"], tier: [2, 3, 3, 4] },
  { share: 0.3, kinds: ["datastore", "cache", "queue", "datastore", "external"], tier: [2, 3, 3] },
  { share: 0.1, kinds: ["platform", "network", "datastore"], tier: [1, 2] },
];

function pick<T>(rand: () => number, xs: readonly T[]): T {
  const x = xs[Math.floor(rand() * xs.length)];
  if (x === undefined) throw new Error("pick from empty list");
  return x;
}

export function demoMapGraph(n: number, seed = 20240611): MapGraph {
  const rand = prng(seed ^ n);
  const nodes: MapNode[] = [];
  const layerOf: number[] = [];
  const add = (key: string, name: string, kind: MapNode["kind"], team: string | null, tier: Tier, layer: number) => {
    nodes.push({ key, name, kind, team, tier, replicas: kind === "undeclared" ? 0 : 1 + Math.floor(rand() * 4), zones: rand() < 0.2 ? ["zone-a"] : ["zone-a", "zone-b"], undeclared: kind === "undeclared", metrics: null });
    layerOf.push(layer);
  };

  // Links to a special key that a small n left out are dropped below.
  // Deliberate weak spots of the demo scenario.
  const fixed = Math.min(n, 5);
  const special: [string, string, DeclaredKind, string | null, Tier, number][] = [
    ["session-keeper", "Session keeper", "service", "identity", 1, 2],
    ["order-bus", "Order bus", "queue", "messaging", 1, 3],
    ["dns-resolver", "DNS resolver", "network", null, 1, 4],
    ["pricing", "Pricing", "service", "catalogue", 2, 2],
    ["promotions", "Promotions", "service", "catalogue", 2, 2],
  ];
  for (const s of special.slice(0, fixed)) add(...s);

  let i = fixed;
  for (let l = 0; l < LAYERS.length; l++) {
    const layer = LAYERS[l];
    if (!layer) continue;
    const count = l === LAYERS.length - 1 ? n - i : Math.round(layer.share * (n - fixed));
    for (let c = 0; c < count && i < n; c++, i++) {
      const kind = pick(rand, layer.kinds);
      const unowned = rand() < 0.04;
      const team = unowned ? null : (pick(rand, TEAMS)[0] as string);
      const word = pick(rand, WORDS);
      add(`${word}-${kind}-${i}`, `${word[0]?.toUpperCase() ?? ""}${word.slice(1)} ${kind} ${i}`, kind, team, pick(rand, layer.tier), l);
    }
  }

  const edges: MapEdge[] = [];
  const seen = new Set<string>();
  const link = (from: string, to: string, strength: "hard" | "soft", inCycle = false) => {
    const id = `${from}>${to}`;
    if (from === to || seen.has(id)) return;
    seen.add(id);
    edges.push({ from, to, strength, group: null, inCycle });
  };
  const deeper = LAYERS.map((_, l) => nodes.filter((_, k) => (layerOf[k] ?? 0) > l));
  const undeclaredBudget = Math.max(1, Math.round(n * 0.02));
  let undeclared = 0;
  const snapshotNodes = [...nodes];
  snapshotNodes.forEach((node, k) => {
    const l = layerOf[k] ?? 0;
    const pool = deeper[l] ?? [];
    if (pool.length === 0) return;
    const sameTeam = pool.filter((m) => m.team === node.team);
    const needs = 1 + Math.floor(rand() * 3);
    for (let j = 0; j < needs; j++) {
      const target = sameTeam.length > 0 && rand() < 0.6 ? pick(rand, sameTeam) : pick(rand, pool);
      link(node.key, target.key, rand() < 0.25 ? "soft" : "hard");
    }
    if (l <= 1 && rand() < 0.5) link(node.key, "session-keeper", "hard");
    if (l === 2 && rand() < 0.3) link(node.key, "order-bus", rand() < 0.5 ? "hard" : "soft");
    if (l >= 1 && l <= 3 && rand() < 0.35) link(node.key, "dns-resolver", "hard");
    if (undeclared < undeclaredBudget && l === 2 && rand() < 0.1) {
      const key = `legacy-ledger-${undeclared}`;
      add(key, key, "undeclared", null, 3, 4);
      link(node.key, key, "hard");
      undeclared++;
    }
  });
  if (nodes.length >= 5) {
    link("pricing", "promotions", "hard", true);
    link("promotions", "pricing", "soft", true);
  }
  const keys = new Set(nodes.map((m) => m.key));
  const kept = edges.filter((e) => keys.has(e.from) && keys.has(e.to));

  // Degree-based stand-ins for the measures, scaled into their usual ranges.
  const indeg = new Map<string, number>();
  const outdeg = new Map<string, number>();
  for (const e of kept) {
    indeg.set(e.to, (indeg.get(e.to) ?? 0) + 1);
    outdeg.set(e.from, (outdeg.get(e.from) ?? 0) + 1);
  }
  const raw = nodes.map((m) => (indeg.get(m.key) ?? 0) * (1 + (outdeg.get(m.key) ?? 0)));
  const maxRaw = Math.max(1, ...raw);
  nodes.forEach((m, k) => {
    if (m.undeclared) return;
    const b = (raw[k] ?? 0) / maxRaw;
    const deg = (indeg.get(m.key) ?? 0) + (outdeg.get(m.key) ?? 0);
    m.metrics = {
      betweenness: Math.round(b * b * 0.4 * 1e4) / 1e4,
      pagerank: Math.round(((indeg.get(m.key) ?? 0) + 1) / (kept.length + nodes.length) * 1e4) / 1e4,
      eigenvector: Math.round(Math.min(1, deg / 40) * 1e3) / 1e3,
      clustering: Math.round(rand() * 0.6 * 1e3) / 1e3,
      blastDown: Math.round((indeg.get(m.key) ?? 0) * (1 + rand() * 3)),
      blastDegraded: Math.round(rand() * 5),
      pinchScore: Math.round(100 * (0.4 * b + 0.4 * b * rand() + 0.2 * (m.replicas <= 1 || m.zones.length < 2 ? 1 : 0))),
      articulation: (indeg.get(m.key) ?? 0) >= 6 && rand() < 0.5,
      inCycle: m.key === "pricing" || m.key === "promotions",
    };
  });

  return {
    environment: "production",
    snapshot: { number: 42, createdAt: "2024-06-11T08:30:00.000Z" },
    nodes,
    edges: kept,
    teams: TEAMS.map(([slug, name]) => ({ slug, name })),
  };
}
