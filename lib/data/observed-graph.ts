// Observed edges into the environment's graph (lib/inventory/observed.ts has the rules). The set of
// observed edges is every traced (caller, callee) pair last seen within the environment's rolling
// window (settings.traceWindowDays). It enters the graph:
//   - on every push, which lays the current set over the merged declared graph;
//   - from the worker (scripts/analysis-worker.ts → runTraceUpkeep), when the set differs from the
//     one the graph last took in: new pairs arrived (debounced: it waits until no new pair has come
//     for a few seconds, at most a minute), or pairs aged out of the window;
//   - at once, after a trace file push.
// A change of traffic alone never makes a snapshot: calls, errors and durations stay in the trace
// aggregate tables (lib/data/traces.ts) and are joined in when screens show them.
import "server-only";
import { createHash } from "node:crypto";
import { QueryTypes, type Transaction } from "sequelize";
import { db } from "@/models";
import { applyObserved, OBSERVED_SOURCE, stripObserved, type ObservedPair } from "@/lib/inventory/observed";
import { readSettings } from "@/lib/inventory/settings";
import { diffSnapshots, provenanceOf, snapshotHash, type SnapshotContent } from "@/lib/inventory/snapshot";
import { summariseDiff, type DiffSummary } from "./push";
import { recordAudit } from "./audit";
import { loadCurrentContent, writeSourceRows } from "./graph-content";
import { insertSnapshot, latestSnapshot } from "./snapshot-insert";

/** Wait this long after the last new pair before snapshotting, so a burst of new pairs makes one snapshot. */
const DEBOUNCE_MS = Number(process.env.PINCHPOINT_TRACE_DEBOUNCE_MS ?? 5_000);
/** ...but never longer than this after the first one. */
const MAX_DELAY_MS = 60_000;

const EMPTY: SnapshotContent = { components: [], dependencies: [] };

const windowStart = (days: number, now: Date): Date => new Date(now.getTime() - days * 86_400_000);

/** The pairs seen within the window, one per (caller, callee) across sources. */
async function activeObservedPairs(
  { environmentId, windowDays, now = new Date() }: { environmentId: string; windowDays: number; now?: Date },
  transaction?: Transaction,
): Promise<ObservedPair[]> {
  const rows = await db().sequelize.query<{ from_name: string; to_name: string; to_kind: ObservedPair["toKind"]; via: string | null }>(
    `SELECT DISTINCT ON (from_name, to_name) from_name, to_name, to_kind, via
       FROM trace_edges WHERE environment_id = $1 AND last_seen_at >= $2
      ORDER BY from_name, to_name, (to_kind <> 'service') DESC, last_seen_at DESC`,
    { type: QueryTypes.SELECT, bind: [environmentId, windowStart(windowDays, now)], transaction },
  );
  return rows.map((r) => ({ from: r.from_name, to: r.to_name, toKind: r.to_kind, via: r.via }));
}

/** One hash of a set of pairs (what trace_state.materialised_hash records). */
function pairSetHash(pairs: readonly ObservedPair[]): string {
  const lines = pairs.map((p) => `${p.from}>${p.to}:${p.toKind}:${p.via ?? ""}`).sort();
  return createHash("sha256").update(lines.join("\n")).digest("hex");
}

async function observedSourceId({ environmentId }: { environmentId: string }, transaction: Transaction): Promise<string> {
  const [source] = await db().models.Source.findOrCreate({
    where: { environmentId, name: OBSERVED_SOURCE },
    defaults: { environmentId, name: OBSERVED_SOURCE, lastFormat: "otlp", lastPushAt: null },
    transaction,
  });
  return source.id;
}

const hasObservedParts = (c: SnapshotContent): boolean =>
  c.components.some((x) => x.source === OBSERVED_SOURCE) || c.dependencies.some((d) => provenanceOf(d).includes("observed"));

/** Did the overlay change a need of some source other than `source` (an `observed` mark came or went)? */
function otherSourcesChanged(before: SnapshotContent, after: SnapshotContent, source: string): boolean {
  const key = (d: SnapshotContent["dependencies"][number]) => `${d.source}\u0000${d.from}\u0000${d.to}\u0000${d.group ?? ""}\u0000${d.written ?? ""}`;
  const prov = new Map(before.dependencies.filter((d) => d.source !== source && d.source !== OBSERVED_SOURCE).map((d) => [key(d), provenanceOf(d).join(",")]));
  const rest = after.dependencies.filter((d) => d.source !== source && d.source !== OBSERVED_SOURCE);
  if (rest.length !== prov.size) return true;
  return rest.some((d) => prov.get(key(d)) !== provenanceOf(d).join(","));
}

/** The observed set of an environment now, for a push to lay over its merged graph. */
export interface Overlay {
  pairs: ObservedPair[];
  /** The declared graph alone (what merging works on). */
  strip(content: SnapshotContent): SnapshotContent;
  apply(content: SnapshotContent): SnapshotContent;
  /**
   * Write the rows the overlay owns after the pushing source's own rows were written: the observed
   * components and needs, and every source's needs when their `observed` marks changed.
   */
  write(args: { previous: SnapshotContent; next: SnapshotContent; pushingSource: string }, transaction: Transaction): Promise<void>;
}

