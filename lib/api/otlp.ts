// OTLP/HTTP for the trace receiver, as the OTLP specification (opentelemetry-proto docs/specification.md)
// words it:
//   - "OTLP/HTTP Request": binary protobuf (Content-Type: application/x-protobuf) or JSON
//     (application/json), optionally "Content-Encoding: gzip"; the body limited, after
//     decompression too, to 20 MiB, answered with 413 when over;
//   - "OTLP/HTTP Response": the same Content-Type as the request; 200 with an
//     ExportTraceServiceResponse, whose partial_success is unset on a full success ("Full Success")
//     and carries rejected_spans and an English error_message when some spans were refused
//     ("Partial Success"; also, with rejected_spans 0, for a warning);
//   - "Failures": every 4xx/5xx body is a google.rpc.Status; undecodable data is 400 with a
//     BadRequest detail ("Bad Data"); an overloaded or unreachable backend is 503 with Retry-After
//     ("OTLP/HTTP Throttling"), one of the codes clients retry ("Retryable Response Codes").
import { gunzip } from "node:zlib";
import { promisify } from "node:util";
import { NextResponse, type NextRequest } from "next/server";
import { AppError } from "@/lib/errors";
import { MAX_BODY_BYTES } from "@/lib/inventory/limits";
import { encodeRpcStatus, encodeTraceResponse } from "@/importers/otlp/proto";
import { spansFromJson, spansFromProtobuf } from "@/importers/otlp/spans";
import { describeRejects, type RejectedSpans, type TraceSpan } from "@/lib/traces/types";
import { readBodyWithLimit } from "./body";

export type OtlpEncoding = "json" | "protobuf";

const gunzipAsync = promisify(gunzip);

/** An OTLP failure: HTTP status, developer-facing message, optional BadRequest field violations. */
class OtlpHttpError extends Error {
  constructor(
    readonly status: number,
    message: string,
    readonly violations: { field: string; description: string }[] = [],
    readonly retryAfterSeconds?: number,
  ) {
    super(message);
  }
}

function encodingOf(contentType: string | null): OtlpEncoding | null {
  const type = (contentType ?? "").split(";")[0]!.trim().toLowerCase();
  if (type === "application/x-protobuf" || type === "application/protobuf") return "protobuf";
  if (type === "application/json") return "json";
  return null;
}

/** The request body, decompressed, within MAX_BODY_BYTES before and after decompression. */
export async function readOtlpBody(req: Request): Promise<{ encoding: OtlpEncoding; bytes: Buffer }> {
  const encoding = encodingOf(req.headers.get("content-type"));
  if (encoding === null) {
    throw new OtlpHttpError(415, `Content-Type must be application/x-protobuf or application/json, not ${JSON.stringify(req.headers.get("content-type") ?? "")}`);
  }
  const coding = (req.headers.get("content-encoding") ?? "identity").trim().toLowerCase();
  if (coding !== "identity" && coding !== "gzip" && coding !== "none" && coding !== "") {
    throw new OtlpHttpError(415, `Content-Encoding ${JSON.stringify(coding)} is not supported; send gzip or no encoding`);
  }
  let raw: Buffer;
  try {
    raw = await readBodyWithLimit(req, MAX_BODY_BYTES);
  } catch (error) {
    if (error instanceof AppError && error.code === "payload_too_large") throw new OtlpHttpError(413, `The request body is over ${MAX_BODY_BYTES} bytes (20 MiB)`);
    throw error;
  }
  if (coding !== "gzip") return { encoding, bytes: raw };
  try {
    return { encoding, bytes: await gunzipAsync(raw, { maxOutputLength: MAX_BODY_BYTES }) };
  } catch (error) {
    if (error instanceof RangeError || (error as { code?: string }).code === "ERR_BUFFER_TOO_LARGE") {
      throw new OtlpHttpError(413, `The request body is over ${MAX_BODY_BYTES} bytes (20 MiB) once decompressed`);
    }
    throw new OtlpHttpError(400, "The body is not valid gzip", [{ field: "(body)", description: "Content-Encoding: gzip, but the body does not decompress" }]);
  }
}

