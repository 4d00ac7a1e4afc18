// The compact graph of a snapshot, built once and kept in memory (snapshots are immutable, so a
// snapshot id is a perfect cache key). Drills and the map read from here, never from the tables.
import "server-only";
import { QueryTypes } from "sequelize";
import { db } from "@/models";
import { buildGraph, drill, passesThrough, type CompactGraph, type DrillRequest } from "@/lib/analysis";
import { needChain, toGraphology } from "@/lib/analysis/chain";
import type { DirectedGraph } from "graphology";
import type { SnapshotContent } from "@/lib/inventory/snapshot";
import { AppError } from "@/lib/errors";
import { analysisInputFromContent, analysisSettingsKey, effectiveStrength, type AnalysisSettings } from "@/lib/analysis/input";
import { readSettings } from "@/lib/inventory/settings";
import type { z } from "zod";
import type { chainHopSchema, chainResponseSchema } from "@/lib/api/schemas/analysis";

interface Entry {
  content: SnapshotContent;
  graph: CompactGraph;
  /** The same runtime graph as a graphology graph, built on first use (lib/analysis/chain.ts). */
  graphology?: DirectedGraph;
  settings: AnalysisSettings;
}

const CACHE_SIZE = 8;
const holder = globalThis as unknown as { __pinchpointGraphs?: Map<string, Promise<Entry>> };
const cache = (holder.__pinchpointGraphs ??= new Map());

/** The snapshot's graph under its environment's current settings (the analysis builds the same one). */
export async function getSnapshotGraph({ snapshotId }: { snapshotId: string }): Promise<Entry> {
  const [row] = await db().sequelize.query<{ settings: unknown }>(
    "SELECT e.settings FROM snapshots s JOIN environments e ON e.id = s.environment_id WHERE s.id = :snapshotId",
    { type: QueryTypes.SELECT, replacements: { snapshotId } },
  );
  if (!row) throw new AppError("not_found", "Snapshot not found");
  const settings = readSettings(row.settings);
  const cacheKey = `${snapshotId}/${analysisSettingsKey(settings)}`;
  const hit = cache.get(cacheKey);
  if (hit) {
    // refresh its place in the LRU order
    cache.delete(cacheKey);
    cache.set(cacheKey, hit);
    return hit;
  }
  const load = (async () => {
    const snap = await db().models.Snapshot.findByPk(snapshotId, { attributes: ["content"] });
    if (!snap) throw new AppError("not_found", "Snapshot not found");
    return { content: snap.content, graph: buildGraph(analysisInputFromContent(snap.content, settings)), settings };
  })();
  cache.set(cacheKey, load);
  load.catch(() => cache.delete(cacheKey));
  while (cache.size > CACHE_SIZE) {
    const oldest = cache.keys().next().value;
    if (oldest === undefined) break;
    cache.delete(oldest);
  }
  return load;
}

export interface TeamContact {
  slug: string;
  name: string;
  email: string | null;
  oncall: string | null;
}

export interface DrillResponse {
  failed: { components: string[]; zones: string[] };
  down: string[];
  degraded: string[];
  teams: Array<{ team: string | null; contact: TeamContact | null; down: string[]; degraded: string[] }>;
  byTier: Record<"1" | "2" | "3" | "4", number>;
}

/** Owner of every component of the environment: the assigned team, else the declared one. */
export async function effectiveOwners({ environmentId }: { environmentId: string }): Promise<Map<string, string | null>> {
  const rows = await db().sequelize.query<{ key: string; owner_team: string | null }>(
    "SELECT key, owner_team FROM component_annotations WHERE environment_id = :environmentId AND owner_team IS NOT NULL",
    { type: QueryTypes.SELECT, replacements: { environmentId } },
  );
  return new Map(rows.map((r) => [r.key, r.owner_team]));
}

export async function teamContacts(): Promise<Map<string, TeamContact>> {
  const rows = await db().models.Team.findAll();
  return new Map(rows.map((t) => [t.slug, { slug: t.slug, name: t.name, email: t.email, oncall: t.oncall }]));
}

