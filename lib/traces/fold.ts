// Spans → calls → edge aggregates, in one pass over each batch and without keeping a span.
// A call is counted on the span that makes it (lib/traces/semconv.ts has the naming rules):
//   - a CLIENT span: caller = its service; callee = the service of its SERVER child when that child
//     is known (this batch, an earlier batch of the same fold, or — in the receiver — a child held in
//     PostgreSQL from another request), else what its attributes name. Until a child could still
//     come, the call waits (`waiting()`); the receiver keeps waiting calls for a grace period;
//   - a database CLIENT span is counted at once: database servers send no spans to wait for;
//   - a PRODUCER span, or a CLIENT/CONSUMER span of a messaging system: service → destination,
//     asynchronous (never producer → consumer);
//   - a SERVER span whose parent in the same batch is not a CLIENT/PRODUCER but ran in another
//     service (context propagated by hand, no client instrumentation): parent service → this one.
// Each (trace id, span id) counts once: repeats within the fold and ids in `memory` (spans stored
// by earlier requests) are skipped. Duration and error come from the span that makes the call: the
// caller's view, what a user of that call experienced.
import { merge, record, type Histogram } from "./histogram";
import { calleeFromAttributes, isDatabaseCall, isMessaging, messagingDestination, normaliseKey, protocolOf, type Callee, type CalleeKind, type Evidence } from "./semconv";
import { lastHash, spanHash, SpanIdSet, SpanIndex, type SpanIdMemory } from "./seen";
import { SPAN_KIND, type TraceSpan } from "./types";

export interface EdgeAggregate {
  from: string;
  to: string;
  toKind: CalleeKind;
  via: string | null;
  async: boolean;
  evidence: Set<Evidence>;
  calls: number;
  errors: number;
  histogram: Histogram;
}

/** A CLIENT span whose SERVER child has not been seen yet. */
export interface WaitingClient {
  traceId: string;
  spanId: string;
  caller: string;
  /** What its attributes name, used when no child turns up. */
  fallback: Callee | null;
  via: string | null;
  durationNs: number;
  error: boolean;
}

/** A SERVER span whose parent has not been seen yet (its caller may send it later). */
export interface WaitingServer {
  traceId: string;
  parentSpanId: string;
  spanId: string;
  callee: string;
}

export interface FoldStats {
  /** spans taken in (after repeats were dropped) */
  spans: number;
  /** spans dropped as repeats of a (trace id, span id) already counted */
  duplicates: number;
  /** spans whose service.name gives no usable component key */
  unnamed: number;
  /** calls counted into edges */
  calls: number;
  /** client, producer and consumer spans whose callee nothing names */
  unresolved: number;
  /** server spans whose caller never turned up */
  orphans: number;
}

const KIND_RANK: Record<CalleeKind, number> = { service: 0, datastore: 1, queue: 1 };

export class TraceFold {
  readonly edges = new Map<string, EdgeAggregate>();
  readonly stats: FoldStats = { spans: 0, duplicates: 0, unnamed: 0, calls: 0, unresolved: 0, orphans: 0 };
  /** 64-bit hashes (hi, lo, hi, lo, …) of the ids taken in, for the caller to remember once the fold is stored */
  readonly accepted: number[] = [];
  private readonly ids = new SpanIdSet();
  private readonly clients = new Map<string, WaitingClient>();
  private readonly servers = new Map<string, WaitingServer>();
  private readonly keys = new Map<string, string | null>();

  constructor(private readonly memory?: SpanIdMemory) {}

  private keyOf(service: string): string | null {
    let k = this.keys.get(service);
    if (k === undefined) {
      k = normaliseKey(service);
      this.keys.set(service, k);
    }
    return k;
  }

  /** Count one call (positional: this runs once a span on a million spans). */
  addCall(from: string, to: string, kind: CalleeKind, via: string | null, async: boolean, evidence: Evidence, durationNs: number, error: boolean): void {
    if (from === to) return;
    const id = `${from}\u0000${to}`;
    let e = this.edges.get(id);
    if (!e) {
      e = { from, to, toKind: kind, via, async, evidence: new Set(), calls: 0, errors: 0, histogram: new Map() };
      this.edges.set(id, e);
    }
    if (KIND_RANK[kind] > KIND_RANK[e.toKind]) e.toKind = kind;
    e.via ??= via;
    e.async ||= async;
    e.evidence.add(evidence);
    e.calls += 1;
    if (error) e.errors += 1;
    record(e.histogram, durationNs);
    this.stats.calls += 1;
  }

  /** Add another fold's edges to this one's (requests stored in one transaction). */
  absorb(other: TraceFold): void {
    for (const [id, e] of other.edges) {
      const mine = this.edges.get(id);
      if (!mine) {
        this.edges.set(id, { ...e, evidence: new Set(e.evidence), histogram: new Map(e.histogram) });
        continue;
      }
      if (KIND_RANK[e.toKind] > KIND_RANK[mine.toKind]) mine.toKind = e.toKind;
      mine.via ??= e.via;
      mine.async ||= e.async;
      for (const x of e.evidence) mine.evidence.add(x);
      mine.calls += e.calls;
      mine.errors += e.errors;
      merge(mine.histogram, e.histogram);
    }
  }

  /** A waiting client met its SERVER child (here or in another request). */
  join(client: WaitingClient, callee: string): void {
    // A call into the same service (in-process loopback) is no dependency.
    if (callee === client.caller) return;
    this.addCall(client.caller, callee, "service", client.via, false, "child-span", client.durationNs, client.error);
  }