/** Spans of one ExportTraceServiceRequest; data that does not decode is a 400 naming each problem. */
export function decodeOtlpSpans(encoding: OtlpEncoding, bytes: Buffer): { spans: TraceSpan[]; rejected: RejectedSpans } {
  let decoded;
  if (encoding === "json") {
    let value: unknown;
    try {
      value = bytes.length === 0 ? {} : JSON.parse(bytes.toString("utf8"));
    } catch (error) {
      throw new OtlpHttpError(400, "The body is not valid JSON", [{ field: "(body)", description: error instanceof Error ? error.message : "invalid JSON" }]);
    }
    decoded = spansFromJson(value);
  } else {
    decoded = spansFromProtobuf(bytes);
  }
  if (!decoded.ok) {
    throw new OtlpHttpError(
      400,
      `The request does not decode as an ExportTraceServiceRequest: ${decoded.issues[0]?.path}: ${decoded.issues[0]?.message}`,
      decoded.issues.map((i) => ({ field: i.path, description: i.message })),
    );
  }
  return { spans: decoded.spans, rejected: decoded.rejected };
}

const CONTENT_TYPE: Record<OtlpEncoding, string> = { json: "application/json", protobuf: "application/x-protobuf" };

/** 200 with an ExportTraceServiceResponse; `warning` is sent (rejected_spans 0) when nothing was refused. */
export function otlpSuccess(encoding: OtlpEncoding, rejected: RejectedSpans, warning?: string): Response {
  const partial = rejected.count > 0 ? { rejectedSpans: rejected.count, errorMessage: describeRejects(rejected) } : warning ? { rejectedSpans: 0, errorMessage: warning } : null;
  if (encoding === "json") {
    // proto3 JSON mapping: int64 as a decimal string.
    const body = partial ? { partialSuccess: { rejectedSpans: String(partial.rejectedSpans), errorMessage: partial.errorMessage } } : {};
    return NextResponse.json(body, { status: 200 });
  }
  return new Response(Buffer.from(encodeTraceResponse(partial)), { status: 200, headers: { "content-type": CONTENT_TYPE.protobuf } });
}

/** gRPC status codes for Status.code (the specification lets clients ignore it; it helps a reader). */
const GRPC_CODE: Record<number, number> = { 400: 3, 401: 16, 403: 7, 404: 5, 413: 8, 415: 3, 429: 8, 500: 13, 503: 14 };

/** PostgreSQL unreachable, restarting or out of connections: the client should retry later. */
function unavailable(error: unknown): boolean {
  const e = error as { name?: string; parent?: { code?: string }; original?: { code?: string } };
  if (typeof e?.name === "string" && /^Sequelize(Connection|HostNotFound|HostNotReachable|ConnectionAcquireTimeout)/.test(e.name)) return true;
  const code = e?.parent?.code ?? e?.original?.code;
  return code !== undefined && ["57P01", "57P02", "57P03", "53300", "40001", "40P01", "ECONNREFUSED", "ECONNRESET"].includes(code);
}

export function otlpErrorResponse(error: unknown, req: NextRequest): Response {
  const encoding = encodingOf(req.headers.get("content-type")) ?? "json";
  let status: number;
  let message: string;
  let violations: { field: string; description: string }[] = [];
  let retryAfter: number | undefined;
  if (error instanceof OtlpHttpError) {
    ({ status, message, violations } = error);
    retryAfter = error.retryAfterSeconds;
  } else if (error instanceof AppError) {
    // The API's 422 (a query or body that fails its schema) is OTLP's permanent "Bad Data".
    status = error.status === 422 ? 400 : error.status;
    message = error.message;
    violations = (error.issues ?? []).map((i) => ({ field: i.path, description: i.message }));
  } else if (unavailable(error)) {
    status = 503;
    message = "The trace store is unavailable; retry later";
    retryAfter = 5;
  } else {
    console.error("[otlp] unexpected error:", error);
    status = 500;
    message = "Something went wrong on our side; it has been logged";
  }
  const code = GRPC_CODE[status] ?? 2;
  const headers: Record<string, string> = { "content-type": CONTENT_TYPE[encoding] };
  if (retryAfter !== undefined) headers["retry-after"] = String(retryAfter);
  if (encoding === "json") {
    const details = violations.length ? [{ "@type": "type.googleapis.com/google.rpc.BadRequest", fieldViolations: violations }] : [];
    return new Response(JSON.stringify({ code, message, details }), { status, headers });
  }
  return new Response(Buffer.from(encodeRpcStatus({ code, message, violations })), { status, headers });
}
