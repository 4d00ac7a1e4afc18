// OTLP trace requests (JSON or binary protobuf) → TraceSpan. Two kinds of trouble are told apart,
// as the OTLP specification does ("OTLP/HTTP Response"): data that cannot be decoded at all (a
// wrong type where the schema has a string, bytes that are not protobuf) is a bad request, located
// by path; spans that decode but cannot be used (an id that is not 16/8 bytes or is all zeroes, no
// service.name on their resource) are counted as rejected, so the rest of the request still counts.
//
// The envelope goes through zod; spans are checked by the walk below, field by field, because a
// zod parse of every span costs as much again as JSON.parse itself on a million spans (npm run bench)
// and the walk checks the same types with the same located paths.
import { z } from "zod";
import type { InventoryIssue } from "@/lib/inventory/types";
import {
  ATTRIBUTE_KEYS,
  DEPRECATED_KEYS,
  reject,
  SPAN_KIND,
  STATUS_CODE_ERROR,
  type CalleeAttributes,
  type RejectedSpans,
  type TraceSpan,
} from "@/lib/traces/types";
import protobuf from "protobufjs";

export type DecodeResult = { ok: true; spans: TraceSpan[]; rejected: RejectedSpans } | { ok: false; issues: InventoryIssue[] };

const ScopeSpansSchema = z.looseObject({ spans: z.array(z.unknown(), { error: "spans must be an array" }).nullish() });
const ResourceSpansSchema = z.looseObject({
  resource: z.looseObject({ attributes: z.array(z.unknown(), { error: "attributes must be an array" }).nullish() }).nullish(),
  scopeSpans: z.array(ScopeSpansSchema, { error: "scopeSpans must be an array" }).nullish(),
  // The name before OTLP 0.15 (2022; field 1000, now reserved); files written then still have it.
  instrumentationLibrarySpans: z.array(ScopeSpansSchema).nullish(),
});
/** An empty request (`{}`) is valid OTLP: "If the server receives an empty request … respond with success". */
const RequestSchema = z.looseObject({ resourceSpans: z.array(ResourceSpansSchema, { error: "resourceSpans must be an array" }).nullish() });
/** Files must say what they are: a JSON document without resourceSpans is some other file. */
const FileRequestSchema = z.looseObject({
  resourceSpans: z.array(ResourceSpansSchema, { error: "expected an OTLP/JSON ExportTraceServiceRequest with resourceSpans" }),
});

const SPAN_KIND_NAMES: Record<string, number> = {
  SPAN_KIND_UNSPECIFIED: 0,
  SPAN_KIND_INTERNAL: 1,
  SPAN_KIND_SERVER: 2,
  SPAN_KIND_CLIENT: 3,
  SPAN_KIND_PRODUCER: 4,
  SPAN_KIND_CONSUMER: 5,
};

const HEX = /^[0-9a-fA-F]+$/;
const ZEROES = /^0+$/;

/**
 * OTLP/JSON ids are "case-insensitive hex-encoded strings" (OTLP specification, "JSON Protobuf
 * Encoding"): hex is lower-cased so `5B8E…` and `5b8e…` are one span. Anything else (base64 from
 * the plain protobuf JSON mapping) is case-sensitive, so it is kept exactly as written.
 * Returns null for an id the specification calls invalid (wrong length, all zeroes, empty).
 */
function canonicalId(raw: string, bytes: 16 | 8): string | null {
  if (raw.length === 0) return null;
  if (!HEX.test(raw)) return raw;
  if (raw.length !== bytes * 2 || ZEROES.test(raw)) return null;
  return raw.toLowerCase();
}

const kindOf = (k: unknown): number => (typeof k === "number" && k >= 0 && k <= 5 ? k : typeof k === "string" ? (SPAN_KIND_NAMES[k] ?? 0) : 0);

/** Set one attribute that names a callee; a deprecated name never overrides its successor. */
function setAttribute(out: CalleeAttributes, key: string, stringValue: unknown, boolValue: unknown): void {
  const field = ATTRIBUTE_KEYS[key];
  if (field === undefined) return;
  if (field === "messagingDestinationTemporary") {
    if (boolValue === true) out.messagingDestinationTemporary = true;
    return;
  }
  if (typeof stringValue !== "string" || stringValue === "") return;
  if (DEPRECATED_KEYS.has(key) && out[field] !== undefined) return;
  (out as Record<string, string>)[field] = stringValue;
}

/** Copy the attributes that name a callee; a deprecated name never overrides its successor. */
function readAttributes(attrs: readonly { key?: unknown; value?: unknown }[] | null | undefined, out: CalleeAttributes): void {
  if (!attrs) return;
  for (const kv of attrs) {
    if (typeof kv.key !== "string" || ATTRIBUTE_KEYS[kv.key] === undefined) continue;
    const value = kv.value as { stringValue?: unknown; boolValue?: unknown } | null | undefined;
    setAttribute(out, kv.key, value?.stringValue, value?.boolValue);
  }
}

