// Our OTLP decoders against the official OpenTelemetry JavaScript SDK and its serializers
// (@opentelemetry/otlp-transformer, the code the OTLP/HTTP exporters send with): the same spans,
// encoded as binary protobuf and as OTLP/JSON by that package, must decode to the same spans here,
// with the ids, kinds, durations and statuses the SDK recorded.
import { context, SpanKind, SpanStatusCode, trace } from "@opentelemetry/api";
import { JsonTraceSerializer, ProtobufTraceSerializer } from "@opentelemetry/otlp-transformer";
import { resourceFromAttributes } from "@opentelemetry/resources";
import { BasicTracerProvider, InMemorySpanExporter, SimpleSpanProcessor, type ReadableSpan } from "@opentelemetry/sdk-trace-base";
import { describe, expect, it } from "vitest";
import { spansFromJson, spansFromProtobuf } from "@/importers/otlp/spans";
import { TraceFold } from "@/lib/traces/fold";

function recorded(): ReadableSpan[] {
  const exporter = new InMemorySpanExporter();
  const provider = (service: string) =>
    new BasicTracerProvider({ resource: resourceFromAttributes({ "service.name": service }), spanProcessors: [new SimpleSpanProcessor(exporter)] });
  const frontend = provider("frontend").getTracer("test");
  const cart = provider("cart").getTracer("test");
  const root = frontend.startSpan("GET /basket", { kind: SpanKind.SERVER, startTime: [1_767_225_600, 0] });
  const call = frontend.startSpan(
    "GET",
    { kind: SpanKind.CLIENT, startTime: [1_767_225_600, 1_000_000], attributes: { "http.request.method": "GET", "server.address": "cart-lb", "server.port": 8080 } },
    trace.setSpan(context.active(), root),
  );
  const served = cart.startSpan("GET /items", { kind: SpanKind.SERVER, startTime: [1_767_225_600, 2_000_000] }, trace.setSpanContext(context.active(), call.spanContext()));
  const db = cart.startSpan(
    "HGETALL",
    { kind: SpanKind.CLIENT, startTime: [1_767_225_600, 3_000_000], attributes: { "db.system.name": "redis", "server.address": "redis-cart" } },
    trace.setSpan(context.active(), served),
  );
  db.setStatus({ code: SpanStatusCode.ERROR, message: "timeout" });
  db.end([1_767_225_600, 4_500_000]);
  served.end([1_767_225_600, 9_000_000]);
  call.end([1_767_225_600, 11_000_000]);
  root.end([1_767_225_600, 12_000_000]);
  return exporter.getFinishedSpans();
}

describe("OTLP decoding against @opentelemetry/otlp-transformer", () => {
  const spans = recorded();
  const byId = new Map(spans.map((s) => [s.spanContext().spanId, s]));

  it("binary protobuf and OTLP/JSON of the same spans decode alike, with the SDK's ids, kinds, durations and errors", () => {
    const pb = spansFromProtobuf(Buffer.from(ProtobufTraceSerializer.serializeRequest(spans)!));
    const js = spansFromJson(JSON.parse(Buffer.from(JsonTraceSerializer.serializeRequest(spans)!).toString("utf8")));
    if (!pb.ok || !js.ok) throw new Error("decode failed");
    const sorted = (x: typeof pb.spans) => [...x].sort((a, b) => (a.spanId < b.spanId ? -1 : 1));
    expect(sorted(pb.spans)).toEqual(sorted(js.spans));
    expect(pb.spans).toHaveLength(4);
    for (const s of pb.spans) {
      const sdk = byId.get(s.spanId)!;
      expect(s.traceId).toBe(sdk.spanContext().traceId);
      // Parents are read for SERVER spans only (the fold pairs those with their CLIENT).
      expect(s.parentSpanId).toBe(sdk.kind === SpanKind.SERVER ? (sdk.parentSpanContext?.spanId ?? null) : null);
      // SpanKind in the API counts from INTERNAL = 0; OTLP from UNSPECIFIED = 0 (trace.proto), so one more.
      expect(s.kind).toBe(sdk.kind + 1);
      expect(s.service).toBe(sdk.resource.attributes["service.name"]);
      expect(s.error).toBe(sdk.status.code === SpanStatusCode.ERROR);
    }
    expect(pb.spans.find((s) => s.attrs.dbSystem === "redis")).toMatchObject({ durationNs: 1_500_000, attrs: { serverAddress: "redis-cart" } });
  });

  it("folds the SDK's spans into frontend → cart (named by the SERVER child) and cart → redis-cart", () => {
    const pb = spansFromProtobuf(Buffer.from(ProtobufTraceSerializer.serializeRequest(spans)!));
    if (!pb.ok) throw new Error("decode failed");
    const fold = new TraceFold();
    fold.add(pb.spans);
    fold.finish();
    expect([...fold.edges.values()].map((e) => [e.from, e.to, e.calls, e.errors]).sort()).toEqual([
      ["cart", "redis-cart", 1, 1],
      ["frontend", "cart", 1, 0],
    ]);
  });
});
