// Traces in: folded spans (lib/traces/fold.ts) stored as per-edge aggregates, never as spans.
//   - storeFold: one upsert of the edges and one of their hourly buckets (calls, errors, duration
//     histogram). Rows are written in key order, so concurrent requests on the same edges queue on
//     row locks instead of deadlocking.
//   - The receiver (receiveTraces) pairs a CLIENT span with a SERVER child that came in another
//     request through trace_waiting: what one request leaves unpaired waits there for a grace
//     period; the worker's sweep then counts waiting clients on their attributes and drops servers
//     whose caller never came.
//   - A trace file (pushTraceFile) is streamed and folded whole, then replaces what its source sent
//     before, like any push; a file needs no waiting (it holds both halves or never will).
// Repeated spans count once: within a fold by its own id set, across receiver requests by the ids
// of recent requests (RecentSpanIds, per environment, in this process).
import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { db } from "@/models";
import { AppError } from "@/lib/errors";
import { SOURCE_PATTERN, type InventoryIssue } from "@/lib/inventory/types";
import { toJson } from "@/lib/traces/histogram";
import { TraceFold, type WaitingClient } from "@/lib/traces/fold";
import { RecentSpanIds } from "@/lib/traces/seen";
import type { Callee } from "@/lib/traces/semconv";
import { noRejects, type RejectedSpans, type TraceSpan } from "@/lib/traces/types";
import { foldTraceDocument, foldWarnings } from "@/importers/otlp";
import { TraceFileError, traceDocuments, type TraceDocument } from "@/importers/otlp/documents";
import { recordAudit } from "./audit";
import { findEnvironment } from "./environments";
import { materialiseChangedEnvironments, materialiseObservedGraph } from "./observed-graph";
import type { PushActor, PushResult } from "./push";
import { lockEnvironment } from "./push";

/** How long a half of a call waits for the other half (SDK batches are sent every 5 s by default). */
const GRACE_SECONDS = Number(process.env.PINCHPOINT_TRACE_GRACE_S ?? 60);
/** The receiver's source when the token is bound to none. */
const RECEIVER_SOURCE = "otlp";

const hour = (d: Date): Date => new Date(Math.floor(d.getTime() / 3_600_000) * 3_600_000);

/** Write a fold's edges into the aggregates at time `at`; returns how many edges were new. */
async function storeFold({ environmentId, sourceId, fold, at }: { environmentId: string; sourceId: string; fold: TraceFold; at: Date }, transaction: Transaction): Promise<number> {
  if (fold.edges.size === 0) return 0;
  const bucket = hour(at).toISOString();
  const seen = at.toISOString();
  const rows = [...fold.edges.values()]
    .sort((a, b) => (a.from < b.from ? -1 : a.from > b.from ? 1 : a.to < b.to ? -1 : a.to > b.to ? 1 : 0))
    .map((e) => ({ f: e.from, t: e.to, k: e.toKind, v: e.via, a: e.async, e: [...e.evidence].sort(), c: e.calls, x: e.errors, h: toJson(e.histogram), b: bucket, s: seen }));
  const [result] = await db().sequelize.query<{ inserted: string }>(
    `WITH input AS (
       SELECT * FROM jsonb_to_recordset($3::jsonb) AS t(f text, t text, k text, v text, a boolean, e text[], c bigint, x bigint, h jsonb, b timestamptz, s timestamptz)
     ), edges AS (
       INSERT INTO trace_edges AS te (environment_id, source_id, from_name, to_name, to_kind, via, async, evidence, first_seen_at, last_seen_at)
       SELECT $1, $2, f, t, k, v, a, e, s, s FROM input ORDER BY f, t
       ON CONFLICT (environment_id, source_id, from_name, to_name) DO UPDATE
         SET last_seen_at = GREATEST(te.last_seen_at, EXCLUDED.last_seen_at),
             evidence = ARRAY(SELECT DISTINCT x FROM unnest(te.evidence || EXCLUDED.evidence) x ORDER BY x),
             to_kind = CASE WHEN te.to_kind = 'service' THEN EXCLUDED.to_kind ELSE te.to_kind END,
             via = COALESCE(te.via, EXCLUDED.via),
             async = te.async OR EXCLUDED.async
       RETURNING id, from_name, to_name, xmax = 0 AS inserted
     ), buckets AS (
       INSERT INTO trace_edge_buckets AS tb (edge_id, bucket, calls, errors, durations)
       SELECT edges.id, i.b, i.c, i.x, i.h FROM input i JOIN edges ON edges.from_name = i.f AND edges.to_name = i.t ORDER BY i.f, i.t
       ON CONFLICT (edge_id, bucket) DO UPDATE
         SET calls = tb.calls + EXCLUDED.calls, errors = tb.errors + EXCLUDED.errors,
             durations = pinchpoint_histogram_add(tb.durations, EXCLUDED.durations)
       RETURNING 1
     )
     SELECT (SELECT count(*) FROM edges WHERE inserted) AS inserted, (SELECT count(*) FROM buckets) AS written`,
    { type: QueryTypes.SELECT, bind: [environmentId, sourceId, JSON.stringify(rows)], transaction },
  );
  const inserted = Number(result?.inserted ?? 0);
  if (inserted > 0) {
    await db().sequelize.query(
      `INSERT INTO trace_state (environment_id, edges_changed_at) VALUES ($1, now())
       ON CONFLICT (environment_id) DO UPDATE SET edges_changed_at = now()`,
      { bind: [environmentId], transaction },
    );
  }
  return inserted;
}