function serviceName(attrs: readonly unknown[] | null | undefined): string | null {
  for (const kv of attrs ?? []) {
    const a = kv as { key?: unknown; value?: { stringValue?: unknown } | null };
    if (a.key === "service.name" && typeof a.value?.stringValue === "string" && a.value.stringValue !== "") return a.value.stringValue;
  }
  return null;
}

/**
 * end − start in nanoseconds. Timestamps are about 1.8·10¹⁸, past the 2⁵³ a double holds exactly,
 * so decimal strings are split into a high and a low part and subtracted part by part.
 */
function durationOf(start: unknown, end: unknown): number {
  if (typeof start === "string" && typeof end === "string" && start.length > 15 && end.length > 15) {
    const split = (s: string): [number, number] => [Number(s.slice(0, s.length - 15)), Number(s.slice(s.length - 15))];
    const [sh, sl] = split(start);
    const [eh, el] = split(end);
    return Math.max(0, (eh - sh) * 1e15 + (el - sl));
  }
  const n = (v: unknown): number => (typeof v === "number" ? v : typeof v === "string" ? Number(v) : 0);
  return Math.max(0, n(end) - n(start));
}

const isRecord = (v: unknown): v is Record<string, unknown> => typeof v === "object" && v !== null && !Array.isArray(v);

/** Type checks of one span; the first problem found, located. */
function spanTypeIssue(s: unknown, path: string): InventoryIssue | null {
  if (!isRecord(s)) return { path, message: "a span must be an object" };
  for (const f of ["traceId", "spanId"] as const) {
    if (typeof s[f] !== "string") return { path: `${path}.${f}`, message: `${f} must be a hex string` };
  }
  if (s.parentSpanId !== undefined && s.parentSpanId !== null && typeof s.parentSpanId !== "string") return { path: `${path}.parentSpanId`, message: "parentSpanId must be a hex string" };
  if (s.kind !== undefined && s.kind !== null && typeof s.kind !== "number" && typeof s.kind !== "string") return { path: `${path}.kind`, message: "kind must be an integer" };
  for (const f of ["startTimeUnixNano", "endTimeUnixNano"] as const) {
    const v = s[f];
    if (v !== undefined && v !== null && !(typeof v === "number" || (typeof v === "string" && /^\d+$/.test(v)))) return { path: `${path}.${f}`, message: `${f} must be a whole number of nanoseconds (a decimal string or a number)` };
  }
  if (s.attributes !== undefined && s.attributes !== null) {
    if (!Array.isArray(s.attributes)) return { path: `${path}.attributes`, message: "attributes must be an array" };
    for (let i = 0; i < s.attributes.length; i++) {
      const kv: unknown = s.attributes[i];
      if (!isRecord(kv) || typeof kv.key !== "string") return { path: `${path}.attributes[${i}]`, message: "an attribute must be an object with a string key" };
    }
  }
  if (s.status !== undefined && s.status !== null && !isRecord(s.status)) return { path: `${path}.status`, message: "status must be an object" };
  return null;
}

const MAX_ISSUES = 20;

/** One OTLP/JSON ExportTraceServiceRequest (already JSON.parse'd) → spans. `file` demands resourceSpans. */
export function spansFromJson(value: unknown, { file = false, pathPrefix = "" }: { file?: boolean; pathPrefix?: string } = {}): DecodeResult {
  const envelope = (file ? FileRequestSchema : RequestSchema).safeParse(value);
  if (!envelope.success) {
    return {
      ok: false,
      issues: envelope.error.issues.slice(0, MAX_ISSUES).map((i) => ({ path: pathPrefix + (i.path.length ? i.path.map((p) => (typeof p === "number" ? `[${p}]` : `.${String(p)}`)).join("").replace(/^\./, "") : "(root)"), message: i.message })),
    };
  }
  const spans: TraceSpan[] = [];
  const rejected: RejectedSpans = { count: 0, reasons: new Map() };
  const issues: InventoryIssue[] = [];
  const resources = envelope.data.resourceSpans ?? [];
  for (let r = 0; r < resources.length; r++) {
    const rs = resources[r]!;
    const service = serviceName(rs.resource?.attributes);
    const scopes: [string, z.infer<typeof ScopeSpansSchema>[]][] = [
      ["scopeSpans", rs.scopeSpans ?? []],
      ["instrumentationLibrarySpans", rs.instrumentationLibrarySpans ?? []],
    ];
    for (const [scopeField, list] of scopes) {
      for (let sc = 0; sc < list.length; sc++) {
        const raw = list[sc]!.spans ?? [];
        for (let i = 0; i < raw.length; i++) {
          const s = raw[i];
          const issue = spanTypeIssue(s, `${pathPrefix}resourceSpans[${r}].${scopeField}[${sc}].spans[${i}]`);
          if (issue) {
            if (issues.length < MAX_ISSUES) issues.push(issue);
            continue;
          }
          const span = s as Record<string, unknown> & { traceId: string; spanId: string; parentSpanId?: string | null; attributes?: { key: string; value?: unknown }[]; status?: { code?: unknown } | null };
          if (service === null) {
            reject(rejected, "had no service.name on their resource");
            continue;
          }
          const traceId = canonicalId(span.traceId, 16);
          const spanId = canonicalId(span.spanId, 8);
          if (traceId === null || spanId === null) {
            reject(rejected, "had an invalid trace or span id (OTLP ids are 16 and 8 bytes, not all zero)");
            continue;
          }
          const attrs: CalleeAttributes = {};
          readAttributes(span.attributes, attrs);
          const code = span.status?.code;
          spans.push({
            traceId,
            spanId,
            parentSpanId: span.parentSpanId && kindOf(span.kind) === SPAN_KIND.server ? canonicalId(span.parentSpanId, 8) : null,
            kind: kindOf(span.kind),
            service,
            durationNs: durationOf(span.startTimeUnixNano, span.endTimeUnixNano),
            error: code === STATUS_CODE_ERROR || code === "STATUS_CODE_ERROR",
            attrs,
          });
        }
      }
    }
  }
  if (issues.length > 0) return { ok: false, issues };
  return { ok: true, spans, rejected };
}