export async function observedOverlay({ environmentId }: { environmentId: string }, transaction: Transaction): Promise<Overlay> {
  const env = await db().models.Environment.findByPk(environmentId, { attributes: ["settings"], transaction });
  const pairs = env ? await activeObservedPairs({ environmentId, windowDays: readSettings(env.settings).traceWindowDays }, transaction) : [];
  return {
    pairs,
    strip: stripObserved,
    apply: (content) => applyObserved(content, pairs),
    async write({ previous, next, pushingSource }, t) {
      if (!hasObservedParts(previous) && !hasObservedParts(next)) return;
      await writeSourceRows(
        {
          environmentId,
          sourceId: await observedSourceId({ environmentId }, t),
          sourceName: OBSERVED_SOURCE,
          content: next,
          allDependencies: otherSourcesChanged(previous, next, pushingSource),
        },
        t,
      );
      await markMaterialised({ environmentId, pairs }, t);
    },
  };
}

async function markMaterialised({ environmentId, pairs }: { environmentId: string; pairs: ObservedPair[] }, transaction: Transaction): Promise<void> {
  await db().sequelize.query(
    `INSERT INTO trace_state (environment_id, edges_changed_at, materialised_hash, materialised_at) VALUES ($1, now(), $2, now())
     ON CONFLICT (environment_id) DO UPDATE SET materialised_hash = EXCLUDED.materialised_hash, materialised_at = now()`,
    { bind: [environmentId, pairSetHash(pairs)], transaction },
  );
}

export interface MaterialiseResult {
  changed: boolean;
  snapshot: { id: string; number: number; createdAt: string } | null;
  pairs: number;
  diff: DiffSummary;
}

/**
 * Lay the current observed set over the environment's graph; a new snapshot (and analysis) when
 * that changes the graph. Serialised with pushes by the same per-environment lock.
 */
export async function materialiseObservedGraph(
  { environmentId, now = new Date() }: { environmentId: string; now?: Date },
  outer?: Transaction,
): Promise<MaterialiseResult> {
  const { sequelize, models } = db();
  const run = async (transaction: Transaction): Promise<MaterialiseResult> => {
    const env = await models.Environment.findByPk(environmentId, { transaction });
    if (!env) return { changed: false, snapshot: null, pairs: 0, diff: summariseDiff(diffSnapshots(EMPTY, EMPTY)) };
    await sequelize.query("SELECT pg_advisory_xact_lock(hashtext('pinchpoint-env:' || :slug))", { replacements: { slug: env.slug }, transaction });
    const pairs = await activeObservedPairs({ environmentId, windowDays: readSettings(env.settings).traceWindowDays, now }, transaction);
    const previous = await loadCurrentContent({ environmentId }, transaction);
    const next = applyObserved(stripObserved(previous), pairs);
    const hash = snapshotHash(next);
    const latest = await latestSnapshot({ environmentId }, transaction);
    const changed = latest ? latest.hash !== hash : next.components.length > 0;
    let snapshot: MaterialiseResult["snapshot"] = null;
    if (changed) {
      await writeSourceRows(
        { environmentId, sourceId: await observedSourceId({ environmentId }, transaction), sourceName: OBSERVED_SOURCE, content: next, allDependencies: true },
        transaction,
      );
      snapshot = await insertSnapshot(
        { environmentId, number: (latest?.number ?? 0) + 1, hash, content: next, sourceName: OBSERVED_SOURCE, format: "otlp", actorLabel: "traces" },
        transaction,
      );
      await recordAudit(
        {
          actor: { type: "system", label: "traces" },
          action: "traces.graph",
          targetType: "environment",
          targetId: env.slug,
          environmentId,
          before: latest ? { snapshot: latest.number } : null,
          after: { snapshot: snapshot.number, observedPairs: pairs.length },
        },
        transaction,
      );
    }
    await markMaterialised({ environmentId, pairs }, transaction);
    return { changed, snapshot, pairs: pairs.length, diff: summariseDiff(diffSnapshots(previous, next)) };
  };
  return outer ? run(outer) : sequelize.transaction(run);
}

/**
 * The worker's turn: every environment whose observed set differs from the one its graph took in,
 * once no new pair has arrived for DEBOUNCE_MS (or MAX_DELAY_MS has passed since it first differed).
 */
export async function materialiseChangedEnvironments({ now = new Date() }: { now?: Date } = {}): Promise<number> {
  const { sequelize } = db();
  const states = await sequelize.query<{ environment_id: string; edges_changed_at: Date; materialised_hash: string | null; materialised_at: Date | null; settings: unknown }>(
    `SELECT s.environment_id, s.edges_changed_at, s.materialised_hash, s.materialised_at, e.settings
       FROM trace_state s JOIN environments e ON e.id = s.environment_id`,
    { type: QueryTypes.SELECT },
  );
  let done = 0;
  for (const s of states) {
    const pairs = await activeObservedPairs({ environmentId: s.environment_id, windowDays: readSettings(s.settings).traceWindowDays, now });
    if (pairSetHash(pairs) === s.materialised_hash) continue;
    const quiet = now.getTime() - s.edges_changed_at.getTime() >= DEBOUNCE_MS;
    const overdue = now.getTime() - (s.materialised_at ?? s.edges_changed_at).getTime() >= MAX_DELAY_MS;
    if (!quiet && !overdue) continue;
    await materialiseObservedGraph({ environmentId: s.environment_id, now });
    done += 1;
  }
  return done;
}