// ---------------------------------------------------------------------------------------------
// Receiver

const holder = globalThis as unknown as { __pinchpointTraceIds?: Map<string, RecentSpanIds>; __pinchpointTraceSources?: Map<string, string> };
const recentIds = (holder.__pinchpointTraceIds ??= new Map());
const sourceIds = (holder.__pinchpointTraceSources ??= new Map());

function memoryOf(environmentId: string): RecentSpanIds {
  let m = recentIds.get(environmentId);
  if (!m) {
    m = new RecentSpanIds();
    recentIds.set(environmentId, m);
  }
  return m;
}

async function sourceIdFor({ environmentId, name }: { environmentId: string; name: string }, transaction?: Transaction): Promise<string> {
  const cacheKey = `${environmentId}/${name}`;
  const cached = sourceIds.get(cacheKey);
  if (cached) return cached;
  const [row] = await db().models.Source.findOrCreate({
    where: { environmentId, name },
    defaults: { environmentId, name, lastFormat: "otlp", lastPushAt: new Date() },
    transaction,
  });
  // Only cache what is committed: inside a transaction the row may yet roll back.
  if (!transaction) sourceIds.set(cacheKey, row.id);
  return row.id;
}

interface WaitingCallJson {
  f: Callee | null;
  v: string | null;
  d: number;
  x: boolean;
}

/** Pair this request's unpaired halves with halves other requests left waiting; park the rest. */
async function pairWithWaiting({ environmentId, sourceId, fold }: { environmentId: string; sourceId: string; fold: TraceFold }, transaction: Transaction): Promise<void> {
  const { clients, servers } = fold.takeWaiting();
  const { sequelize } = db();
  if (servers.length > 0) {
    const input = JSON.stringify(servers.map((s) => ({ tr: s.traceId, sp: s.parentSpanId, svc: s.callee })));
    const claimed = await sequelize.query<{ trace_id: string; span_id: string; service: string; call: WaitingCallJson; callee: string }>(
      `DELETE FROM trace_waiting w USING jsonb_to_recordset($2::jsonb) AS i(tr text, sp text, svc text)
        WHERE w.environment_id = $1 AND w.side = 'c' AND w.trace_id = i.tr AND w.span_id = i.sp
        RETURNING w.trace_id, w.span_id, w.service, w.call, i.svc AS callee`,
      { type: QueryTypes.SELECT, bind: [environmentId, input], transaction },
    );
    const paired = new Set<string>();
    for (const c of claimed) {
      fold.join(waitingClientOf(c), c.callee);
      paired.add(`${c.trace_id}/${c.span_id}`);
    }
    const rest = servers.filter((s) => !paired.has(`${s.traceId}/${s.parentSpanId}`));
    if (rest.length > 0) {
      await sequelize.query(
        `INSERT INTO trace_waiting (environment_id, source_id, side, trace_id, span_id, service)
         SELECT $1, $2, 's', i.tr, i.sp, i.svc FROM jsonb_to_recordset($3::jsonb) AS i(tr text, sp text, svc text)
         ORDER BY i.tr, i.sp ON CONFLICT DO NOTHING`,
        { bind: [environmentId, sourceId, JSON.stringify(rest.map((s) => ({ tr: s.traceId, sp: s.parentSpanId, svc: s.callee })))], transaction },
      );
    }
  }
  if (clients.length > 0) {
    const claimed = await sequelize.query<{ trace_id: string; span_id: string; service: string }>(
      `DELETE FROM trace_waiting w USING jsonb_to_recordset($2::jsonb) AS i(tr text, sp text)
        WHERE w.environment_id = $1 AND w.side = 's' AND w.trace_id = i.tr AND w.span_id = i.sp
        RETURNING w.trace_id, w.span_id, w.service`,
      { type: QueryTypes.SELECT, bind: [environmentId, JSON.stringify(clients.map((c) => ({ tr: c.traceId, sp: c.spanId })))], transaction },
    );
    const callee = new Map(claimed.map((c) => [`${c.trace_id}/${c.span_id}`, c.service]));
    const rest: WaitingClient[] = [];
    for (const c of clients) {
      const s = callee.get(`${c.traceId}/${c.spanId}`);
      if (s !== undefined) fold.join(c, s);
      else rest.push(c);
    }
    if (rest.length > 0) {
      await sequelize.query(
        `INSERT INTO trace_waiting (environment_id, source_id, side, trace_id, span_id, service, call)
         SELECT $1, $2, 'c', i.tr, i.sp, i.svc, i.call FROM jsonb_to_recordset($3::jsonb) AS i(tr text, sp text, svc text, call jsonb)
         ORDER BY i.tr, i.sp ON CONFLICT DO NOTHING`,
        {
          bind: [
            environmentId,
            sourceId,
            JSON.stringify(rest.map((c) => ({ tr: c.traceId, sp: c.spanId, svc: c.caller, call: { f: c.fallback, v: c.via, d: c.durationNs, x: c.error } satisfies WaitingCallJson }))),
          ],
          transaction,
        },
      );
    }
  }
}