// Binary protobuf. protobufjs's reflected decoder builds an object for every field of every span
// (events, scope, nested attribute values) and a Long for each timestamp, and took several times
// longer than the fold itself on a million spans (npm run bench). This walk uses protobufjs's wire
// Reader over the same field numbers (proto.ts) and keeps only what TraceSpan needs; every other
// field is skipped by its wire type, as any protobuf decoder skips unknown fields.
type R = protobuf.Reader & { buf: Buffer };

const hexOf = (r: R, bytes: 16 | 8): string | null => {
  const len = r.uint32();
  const start = r.pos;
  r.skip(len);
  if (len !== bytes) return null;
  let zero = true;
  for (let i = start; i < start + len; i++) if (r.buf[i] !== 0) zero = false;
  return zero ? null : r.buf.toString("hex", start, start + len);
};

/** AnyValue → its string_value (1) or bool_value (2); other kinds are not read. */
function readAnyValue(r: R, end: number): { s?: string; b?: boolean } {
  const out: { s?: string; b?: boolean } = {};
  while (r.pos < end) {
    const tag = r.uint32();
    if (tag === 10) out.s = r.string();
    else if (tag === 16) out.b = r.bool();
    else r.skipType(tag & 7);
  }
  return out;
}

/** KeyValue: calls `use` with the key and value of attributes in `wanted`; skips the rest unread. */
function readKeyValue(r: R, end: number, wanted: (key: string) => boolean, onValue: (key: string, v: { s?: string; b?: boolean }) => void): void {
  let key: string | null = null;
  while (r.pos < end) {
    const tag = r.uint32();
    if (tag === 10) key = r.string();
    else if (tag === 18 && key !== null && wanted(key)) {
      const len = r.uint32();
      onValue(key, readAnyValue(r, r.pos + len));
    } else r.skipType(tag & 7);
  }
}

/** The attribute keys we read, by byte length, so a key is recognised from its bytes without decoding it. */
const KEYS_BY_LENGTH = new Map<number, Array<{ key: string; bytes: Buffer }>>();
for (const key of Object.keys(ATTRIBUTE_KEYS)) {
  const bytes = Buffer.from(key);
  KEYS_BY_LENGTH.set(bytes.length, [...(KEYS_BY_LENGTH.get(bytes.length) ?? []), { key, bytes }]);
}

function knownKey(buf: Buffer, start: number, len: number): string | null {
  for (const candidate of KEYS_BY_LENGTH.get(len) ?? []) {
    let same = true;
    for (let i = 0; i < len; i++) {
      if (buf[start + i] !== candidate.bytes[i]) {
        same = false;
        break;
      }
    }
    if (same) return candidate.key;
  }
  return null;
}

/** One span KeyValue straight into `attrs`, decoding the key only when its length could match. */
function readSpanAttribute(r: R, end: number, attrs: CalleeAttributes): void {
  let key: string | null = null;
  while (r.pos < end) {
    const tag = r.uint32();
    if (tag === 10) {
      const len = r.uint32();
      key = knownKey(r.buf, r.pos, len);
      if (key === null) {
        r.pos = end;
        return;
      }
      r.skip(len);
    } else if (tag === 18 && key !== null) {
      const stop = r.pos + r.uint32();
      let sv: string | undefined;
      let bv: boolean | undefined;
      while (r.pos < stop) {
        const t = r.uint32();
        if (t === 10) sv = r.string();
        else if (t === 16) bv = r.bool();
        else r.skipType(t & 7);
      }
      setAttribute(attrs, key, sv, bv);
    } else r.skipType(tag & 7);
  }
}