export async function runDrill({
  environmentId,
  snapshot,
  request,
}: {
  environmentId: string;
  snapshot: { id: string; number: number; createdAt: string };
  request: DrillRequest;
}): Promise<DrillResponse> {
  const { graph } = await getSnapshotGraph({ snapshotId: snapshot.id });
  const knownZones = new Set(graph.zones.flat());
  const unknownZones = (request.zones ?? []).filter((z) => !knownZones.has(z));
  if (unknownZones.length) {
    throw new AppError("invalid_request", `No component runs in ${unknownZones.join(", ")}`, unknownZones.map((z) => ({ path: "fail.zones", message: `no component declares zone "${z}"; known zones: ${[...knownZones].sort().join(", ") || "none"}` })));
  }
  const [assigned, contacts] = await Promise.all([effectiveOwners({ environmentId }), teamContacts()]);
  const teamOf = (v: number): string | null => {
    const key = graph.keys[v]!;
    return assigned.has(key) ? (assigned.get(key) ?? null) : (graph.team[v] ?? null);
  };
  const result = drill(graph, request, teamOf);
  if (result.unknown.length) {
    throw new AppError("invalid_request", `Unknown component${result.unknown.length > 1 ? "s" : ""}: ${result.unknown.join(", ")}`, result.unknown.map((k) => ({ path: "fail.components", message: `no component "${k}" in snapshot #${snapshot.number}` })));
  }
  const teams = result.teams.map((t) => ({ ...t, contact: t.team ? (contacts.get(t.team) ?? null) : null }));
  return {
    failed: { components: [...(request.components ?? [])], zones: [...(request.zones ?? [])] },
    down: result.down,
    degraded: result.degraded,
    teams,
    byTier: result.byTier,
  };
}

/**
 * For an entry point: the components every path from it passes through (to the components each
 * dominates), computed on demand from the cached graph — one dominator tree is milliseconds.
 */
export async function entryDominators({ snapshotId, entry, limit = 50 }: { snapshotId: string; entry: string; limit?: number }): Promise<{ reached: number; through: Array<{ key: string; dominated: number }>; total: number } | null> {
  const { graph } = await getSnapshotGraph({ snapshotId });
  const root = graph.indexOf.get(entry);
  if (root === undefined) return null;
  const { reached, through } = passesThrough(graph, root);
  return { reached, total: through.length, through: through.slice(0, limit).map((t) => ({ key: graph.keys[t.node]!, dominated: t.dominated })) };
}

/** Start-up-only needs of a snapshot (the strongest need on the pair is start-up only), by dependent, for the cold-start runbook. */
export async function startupNeeds({ snapshotId }: { snapshotId: string }): Promise<Record<string, string[]>> {
  const { graph } = await getSnapshotGraph({ snapshotId });
  const out: Record<string, string[]> = {};
  const { offsets, targets } = graph.boot;
  for (let u = 0; u < graph.n; u++) {
    for (let e = offsets[u]!; e < offsets[u + 1]!; e++) {
      if (graph.bootStrength[e] !== 2) continue;
      (out[graph.keys[u]!] ??= []).push(graph.keys[targets[e]!]!);
    }
  }
  return out;
}

type ChainHop = z.infer<typeof chainHopSchema>;
export type ChainResponse = Omit<z.infer<typeof chainResponseSchema>, "snapshot">;

/** Why does `from` depend on `to`? The shortest chain of runtime needs, in the snapshot's graph. */
export async function dependencyChain({ snapshotId, from, to }: { snapshotId: string; from: string; to: string }): Promise<ChainResponse> {
  const entry = await getSnapshotGraph({ snapshotId });
  for (const key of [from, to]) if (!entry.graph.indexOf.has(key)) throw new AppError("not_found", `Component "${key}" not found in this snapshot`);
  entry.graphology ??= toGraphology(entry.graph);
  const path = needChain(entry.graphology, from, to);
  const hops: ChainHop[] = [];
  if (path) {
    const rank = { hard: 2, soft: 1, startup: 0 } as const;
    for (let i = 0; i + 1 < path.length; i++) {
      const a = path[i]!;
      const b = path[i + 1]!;
      // Several needs can join one pair (a plain one and an any_of member): show the strongest, as it counts
      // under the environment's settings (an inferred need may count as soft).
      const deps = entry.content.dependencies
        .filter((d) => d.from === a && d.to === b && d.strength !== "startup")
        .map((d) => ({ ...d, strength: effectiveStrength(d, entry.settings) }));
      const best = deps.sort((x, y) => rank[y.strength] - rank[x.strength] || Number(x.group !== null) - Number(y.group !== null))[0];
      hops.push({
        from: a,
        to: b,
        strength: best?.strength ?? "hard",
        provenance: best?.provenance ?? ["declared"],
        via: best?.via ?? null,
        anyOf: best !== undefined && best.group !== null,
      });
    }
  }
  return {
    from,
    to,
    path,
    hops,
    hardAllTheWay: path !== null && hops.every((h) => h.strength === "hard" && !h.anyOf),
    reversed: path === null && needChain(entry.graphology, to, from) !== null,
  };
}
