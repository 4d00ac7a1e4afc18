// The slice of OTLP/JSON (ExportTraceServiceRequest, opentelemetry-proto) the importer reads.
// Loose objects: OTLP carries far more than we use and newer versions add fields.
import { z } from "zod";

// AnyValue: only string values matter for service.name, peer.service and db.system.
const AnyValueSchema = z.looseObject({ stringValue: z.string().optional() });
const KeyValueSchema = z.looseObject({ key: z.string(), value: AnyValueSchema.optional() });
const AttributesSchema = z.array(KeyValueSchema).optional();

/** OTLP/JSON encodes enums as integers; some exporters write the enum name instead. */
export const SpanKindSchema = z.union([z.int(), z.string()]).optional();

export const SpanSchema = z.looseObject({
  traceId: z.string({ error: "traceId must be a hex string" }),
  spanId: z.string({ error: "spanId must be a hex string" }),
  parentSpanId: z.string().optional(),
  kind: SpanKindSchema,
  attributes: AttributesSchema,
});

const ScopeSpansSchema = z.looseObject({ spans: z.array(SpanSchema).optional() });

export const ResourceSpansSchema = z.looseObject({
  resource: z.looseObject({ attributes: AttributesSchema }).optional(),
  scopeSpans: z.array(ScopeSpansSchema).optional(),
  // Name used before OTLP 0.15 (2022); some stored traces still have it.
  instrumentationLibrarySpans: z.array(ScopeSpansSchema).optional(),
});

export const TraceRequestSchema = z.looseObject({
  resourceSpans: z.array(ResourceSpansSchema, { error: "expected an OTLP/JSON ExportTraceServiceRequest with resourceSpans" }),
});

export type TraceRequest = z.infer<typeof TraceRequestSchema>;
export type KeyValue = z.infer<typeof KeyValueSchema>;