function readSpan(r: R, end: number): (Omit<TraceSpan, "service" | "traceId" | "spanId"> & { traceId: string | null; spanId: string | null }) {
  let traceId: string | null = null;
  let spanId: string | null = null;
  let parentStart = -1;
  let parentLength = 0;
  let kind = 0;
  let startHi = 0;
  let startLo = 0;
  let endHi = 0;
  let endLo = 0;
  let error = false;
  const attrs: CalleeAttributes = {};
  while (r.pos < end) {
    const tag = r.uint32();
    switch (tag) {
      case 10: traceId = hexOf(r, 16); break;
      case 18: spanId = hexOf(r, 8); break;
      case 34: parentLength = r.uint32(); parentStart = r.pos; r.skip(parentLength); break;
      case 48: kind = kindOf(r.int32()); break;
      case 57: startLo = r.fixed32(); startHi = r.fixed32(); break;
      case 65: endLo = r.fixed32(); endHi = r.fixed32(); break;
      case 74: {
        const len = r.uint32();
        readSpanAttribute(r, r.pos + len, attrs);
        break;
      }
      case 122: {
        const len = r.uint32();
        const stop = r.pos + len;
        while (r.pos < stop) {
          const t = r.uint32();
          if (t === 24) error = r.int32() === STATUS_CODE_ERROR;
          else r.skipType(t & 7);
        }
        break;
      }
      default: r.skipType(tag & 7);
    }
  }
  // Only a SERVER span's parent is read (the fold pairs it with its CLIENT); decoding it for
  // every span would cost a string each.
  let parentSpanId: string | null = null;
  if (kind === SPAN_KIND.server && parentLength === 8) {
    let zero = true;
    for (let i = parentStart; i < parentStart + 8; i++) if (r.buf[i] !== 0) zero = false;
    parentSpanId = zero ? null : r.buf.toString("hex", parentStart, parentStart + 8);
  }
  // fixed64 as two 32-bit halves, subtracted half by half so the difference stays exact.
  return { traceId, spanId, parentSpanId, kind, durationNs: Math.max(0, (endHi - startHi) * 4294967296 + (endLo - startLo)), error, attrs };
}

/** A binary protobuf ExportTraceServiceRequest → spans; bytes that do not decode are one located issue. */
export function spansFromProtobuf(bytes: Uint8Array): DecodeResult {
  const spans: TraceSpan[] = [];
  const rejected: RejectedSpans = { count: 0, reasons: new Map() };
  const buffer = Buffer.isBuffer(bytes) ? bytes : Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const r = protobuf.Reader.create(buffer) as R;
  try {
    while (r.pos < r.len) {
      const tag = r.uint32();
      if (tag !== 10) {
        r.skipType(tag & 7);
        continue;
      }
      // ResourceSpans: its resource may come after its spans on the wire, so the service is set last.
      const rsEnd = r.pos + r.uint32();
      let service: string | null = null;
      const mine: ReturnType<typeof readSpan>[] = [];
      while (r.pos < rsEnd) {
        const t = r.uint32();
        if (t === 10) {
          const resEnd = r.pos + r.uint32();
          while (r.pos < resEnd) {
            const rt = r.uint32();
            if (rt === 10) {
              const kvEnd = r.pos + r.uint32();
              readKeyValue(r, kvEnd, (k) => k === "service.name", (_k, v) => {
                if (v.s) service = v.s;
              });
            } else r.skipType(rt & 7);
          }
        } else if (t === 18) {
          const ssEnd = r.pos + r.uint32();
          while (r.pos < ssEnd) {
            const st = r.uint32();
            if (st === 18) {
              const spanEnd = r.pos + r.uint32();
              mine.push(readSpan(r, spanEnd));
            } else r.skipType(st & 7);
          }
        } else r.skipType(t & 7);
      }
      for (const s of mine) {
        if (service === null) reject(rejected, "had no service.name on their resource");
        else if (s.traceId === null || s.spanId === null) reject(rejected, "had an invalid trace or span id (OTLP ids are 16 and 8 bytes, not all zero)");
        else spans.push({ ...s, traceId: s.traceId, spanId: s.spanId, service });
      }
    }
    if (r.pos !== r.len) throw new Error("a length runs past the end of the body");
  } catch (error) {
    return { ok: false, issues: [{ path: "(body)", message: `not a protobuf ExportTraceServiceRequest: ${error instanceof Error ? error.message : String(error)}` }] };
  }
  return { ok: true, spans, rejected };
}
