// Minimal OTLP trace payloads written for the tests: one resourceSpans entry per service.name, ids
// padded to the 16 and 8 bytes OTLP requires (opentelemetry-proto trace.proto, Span.trace_id/span_id).
import { ExportTraceServiceRequest } from "@/importers/otlp/proto";

type Kind = "internal" | "server" | "client" | "producer" | "consumer";
const KIND: Record<Kind, number> = { internal: 1, server: 2, client: 3, producer: 4, consumer: 5 };

export interface SpanSpec {
  service: string;
  trace: string;
  id: string;
  parent?: string;
  kind: Kind;
  attrs?: Record<string, string | boolean | number>;
  durationMs?: number;
  error?: boolean;
}

const traceId = (t: string): string => t.padStart(32, "0");
const spanId = (s: string): string => s.padStart(16, "0");

const START = 1_767_225_600_000_000_000n; // 2026-01-01T00:00:00Z in ns

const value = (v: string | boolean | number) => (typeof v === "string" ? { stringValue: v } : typeof v === "boolean" ? { boolValue: v } : { intValue: String(v) });

/** An OTLP/JSON ExportTraceServiceRequest object. */
export function otlpJson(spans: SpanSpec[], { resourceless = [] as string[] } = {}) {
  const services = [...new Set(spans.map((s) => s.service))];
  return {
    resourceSpans: services.map((service) => ({
      resource: resourceless.includes(service) ? { attributes: [] } : { attributes: [{ key: "service.name", value: { stringValue: service } }] },
      scopeSpans: [
        {
          scope: { name: "test" },
          spans: spans
            .filter((s) => s.service === service)
            .map((s) => ({
              traceId: traceId(s.trace),
              spanId: spanId(s.id),
              ...(s.parent ? { parentSpanId: spanId(s.parent) } : {}),
              name: "op",
              kind: KIND[s.kind],
              startTimeUnixNano: String(START),
              endTimeUnixNano: String(START + BigInt(Math.round((s.durationMs ?? 10) * 1e6))),
              attributes: Object.entries(s.attrs ?? {}).map(([key, v]) => ({ key, value: value(v) })),
              status: { code: s.error ? 2 : 0 },
            })),
        },
      ],
    })),
  };
}

/** The same request in binary protobuf. */
export function otlpProtobuf(spans: SpanSpec[], options: { resourceless?: string[] } = {}): Buffer {
  const json = otlpJson(spans, options);
  const hex = (h: string) => Buffer.from(h, "hex");
  const message = ExportTraceServiceRequest.fromObject({
    resourceSpans: json.resourceSpans.map((rs) => ({
      resource: rs.resource,
      scopeSpans: rs.scopeSpans.map((ss) => ({
        spans: ss.spans.map((s) => ({
          ...s,
          traceId: hex(s.traceId),
          spanId: hex(s.spanId),
          parentSpanId: "parentSpanId" in s && s.parentSpanId ? hex(s.parentSpanId) : Buffer.alloc(0),
          startTimeUnixNano: s.startTimeUnixNano,
          endTimeUnixNano: s.endTimeUnixNano,
        })),
      })),
    })),
  });
  return Buffer.from(ExportTraceServiceRequest.encode(message).finish());
}
