// Traffic behind each observed edge over the environment's rolling window (settings.traceWindowDays):
// calls, errors, calls per minute, error rate and p50/p95 duration, summed from the hourly buckets
// of lib/data/traces.ts. Trace names are resolved through the components' aliases, so an edge seen
// as frontend → cartservice is reported on frontend → cart once `cart` lists `cartservice`.
import "server-only";
import { QueryTypes } from "sequelize";
import { db } from "@/models";
import { readSettings } from "@/lib/inventory/settings";
import { fromJson, merge, quantile, type Histogram } from "@/lib/traces/histogram";

export interface Traffic {
  calls: number;
  errors: number;
  /** calls ÷ minutes since the window opened or the edge was first seen, whichever is later */
  callsPerMinute: number;
  /** errors ÷ calls; 0 without calls */
  errorRate: number;
  p50Ms: number | null;
  p95Ms: number | null;
  firstSeenAt: string;
  lastSeenAt: string;
}

interface ObservedEdgeTraffic extends Traffic {
  /** component keys after alias resolution */
  from: string;
  to: string;
  /** the names traces used, when aliases changed them */
  tracedAs: string[];
  toKind: "service" | "datastore" | "queue";
  via: string | null;
  async: boolean;
  evidence: string[];
  sources: string[];
}

export interface TrafficReport {
  window: { days: number; since: string };
  edges: ObservedEdgeTraffic[];
  /** every source that sent traces, with its last sighting, distinct pairs and the names it used */
  sources: Array<{ source: string; lastSeenAt: string; edges: number }>;
}

interface Row {
  from_name: string;
  to_name: string;
  to_kind: ObservedEdgeTraffic["toKind"];
  via: string | null;
  async: boolean;
  evidence: string[];
  first_seen_at: Date;
  last_seen_at: Date;
  source: string;
  calls: string;
  errors: string;
  durations: Record<string, number> | null;
}

/** alias → component key of the environment's declared components. */
async function environmentAliases({ environmentId }: { environmentId: string }): Promise<Map<string, string>> {
  const rows = await db().sequelize.query<{ key: string; aliases: string[] }>(
    "SELECT key, aliases FROM components WHERE environment_id = $1 AND cardinality(aliases) > 0",
    { type: QueryTypes.SELECT, bind: [environmentId] },
  );
  const map = new Map<string, string>();
  for (const r of rows) for (const a of r.aliases) map.set(a, r.key);
  return map;
}

export async function observedTraffic({ environmentId, now = new Date(), key }: { environmentId: string; now?: Date; key?: string }): Promise<TrafficReport> {
  const { sequelize } = db();
  const env = await db().models.Environment.findByPk(environmentId, { attributes: ["settings"] });
  const days = readSettings(env?.settings).traceWindowDays;
  const since = new Date(now.getTime() - days * 86_400_000);
  const [rows, aliases] = await Promise.all([
    sequelize.query<Row>(
      `SELECT e.from_name, e.to_name, e.to_kind, e.via, e.async, e.evidence, e.first_seen_at, e.last_seen_at, s.name AS source,
              COALESCE(sum(b.calls), 0) AS calls, COALESCE(sum(b.errors), 0) AS errors,
              pinchpoint_histogram_sum(b.durations) FILTER (WHERE b.edge_id IS NOT NULL) AS durations
         FROM trace_edges e
         JOIN sources s ON s.id = e.source_id
         LEFT JOIN trace_edge_buckets b ON b.edge_id = e.id AND b.bucket >= date_trunc('hour', $2::timestamptz)
        WHERE e.environment_id = $1 AND e.last_seen_at >= $2
        GROUP BY e.id, s.name`,
      { type: QueryTypes.SELECT, bind: [environmentId, since] },
    ),
    environmentAliases({ environmentId }),
  ]);
  const resolve = (n: string): string => aliases.get(n) ?? n;

  const byPair = new Map<string, { edge: Omit<ObservedEdgeTraffic, keyof Traffic>; calls: number; errors: number; hist: Histogram; first: Date; last: Date; traced: Set<string> }>();
  const sources = new Map<string, { last: Date; pairs: Set<string> }>();
  for (const r of rows) {
    const from = resolve(r.from_name);
    const to = resolve(r.to_name);
    if (from === to) continue;
    if (key !== undefined && from !== key && to !== key) continue;
    const id = `${from}\u0000${to}`;
    let p = byPair.get(id);
    if (!p) {
      p = { edge: { from, to, tracedAs: [], toKind: r.to_kind, via: r.via, async: r.async, evidence: [], sources: [] }, calls: 0, errors: 0, hist: new Map(), first: r.first_seen_at, last: r.last_seen_at, traced: new Set() };
      byPair.set(id, p);
    }
    p.calls += Number(r.calls);
    p.errors += Number(r.errors);
    merge(p.hist, fromJson(r.durations));
    if (r.first_seen_at < p.first) p.first = r.first_seen_at;
    if (r.last_seen_at > p.last) p.last = r.last_seen_at;
    if (p.edge.toKind === "service") p.edge.toKind = r.to_kind;
    p.edge.via ??= r.via;
    p.edge.async ||= r.async;
    p.edge.evidence = [...new Set([...p.edge.evidence, ...r.evidence])].sort();
    if (!p.edge.sources.includes(r.source)) p.edge.sources = [...p.edge.sources, r.source].sort();
    if (r.from_name !== from || r.to_name !== to) p.traced.add(`${r.from_name} → ${r.to_name}`);
    const s = sources.get(r.source);
    if (s) {
      if (r.last_seen_at > s.last) s.last = r.last_seen_at;
      s.pairs.add(id);
    } else sources.set(r.source, { last: r.last_seen_at, pairs: new Set([id]) });
  }

  const edges = [...byPair.values()].map(({ edge, calls, errors, hist, first, last, traced }) => {
    const opened = Math.max(first.getTime(), since.getTime());
    const minutes = Math.max(1, (now.getTime() - opened) / 60_000);
    return {
      ...edge,
      tracedAs: [...traced].sort(),
      calls,
      errors,
      callsPerMinute: calls / minutes,
      errorRate: calls > 0 ? errors / calls : 0,
      p50Ms: quantile(hist, 0.5),
      p95Ms: quantile(hist, 0.95),
      firstSeenAt: first.toISOString(),
      lastSeenAt: last.toISOString(),
    };
  });
  const cmp = (a: string, b: string): number => (a < b ? -1 : a > b ? 1 : 0);
  edges.sort((a, b) => cmp(a.from, b.from) || cmp(a.to, b.to));
  return {
    window: { days, since: since.toISOString() },
    edges,
    sources: [...sources.entries()].map(([source, s]) => ({ source, lastSeenAt: s.last.toISOString(), edges: s.pairs.size })).sort((a, b) => cmp(a.source, b.source)),
  };
}

/** Traffic by "from\u0000to", for screens that decorate edges. */
export async function trafficByPair(args: { environmentId: string; key?: string }): Promise<Map<string, Traffic>> {
  const report = await observedTraffic(args);
  return new Map(report.edges.map((e) => [`${e.from}\u0000${e.to}`, e]));
}
