// OpenTelemetry traces (OTLP/JSON) → observed edges, never declared components: what telemetry
// saw is kept apart from what teams declared so drift can be shown.
//   - a span whose parent span (same traceId) ran in another service.name gives
//     parent-service → child-service, evidence "span-parent";
//   - a CLIENT span (kind 3 or "SPAN_KIND_CLIENT") with `peer.service` gives
//     service → peer.service, evidence "peer.service"; failing that, with `db.system`,
//     service → the db.system value (e.g. "postgresql"), evidence "db.system".
//     db.name / server.address are not used: they name databases and hosts, which seldom
//     match component keys, whereas peer.service is the attribute meant to name a service.
// One client call often yields both a peer.service edge and a span-parent edge to the
// server span; they are kept as separate evidence, each with its own count.
// Keys are normalised: lower-cased, characters outside a-z 0-9 . _ - become "-", leading
// characters that are not a letter or digit dropped, cut to 128 ("Checkout API" → "checkout-api").
// Spans with no service.name, and parents outside the file, give no edge (reported as warnings).
import type { ImportResult, InventoryIssue, ObservedEdge } from "@/lib/inventory/types";
import { KEY_PATTERN } from "@/lib/inventory/types";
import { checkedText } from "../shared/body";
import { checkOrigin } from "../shared/origin";
import { loadStructured } from "../shared/structured";
import { finishIssues } from "../shared/text";
import { mapZodIssues } from "../shared/zod-issues";
import { type KeyValue, TraceRequestSchema } from "./schema";

const SPAN_KIND_CLIENT = 3;

export interface OtlpOptions {
  body: string | Uint8Array;
  source?: string;
  environment?: string;
}

export function importOtlp(opts: OtlpOptions): ImportResult {
  const text = checkedText(opts.body);
  if (!text.ok) return text;
  return parseOtlp({ ...opts, text: text.text });
}

export function normaliseKey(raw: string): string | null {
  const key = raw
    .toLowerCase()
    .replace(/[^a-z0-9._-]/g, "-")
    .replace(/^[^a-z0-9]+/, "")
    .slice(0, 128);
  return KEY_PATTERN.test(key) ? key : null;
}

function attr(attributes: readonly KeyValue[] | undefined, name: string): string | undefined {
  return attributes?.find((a) => a.key === name)?.value?.stringValue;
}

export function parseOtlp(opts: Omit<OtlpOptions, "body"> & { text: string }): ImportResult {
  const origin = checkOrigin(opts);
  const loaded = loadStructured(opts.text, { json: true });
  if (!loaded.ok) return { ok: false, status: loaded.status, issues: finishIssues([...origin.issues, ...loaded.issues]) };
  const parsed = TraceRequestSchema.safeParse(loaded.source.value);
  if (!parsed.success || origin.source === null) {
    const issues = [...origin.issues, ...(parsed.success ? [] : mapZodIssues(parsed.error.issues, loaded.source))];
    return { ok: false, status: 422, issues: finishIssues(issues) };
  }

  const warnings: InventoryIssue[] = [];
  // First pass: which service ran each span, so parents later in the file still resolve.
  const serviceOfSpan = new Map<string, string>();
  let unnamed = 0;
  const spans: { service: string; id: string; parent: string | null; client: boolean; peer: string | undefined; db: string | undefined }[] = [];
  parsed.data.resourceSpans.forEach((rs, r) => {
    const rawName = attr(rs.resource?.attributes, "service.name");
    const service = rawName === undefined ? null : normaliseKey(rawName);
    if (rawName !== undefined && service === null) {
      warnings.push({ path: `resourceSpans[${r}].resource`, message: `service.name ${JSON.stringify(rawName)} gives no usable key; its spans are skipped` });
    }
    for (const scope of [...(rs.scopeSpans ?? []), ...(rs.instrumentationLibrarySpans ?? [])]) {
      for (const span of scope.spans ?? []) {
        if (service === null) {
          unnamed += 1;
          continue;
        }
        const id = `${span.traceId.toLowerCase()}/${span.spanId.toLowerCase()}`;
        serviceOfSpan.set(id, service);
        const parent = span.parentSpanId ? `${span.traceId.toLowerCase()}/${span.parentSpanId.toLowerCase()}` : null;
        const client = span.kind === SPAN_KIND_CLIENT || span.kind === "SPAN_KIND_CLIENT";
        spans.push({ service, id, parent, client, peer: attr(span.attributes, "peer.service"), db: attr(span.attributes, "db.system") });
      }
    }
  });
  if (unnamed > 0) warnings.push({ path: "resourceSpans", message: `${unnamed} spans have no usable service.name and were skipped` });

  const edges = new Map<string, ObservedEdge>();
  const add = (from: string, to: string, evidence: string): void => {
    if (from === to) return;
    const id = `${from}\u0000${to}\u0000${evidence}`;
    const e = edges.get(id);
    if (e) e.count += 1;
    else edges.set(id, { from, to, count: 1, evidence });
  };
  let orphans = 0;
  for (const s of spans) {
    if (s.parent !== null) {
      const parentService = serviceOfSpan.get(s.parent);
      if (parentService === undefined) orphans += 1;
      else add(parentService, s.service, "span-parent");
    }
    if (!s.client) continue;
    const peer = s.peer !== undefined ? normaliseKey(s.peer) : null;
    const db = s.db !== undefined ? normaliseKey(s.db) : null;
    if (peer !== null) add(s.service, peer, "peer.service");
    else if (db !== null) add(s.service, db, "db.system");
  }
  if (orphans > 0) warnings.push({ path: "resourceSpans", message: `${orphans} spans have a parent span not in this file; no edge taken from them` });

  const cmp = (x: string, y: string): number => (x < y ? -1 : x > y ? 1 : 0);
  const observedEdges = [...edges.values()].sort((a, b) => cmp(a.from, b.from) || cmp(a.to, b.to) || cmp(a.evidence, b.evidence));
  return {
    ok: true,
    inventory: { source: origin.source, environment: origin.environment, components: [], observedEdges, warnings },
  };
}
