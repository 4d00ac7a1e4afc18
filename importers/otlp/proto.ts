// The slice of the OTLP protobuf schema the trace receiver reads and writes, written from
// opentelemetry-proto (opentelemetry/proto/{common,resource,trace}/v1/*.proto and
// collector/trace/v1/trace_service.proto) with the same field numbers, and google.rpc.Status for
// error bodies (OTLP specification, "OTLP/HTTP Response · Failures"). Fields we never read (events,
// trace_state, flags, schema URLs, dropped counts) are left out: protobuf decoders skip unknown
// field numbers, so requests carrying them decode the same. The schema is kept here as text rather than
// generated code so it reads like the specification; spans.ts walks requests with protobufjs's
// wire Reader over these field numbers, and responses and errors are encoded with these types.
import protobuf from "protobufjs";

const COMMON = `
syntax = "proto3";
package opentelemetry.proto.common.v1;
message AnyValue {
  oneof value {
    string string_value = 1;
    bool bool_value = 2;
    int64 int_value = 3;
    double double_value = 4;
    ArrayValue array_value = 5;
    KeyValueList kvlist_value = 6;
    bytes bytes_value = 7;
  }
}
message ArrayValue { repeated AnyValue values = 1; }
message KeyValueList { repeated KeyValue values = 1; }
message KeyValue { string key = 1; AnyValue value = 2; }
`;

const RESOURCE = `
syntax = "proto3";
package opentelemetry.proto.resource.v1;
message Resource { repeated opentelemetry.proto.common.v1.KeyValue attributes = 1; }
`;

const TRACE = `
syntax = "proto3";
package opentelemetry.proto.trace.v1;
message ResourceSpans {
  opentelemetry.proto.resource.v1.Resource resource = 1;
  repeated ScopeSpans scope_spans = 2;
}
message ScopeSpans { repeated Span spans = 2; }
message Span {
  bytes trace_id = 1;
  bytes span_id = 2;
  bytes parent_span_id = 4;
  string name = 5;
  int32 kind = 6;
  fixed64 start_time_unix_nano = 7;
  fixed64 end_time_unix_nano = 8;
  repeated opentelemetry.proto.common.v1.KeyValue attributes = 9;
  Status status = 15;
}
message Status { string message = 2; int32 code = 3; }
`;

const COLLECTOR = `
syntax = "proto3";
package opentelemetry.proto.collector.trace.v1;
message ExportTraceServiceRequest { repeated opentelemetry.proto.trace.v1.ResourceSpans resource_spans = 1; }
message ExportTraceServiceResponse { ExportTracePartialSuccess partial_success = 1; }
message ExportTracePartialSuccess { int64 rejected_spans = 1; string error_message = 2; }
`;

const RPC = `
syntax = "proto3";
package google.rpc;
message Status { int32 code = 1; string message = 2; repeated google.protobuf.Any details = 3; }
message BadRequest {
  message FieldViolation { string field = 1; string description = 2; }
  repeated FieldViolation field_violations = 1;
}
`;

const ANY = `
syntax = "proto3";
package google.protobuf;
message Any { string type_url = 1; bytes value = 2; }
`;

function load(): protobuf.Root {
  const root = new protobuf.Root();
  for (const text of [COMMON, RESOURCE, TRACE, COLLECTOR, ANY, RPC]) protobuf.parse(text, root, { keepCase: false });
  root.resolveAll();
  return root;
}

const root = load();
export const ExportTraceServiceRequest = root.lookupType("opentelemetry.proto.collector.trace.v1.ExportTraceServiceRequest");
export const ExportTraceServiceResponse = root.lookupType("opentelemetry.proto.collector.trace.v1.ExportTraceServiceResponse");
const RpcStatus = root.lookupType("google.rpc.Status");
const BadRequest = root.lookupType("google.rpc.BadRequest");

/** ExportTraceServiceResponse; `partial` unset on a full success, as "Full Success" requires. */
export function encodeTraceResponse(partial: { rejectedSpans: number; errorMessage: string } | null): Uint8Array {
  return ExportTraceServiceResponse.encode(ExportTraceServiceResponse.create(partial ? { partialSuccess: partial } : {})).finish();
}

/** google.rpc.Status with an optional google.rpc.BadRequest detail ("Bad Data" SHOULD carry one). */
export function encodeRpcStatus({ code, message, violations }: { code: number; message: string; violations?: { field: string; description: string }[] }): Uint8Array {
  const details = violations?.length
    ? [{ typeUrl: "type.googleapis.com/google.rpc.BadRequest", value: BadRequest.encode(BadRequest.create({ fieldViolations: violations })).finish() }]
    : [];
  return RpcStatus.encode(RpcStatus.create({ code, message, details })).finish();
}

export function decodeRpcStatus(bytes: Uint8Array): { code: number; message: string; details: { typeUrl: string; value: Uint8Array }[] } {
  return RpcStatus.toObject(RpcStatus.decode(bytes), { defaults: true }) as { code: number; message: string; details: { typeUrl: string; value: Uint8Array }[] };
}

export function decodeBadRequest(bytes: Uint8Array): { fieldViolations: { field: string; description: string }[] } {
  return BadRequest.toObject(BadRequest.decode(bytes), { defaults: true }) as { fieldViolations: { field: string; description: string }[] };
}