  /** No child will come: count the call on what its attributes name, if anything. */
  settle(client: WaitingClient): void {
    const f = client.fallback;
    if (f === null) this.stats.unresolved += 1;
    else this.addCall(client.caller, f.name, f.kind, f.via ?? client.via, false, f.evidence, client.durationNs, client.error);
  }

  add(spans: readonly TraceSpan[]): void {
    // Pass 1: drop repeats, name services, and index this batch by 64-bit id hashes: SERVER
    // children by their parent's id, and spans that may be the non-client parent of a SERVER span
    // by their own. Parallel arrays and typed-array indexes, not an object or id string a span:
    // this runs on every span of every request.
    const n = spans.length;
    const kept = new Int32Array(n);
    const services: string[] = [];
    const selfHi = new Uint32Array(n);
    const selfLo = new Uint32Array(n);
    const parentHi = new Uint32Array(n);
    const parentLo = new Uint32Array(n);
    const childOf = new SpanIndex(n);
    const parents = new SpanIndex(n);
    let count = 0;
    for (let i = 0; i < n; i++) {
      const span = spans[i]!;
      spanHash(span.traceId, span.spanId);
      const hi = lastHash.hi;
      const lo = lastHash.lo;
      if (this.memory?.hasHash(hi, lo) || !this.ids.addHash(hi, lo)) {
        this.stats.duplicates += 1;
        continue;
      }
      if (this.memory) this.accepted.push(hi, lo);
      const service = this.keyOf(span.service);
      if (service === null) {
        this.stats.unnamed += 1;
        continue;
      }
      this.stats.spans += 1;
      const at = count++;
      kept[at] = i;
      services.push(service);
      selfHi[at] = hi;
      selfLo[at] = lo;
      const kind = span.kind;
      if (kind === SPAN_KIND.server && span.parentSpanId !== null) {
        spanHash(span.traceId, span.parentSpanId);
        parentHi[at] = lastHash.hi;
        parentLo[at] = lastHash.lo;
        childOf.setIfAbsent(lastHash.hi, lastHash.lo, at);
      }
      if (kind !== SPAN_KIND.client && kind !== SPAN_KIND.producer) parents.setIfAbsent(hi, lo, at);
    }

    // Pass 2: count the calls of client, producer and consumer spans, pairing clients with children.
    const paired = new Uint8Array(count);
    for (let at = 0; at < count; at++) {
      const span = spans[kept[at]!]!;
      const kind = span.kind;
      if (kind === SPAN_KIND.server || kind === SPAN_KIND.internal || kind === SPAN_KIND.unspecified) continue;
      const service = services[at]!;
      const a = span.attrs;
      if (isMessaging(a)) {
        const dest = messagingDestination(a);
        if (dest) this.addCall(service, dest.name, dest.kind, dest.via, true, dest.evidence, span.durationNs, span.error);
        else this.stats.unresolved += 1;
        continue;
      }
      if (kind === SPAN_KIND.producer) {
        // A hand-off without messaging attributes: whatever its attributes name is the broker.
        const broker = calleeFromAttributes(a);
        if (broker) this.addCall(service, broker.name, "queue", broker.via, true, broker.evidence, span.durationNs, span.error);
        else this.stats.unresolved += 1;
        continue;
      }
      if (kind !== SPAN_KIND.client) continue;
      const child = childOf.get(selfHi[at]!, selfLo[at]!);
      if (child >= 0) {
        paired[child] = 1;
        const callee = services[child]!;
        if (callee !== service) this.addCall(service, callee, "service", protocolOf(a), false, "child-span", span.durationNs, span.error);
        continue;
      }
      const id = `${span.traceId}/${span.spanId}`;
      const client: WaitingClient = { traceId: span.traceId, spanId: span.spanId, caller: service, fallback: calleeFromAttributes(a), via: protocolOf(a), durationNs: span.durationNs, error: span.error };
      const earlier = this.servers.get(id);
      if (earlier) {
        this.servers.delete(id);
        this.join(client, earlier.callee);
      } else if (isDatabaseCall(a)) this.settle(client);
      else this.clients.set(id, client);
    }

    // Pass 3: SERVER spans no client of this batch claimed.
    for (let at = 0; at < count; at++) {
      if (paired[at] === 1 || parentHi[at] === 0) continue;
      const span = spans[kept[at]!]!;
      const service = services[at]!;
      const parent = parents.get(parentHi[at]!, parentLo[at]!);
      if (parent >= 0) {
        // Its parent ran here without a CLIENT span (context propagated by hand).
        const parentService = services[parent]!;
        if (parentService !== service) this.addCall(parentService, service, "service", protocolOf(span.attrs), false, "parent-span", span.durationNs, span.error);
        continue;
      }
      const parentKey = `${span.traceId}/${span.parentSpanId}`;
      const waiting = this.clients.get(parentKey);
      if (waiting) {
        this.clients.delete(parentKey);
        this.join(waiting, service);
        continue;
      }
      if (!this.servers.has(parentKey)) this.servers.set(parentKey, { traceId: span.traceId, parentSpanId: span.parentSpanId!, spanId: span.spanId, callee: service });
    }
  }

  /** What still waits for its other half; the receiver stores it and the fold forgets it. */
  takeWaiting(): { clients: WaitingClient[]; servers: WaitingServer[] } {
    const out = { clients: [...this.clients.values()], servers: [...this.servers.values()] };
    this.clients.clear();
    this.servers.clear();
    return out;
  }

  /** The end of a file: no other half will come. Clients count on their attributes; servers stay orphans. */
  finish(): void {
    for (const c of this.clients.values()) this.settle(c);
    this.stats.orphans += this.servers.size;
    this.clients.clear();
    this.servers.clear();
  }
}