function waitingClientOf(row: { trace_id: string; span_id: string; service: string; call: WaitingCallJson }): WaitingClient {
  return { traceId: row.trace_id, spanId: row.span_id, caller: row.service, fallback: row.call.f, via: row.call.v, durationNs: row.call.d, error: row.call.x };
}

// Group commit: requests of one environment that arrive while its previous transaction is running
// are stored together in the next one, each answered once that transaction commits. Busy exporters
// send several requests at once (OTLP/HTTP Concurrent Requests); they all touch the same edge rows,
// so one transaction for all of them does the row work once instead of queueing on row locks.
interface PendingFold {
  sourceId: string;
  fold: TraceFold;
  at: Date;
  done: (error?: unknown) => void;
}
const holderQueues = globalThis as unknown as { __pinchpointTraceQueues?: Map<string, { pending: PendingFold[]; running: boolean }> };
const queues = (holderQueues.__pinchpointTraceQueues ??= new Map());

function commitFold({ environmentId, sourceId, fold, at }: { environmentId: string; sourceId: string; fold: TraceFold; at: Date }): Promise<void> {
  let q = queues.get(environmentId);
  if (!q) {
    q = { pending: [], running: false };
    queues.set(environmentId, q);
  }
  const queue = q;
  const stored = new Promise<void>((resolve, reject) => queue.pending.push({ sourceId, fold, at, done: (error?: unknown) => (error === undefined ? resolve() : reject(error)) }));
  if (!queue.running) void drainQueue(environmentId, queue);
  return stored;
}

async function drainQueue(environmentId: string, queue: { pending: PendingFold[]; running: boolean }): Promise<void> {
  queue.running = true;
  try {
    while (queue.pending.length > 0) {
      const batch = queue.pending.splice(0);
      try {
        await db().sequelize.transaction(async (transaction) => {
          // Halves of one call may sit in two requests of this batch: the second finds the first waiting.
          for (const p of batch) await pairWithWaiting({ environmentId, sourceId: p.sourceId, fold: p.fold }, transaction);
          const bySource = new Map<string, { fold: TraceFold; at: Date }>();
          for (const p of batch) {
            const into = bySource.get(p.sourceId);
            if (!into) bySource.set(p.sourceId, { fold: p.fold, at: p.at });
            else {
              into.fold.absorb(p.fold);
              if (p.at > into.at) into.at = p.at;
            }
          }
          for (const [sourceId, { fold, at }] of bySource) await storeFold({ environmentId, sourceId, fold, at }, transaction);
        });
        for (const p of batch) p.done();
      } catch (error) {
        for (const p of batch) p.done(error);
      }
    }
  } finally {
    queue.running = false;
  }
}

export interface ReceiveResult {
  /** spans refused, with one English sentence per reason (the OTLP partial success) */
  rejected: RejectedSpans;
  duplicates: number;
  calls: number;
}

/**
 * One OTLP export request's spans into the environment's aggregates. The environment is created on
 * a first export by an admin or an unbound token, as a first push would; a token bound to a source
 * writes as that source, any other caller as RECEIVER_SOURCE.
 */
export async function receiveTraces({
  environment,
  actor,
  spans,
  rejected,
  now = new Date(),
}: {
  environment: string;
  actor: PushActor;
  spans: TraceSpan[];
  rejected: RejectedSpans;
  now?: Date;
}): Promise<ReceiveResult> {
  const source = actor.type === "token" && actor.sourceName ? actor.sourceName : RECEIVER_SOURCE;
  // withPermission already refused a token bound to another environment; a missing environment is
  // created here under the push's rules (admins and unbound tokens only), or is a 404.
  const env = (await findEnvironment({ slug: environment })) ?? (await db().sequelize.transaction((t) => lockEnvironment({ environment, actor }, source, t)));
  const environmentId = env.id;
  const memory = memoryOf(environmentId);
  const fold = new TraceFold(memory);
  fold.add(spans);
  if (spans.length > 0) {
    const sourceId = await sourceIdFor({ environmentId, name: source });
    await commitFold({ environmentId, sourceId, fold, at: now });
  }
  // Remembered only once stored: a request that failed may be sent again and must count then.
  for (let i = 0; i < fold.accepted.length; i += 2) memory.addHash(fold.accepted[i]!, fold.accepted[i + 1]!);
  return { rejected, duplicates: fold.stats.duplicates, calls: fold.stats.calls };
}

/**
 * The worker's sweep: clients that waited GRACE_SECONDS are counted on their attributes (or on a
 * server half that arrived meanwhile in a concurrent request); servers that waited as long are dropped.
 */
export async function sweepWaitingCalls({ graceSeconds = GRACE_SECONDS, now = new Date() }: { graceSeconds?: number; now?: Date } = {}): Promise<number> {
  const { sequelize } = db();
  return sequelize.transaction(async (transaction) => {
    const cutoff = new Date(now.getTime() - graceSeconds * 1000);
    const expired = await sequelize.query<{ environment_id: string; source_id: string; trace_id: string; span_id: string; service: string; call: WaitingCallJson; callee: string | null }>(
      `WITH expired AS (
         DELETE FROM trace_waiting WHERE side = 'c' AND received_at <= $1 RETURNING *
       ), paired AS (
         DELETE FROM trace_waiting s USING expired e
          WHERE s.environment_id = e.environment_id AND s.side = 's' AND s.trace_id = e.trace_id AND s.span_id = e.span_id
          RETURNING s.environment_id, s.trace_id, s.span_id, s.service
       )
       SELECT e.environment_id, e.source_id, e.trace_id, e.span_id, e.service, e.call, p.service AS callee
         FROM expired e LEFT JOIN paired p ON p.environment_id = e.environment_id AND p.trace_id = e.trace_id AND p.span_id = e.span_id`,
      { type: QueryTypes.SELECT, bind: [cutoff], transaction },
    );
    await sequelize.query("DELETE FROM trace_waiting WHERE side = 's' AND received_at <= $1", { bind: [cutoff], transaction });
    const folds = new Map<string, { environmentId: string; sourceId: string; fold: TraceFold }>();
    for (const row of expired) {
      const k = `${row.environment_id}/${row.source_id}`;
      let f = folds.get(k);
      if (!f) {
        f = { environmentId: row.environment_id, sourceId: row.source_id, fold: new TraceFold() };
        folds.set(k, f);
      }
      const client = waitingClientOf(row);
      if (row.callee !== null) f.fold.join(client, row.callee);
      else f.fold.settle(client);
    }
    for (const f of folds.values()) await storeFold({ ...f, at: now }, transaction);
    return expired.length;
  });
}

/** Drop buckets older than every environment's window and edges not seen within their environment's window. */
async function pruneTraceAggregates({ now = new Date() }: { now?: Date } = {}): Promise<void> {
  const { sequelize } = db();
  await sequelize.query(
    `DELETE FROM trace_edge_buckets b USING trace_edges e, environments env
      WHERE b.edge_id = e.id AND env.id = e.environment_id
        AND b.bucket < $1::timestamptz - make_interval(days => COALESCE((env.settings->>'traceWindowDays')::int, 7)) - interval '1 hour'`,
    { bind: [now] },
  );
  await sequelize.query(
    `DELETE FROM trace_edges e USING environments env
      WHERE env.id = e.environment_id
        AND e.last_seen_at < $1::timestamptz - make_interval(days => COALESCE((env.settings->>'traceWindowDays')::int, 7))`,
    { bind: [now] },
  );
}

// ---------------------------------------------------------------------------------------------
// Trace files

export interface TraceFileInput {
  environment: string;
  source: string | null;
  chunks: AsyncIterable<Uint8Array>;
  dryRun: boolean;
  actor: PushActor;
}

/**
 * POST …/inventory?format=otlp&source=…: the file is streamed and folded (nothing of it is kept),
 * then replaces the source's aggregates in one transaction with the graph step, like any push: all
 * or nothing, and a bad line anywhere changes nothing.
 */
export async function pushTraceFile(input: TraceFileInput): Promise<PushResult> {
  if (!input.source) throw new AppError("invalid_request", "The otlp format needs ?source=<name>: the file does not say who sent it");
  if (!SOURCE_PATTERN.test(input.source)) throw new AppError("invalid_request", "Invalid query", [{ path: "query.source", message: "must be a source name" }]);
  const source = input.source;
  const fold = new TraceFold();
  const rejected = noRejects();
  let documents = 0;
  try {
    let pending: TraceDocument | null = null;
    for await (const doc of traceDocuments(input.chunks)) {
      // Locate issues by line once a second document shows the file is JSON Lines.
      if (pending) {
        foldTraceDocument(fold, pending, rejected, { lines: true });
        pending = null;
      }
      if (documents === 0) pending = doc;
      else foldTraceDocument(fold, doc, rejected, { lines: true });
      documents += 1;
    }
    if (pending) foldTraceDocument(fold, pending, rejected, { lines: false });
  } catch (error) {
    if (error instanceof TraceFileError) {
      throw new AppError(error.status === 413 ? "payload_too_large" : "invalid_inventory", error.status === 413 ? "The trace file is over a limit" : "The trace file has errors; nothing was changed", error.issues);
    }
    throw error;
  }
  fold.finish();
  const warnings: InventoryIssue[] = foldWarnings(fold.stats, rejected);
  const { sequelize } = db();
  class DryRun extends Error {
    constructor(readonly result: PushResult) {
      super("dry run");
    }
  }
  try {
    return await sequelize.transaction(async (transaction) => {
      const env = await lockEnvironment({ environment: input.environment, actor: input.actor }, source, transaction);
      const sourceId = await sourceIdFor({ environmentId: env.id, name: source }, transaction);
      const before = await sequelize.query<{ n: string }>("SELECT count(*) AS n FROM trace_edges WHERE source_id = $1", { type: QueryTypes.SELECT, bind: [sourceId], transaction });
      await sequelize.query("DELETE FROM trace_edges WHERE source_id = $1", { bind: [sourceId], transaction });
      await storeFold({ environmentId: env.id, sourceId, fold, at: new Date() }, transaction);
      // A file may remove edges as well as add them: the graph step compares sets, not just new rows.
      const graph = await materialiseObservedGraph({ environmentId: env.id }, transaction);
      await db().models.Source.update({ lastFormat: "otlp", lastPushAt: new Date() }, { where: { id: sourceId }, transaction });
      await db().models.ImportRecord.create(
        {
          environmentId: env.id,
          sourceName: source,
          format: "otlp",
          actorLabel: input.actor.label,
          graphChanged: graph.changed,
          snapshotNumber: graph.snapshot?.number ?? null,
          summary: { observedEdges: fold.edges.size, spans: fold.stats.spans, calls: fold.stats.calls },
          warnings,
        },
        { transaction },
      );
      await recordAudit(
        {
          actor: input.actor,
          action: "traces.push",
          targetType: "source",
          targetId: `${env.slug}/${source}`,
          environmentId: env.id,
          before: { observedEdges: Number(before[0]?.n ?? 0) },
          after: { observedEdges: fold.edges.size, spans: fold.stats.spans, calls: fold.stats.calls, snapshot: graph.snapshot?.number ?? null },
        },
        transaction,
      );
      const result: PushResult = {
        changed: graph.changed,
        dryRun: input.dryRun,
        snapshot: input.dryRun ? null : graph.snapshot,
        diff: graph.diff,
        warnings,
        observed: { edges: fold.edges.size, spans: fold.stats.spans, calls: fold.stats.calls, duplicates: fold.stats.duplicates },
      };
      if (input.dryRun) throw new DryRun(result);
      return result;
    });
  } catch (error) {
    if (error instanceof DryRun) return error.result;
    throw error;
  }
}

let lastPrune = 0;

/**
 * One turn of trace upkeep for the worker: count calls whose other half never came, take changed
 * observed sets into the graph, and (hourly) drop aggregates older than the windows.
 */
export async function runTraceUpkeep({ now = new Date() }: { now?: Date } = {}): Promise<{ swept: number; materialised: number }> {
  const swept = await sweepWaitingCalls({ now });
  const materialised = await materialiseChangedEnvironments({ now });
  if (now.getTime() - lastPrune >= 3_600_000) {
    lastPrune = now.getTime();
    await pruneTraceAggregates({ now });
  }
  return { swept, materialised };
}
