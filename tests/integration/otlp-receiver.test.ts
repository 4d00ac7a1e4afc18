// The OTLP/HTTP trace receiver against the OTLP specification's text (opentelemetry-proto
// docs/specification.md, section "OTLP/HTTP"). Each check quotes the sentence it holds us to.
import { gzipSync } from "node:zlib";
import { beforeAll, describe, expect, it } from "vitest";
import { POST as receive } from "@/app/api/v1/environments/[env]/otlp/v1/traces/route";
import { decodeBadRequest, decodeRpcStatus, ExportTraceServiceResponse } from "@/importers/otlp/proto";
import { drainAnalysisQueue } from "@/lib/jobs/analysis";
import { getEnvironmentOrThrow } from "@/lib/data/environments";
import { materialiseObservedGraph } from "@/lib/data/observed-graph";
import { observedTraffic } from "@/lib/data/trace-traffic";
import { sweepWaitingCalls } from "@/lib/data/traces";
import { db } from "@/models";
import { createApiToken, createUser, type TestUser } from "../support/api";
import { otlpJson, otlpProtobuf, type SpanSpec } from "../support/otlp";

let admin: TestUser;
let writeToken: string;
let readToken: string;

beforeAll(async () => {
  admin = await createUser("admin");
  writeToken = await createApiToken({ scopes: ["inventory:write"], createdBy: admin.id });
  readToken = await createApiToken({ scopes: ["read"], createdBy: admin.id });
});

/** A raw request to the handler: bytes in, status, headers and bytes out. */
async function post(env: string, body: Buffer | string, headers: Record<string, string>, token: string | null = writeToken) {
  const h = new Headers(headers);
  if (token) h.set("authorization", `Bearer ${token}`);
  const { NextRequest } = await import("next/server");
  const req = new NextRequest(new URL(`/api/v1/environments/${env}/otlp/v1/traces`, "http://127.0.0.1:3000"), { method: "POST", headers: h, body: body as BodyInit });
  const res = await receive(req, { params: Promise.resolve({ env }) });
  return { status: res.status, headers: res.headers, bytes: Buffer.from(await res.arrayBuffer()) };
}

const json = (env: string, spans: SpanSpec[], token?: string | null) => post(env, JSON.stringify(otlpJson(spans)), { "content-type": "application/json" }, token);
const proto = (env: string, spans: SpanSpec[]) => post(env, otlpProtobuf(spans), { "content-type": "application/x-protobuf" });

// frontend → cart (HTTP, the server child names the callee), cart → redis-cart (a database call).
const CALL: SpanSpec[] = [
  { service: "frontend", trace: "a1", id: "1", kind: "server" },
  { service: "frontend", trace: "a1", id: "2", parent: "1", kind: "client", attrs: { "http.request.method": "GET", "server.address": "cart-lb.internal" }, durationMs: 12 },
  { service: "cart", trace: "a1", id: "3", parent: "2", kind: "server", durationMs: 10 },
  { service: "cart", trace: "a1", id: "4", parent: "3", kind: "client", attrs: { "db.system.name": "redis", "server.address": "redis-cart:6379" }, durationMs: 1 },
];

async function edgesOf(slug: string) {
  const env = await getEnvironmentOrThrow({ slug });
  return (await observedTraffic({ environmentId: env.id })).edges.map((e) => ({ from: e.from, to: e.to, calls: e.calls, errors: e.errors, evidence: e.evidence, toKind: e.toKind }));
}

describe("OTLP/HTTP receiver: responses", () => {
  it("Full Success: 200 with an ExportTraceServiceResponse whose partial_success is unset, in the request's Content-Type (JSON)", async () => {
    const res = await json("recv-json", CALL);
    // "On success, the server MUST respond with HTTP 200 OK" · "The server MUST use the same Content-Type in the response as it received in the request."
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toMatch(/^application\/json/);
    // "The server MUST leave the partial_success field unset in case of a successful response."
    expect(JSON.parse(res.bytes.toString())).toEqual({});
    expect(await edgesOf("recv-json")).toEqual([
      { from: "cart", to: "redis-cart", calls: 1, errors: 0, evidence: ["server.address"], toKind: "datastore" },
      { from: "frontend", to: "cart", calls: 1, errors: 0, evidence: ["child-span"], toKind: "service" },
    ]);
  });

  it("Full Success in binary protobuf: the response is a protobuf ExportTraceServiceResponse with partial_success unset", async () => {
    const res = await proto("recv-proto", CALL);
    expect(res.status).toBe(200);
    // "The client and the server MUST set "Content-Type: application/x-protobuf" ... when sending binary Protobuf encoded payload."
    expect(res.headers.get("content-type")).toBe("application/x-protobuf");
    expect(res.bytes.length).toBe(0);
    const decoded = ExportTraceServiceResponse.toObject(ExportTraceServiceResponse.decode(res.bytes));
    expect(decoded.partialSuccess).toBeUndefined();
    expect(await edgesOf("recv-proto")).toEqual(await edgesOf("recv-json"));
  });

  it("answers an empty request with success: \"If the server receives an empty request ... the server SHOULD respond with success\"", async () => {
    const res = await post("recv-empty", "{}", { "content-type": "application/json" });
    expect(res.status).toBe(200);
    expect(JSON.parse(res.bytes.toString())).toEqual({});
  });

  it("Partial Success: 200, rejected_spans counts the spans refused, error_message says why in English", async () => {
    const body = otlpJson(CALL);
    // A span with an all-zero trace id: "An ID with all zeroes OR of length other than 16 bytes is considered invalid" (trace.proto).
    body.resourceSpans[0]!.scopeSpans[0]!.spans[0]!.traceId = "0".repeat(32);
    const res = await post("recv-partial", JSON.stringify(body), { "content-type": "application/json" });
    // "If the request is only partially accepted ... the server MUST respond with HTTP 200 OK" and "MUST set the respective rejected_spans"
    expect(res.status).toBe(200);
    const answer = JSON.parse(res.bytes.toString()) as { partialSuccess: { rejectedSpans: string; errorMessage: string } };
    // int64 is a decimal string in OTLP/JSON ("64-bit integer numbers in JSON-encoded payloads are encoded as decimal strings").
    expect(answer.partialSuccess.rejectedSpans).toBe("1");
    expect(answer.partialSuccess.errorMessage).toMatch(/^1 span had an invalid trace or span id/);
    // The rest of the request counted.
    expect((await edgesOf("recv-partial")).length).toBe(2);
  });

  it("Partial Success in protobuf, for spans whose resource has no service.name", async () => {
    const spans: SpanSpec[] = [
      { service: "x", trace: "b1", id: "1", kind: "client", attrs: { "peer.service": "y" } },
      { service: "z", trace: "b1", id: "2", kind: "client", attrs: { "peer.service": "y" } },
    ];
    const res = await post("recv-partial-pb", otlpProtobuf(spans, { resourceless: ["x"] }), { "content-type": "application/x-protobuf" });
    expect(res.status).toBe(200);
    const answer = ExportTraceServiceResponse.toObject(ExportTraceServiceResponse.decode(res.bytes), { longs: Number }) as { partialSuccess?: { rejectedSpans: number; errorMessage: string } };
    expect(answer.partialSuccess).toEqual({ rejectedSpans: 1, errorMessage: "1 span had no service.name on their resource" });
  });

  it("warns with rejected_spans 0 and a message when spans repeat ids already received, and counts them once", async () => {
    expect((await json("recv-dup", CALL)).status).toBe(200);
    const again = await json("recv-dup", CALL);
    // "the rejected_<signal> field MUST have a value of 0, and the error_message field MUST be non-empty."
    const answer = JSON.parse(again.bytes.toString()) as { partialSuccess: { rejectedSpans: string; errorMessage: string } };
    expect(answer.partialSuccess.rejectedSpans).toBe("0");
    expect(answer.partialSuccess.errorMessage).toContain("4 spans repeated");
    expect((await edgesOf("recv-dup")).map((e) => e.calls)).toEqual([1, 1]);
  });

  it("Bad Data: 400 with a google.rpc.Status carrying a BadRequest, for JSON and protobuf", async () => {
    const res = await post("recv-bad", JSON.stringify({ resourceSpans: [{ scopeSpans: [{ spans: [{ traceId: 5 }] }] }] }), { "content-type": "application/json" });
    // "the server MUST respond with HTTP 400 Bad Request. The Status.details field in the response SHOULD contain a BadRequest"
    expect(res.status).toBe(400);
    const status = JSON.parse(res.bytes.toString()) as { message: string; details: Array<{ "@type": string; fieldViolations: Array<{ field: string }> }> };
    expect(status.message).toContain("traceId");
    expect(status.details[0]?.["@type"]).toBe("type.googleapis.com/google.rpc.BadRequest");
    expect(status.details[0]?.fieldViolations[0]?.field).toBe("resourceSpans[0].scopeSpans[0].spans[0].traceId");

    const garbage = await post("recv-bad", Buffer.from([0x0a, 0xff, 0xff, 0xff, 0x0f, 0x01]), { "content-type": "application/x-protobuf" });
    expect(garbage.status).toBe(400);
    expect(garbage.headers.get("content-type")).toBe("application/x-protobuf");
    const pbStatus = decodeRpcStatus(garbage.bytes);
    expect(pbStatus.message).toMatch(/not a protobuf ExportTraceServiceRequest/);
    expect(pbStatus.details[0]?.typeUrl).toBe("type.googleapis.com/google.rpc.BadRequest");
    expect(decodeBadRequest(pbStatus.details[0]!.value).fieldViolations[0]?.field).toBe("(body)");
  });

  it("takes gzip bodies (\"Content-Encoding: gzip\") and answers 413 past 20 MiB after decompression", async () => {
    const ok = await post("recv-gzip", gzipSync(otlpProtobuf(CALL)), { "content-type": "application/x-protobuf", "content-encoding": "gzip" });
    expect(ok.status).toBe(200);
    expect((await edgesOf("recv-gzip")).length).toBe(2);
    // "The server MUST limit the size of the request body when parsing it, including after decompression ... respond with HTTP 413"
    const bomb = gzipSync(Buffer.alloc(21 * 1024 * 1024, 0x20));
    const big = await post("recv-gzip", bomb, { "content-type": "application/json", "content-encoding": "gzip" });
    expect(big.status).toBe(413);
    expect(JSON.parse(big.bytes.toString()).message).toMatch(/20 MiB/);
  });

  it("answers 415 for another Content-Type, 401 without a token and 403 for a read-only one, each with a Status body", async () => {
    const text = await post("recv-json", "hello", { "content-type": "text/plain" });
    expect(text.status).toBe(415);
    expect(JSON.parse(text.bytes.toString())).toMatchObject({ message: expect.stringContaining("application/x-protobuf") });
    const anonymous = await json("recv-json", CALL, null);
    expect(anonymous.status).toBe(401);
    expect(JSON.parse(anonymous.bytes.toString())).toMatchObject({ code: 16 });
    const read = await json("recv-json", CALL, readToken);
    expect(read.status).toBe(403);
    const pb = await post("recv-json", otlpProtobuf(CALL), { "content-type": "application/x-protobuf" }, null);
    expect(pb.status).toBe(401);
    expect(decodeRpcStatus(pb.bytes).message).toMatch(/Bearer/);
  });
});

describe("OTLP/HTTP receiver: halves of a call in different requests", () => {
  it("pairs a client span with the server child sent earlier by the callee's own exporter", async () => {
    // The callee exports first (its server span ends before the client's).
    expect((await json("recv-pair", [CALL[2]!])).status).toBe(200);
    expect((await json("recv-pair", [CALL[0]!, CALL[1]!])).status).toBe(200);
    expect(await edgesOf("recv-pair")).toEqual([{ from: "frontend", to: "cart", calls: 1, errors: 0, evidence: ["child-span"], toKind: "service" }]);
  });

  it("pairs a server span with a client sent earlier, and counts a lone client on its attributes once the grace period is over", async () => {
    await json("recv-pair2", [CALL[1]!]);
    await json("recv-pair2", [CALL[2]!]);
    const lone: SpanSpec = { service: "frontend", trace: "c9", id: "9", kind: "client", attrs: { "url.full": "https://payments.example.com:8443/charge" }, error: true };
    await json("recv-pair2", [lone]);
    expect((await edgesOf("recv-pair2")).map((e) => `${e.from}>${e.to}`)).toEqual(["frontend>cart"]);
    await sweepWaitingCalls({ graceSeconds: 0 });
    expect(await edgesOf("recv-pair2")).toEqual([
      { from: "frontend", to: "cart", calls: 1, errors: 0, evidence: ["child-span"], toKind: "service" },
      { from: "frontend", to: "payments.example.com", calls: 1, errors: 1, evidence: ["url.full"], toKind: "service" },
    ]);
    const left = await db().sequelize.query("SELECT count(*)::int AS n FROM trace_waiting", { plain: true });
    expect(left).toEqual({ n: 0 });
  });
});

describe("a trace-only environment", () => {
  it("gets components, an analysis and rankings from observed edges alone", async () => {
    await json("recv-only", CALL);
    const env = await getEnvironmentOrThrow({ slug: "recv-only" });
    const first = await materialiseObservedGraph({ environmentId: env.id });
    expect(first.changed).toBe(true);
    expect(first.snapshot?.number).toBe(1);
    // The same set again: no new snapshot ("only when the set of observed edges changes").
    await json("recv-only", [{ ...CALL[1]!, id: "12" }, { ...CALL[2]!, id: "13", parent: "12" }]);
    expect((await materialiseObservedGraph({ environmentId: env.id })).changed).toBe(false);
    await drainAnalysisQueue();
    const metrics = await db().sequelize.query<{ key: string; kind: string; betweenness: number }>(
      `SELECT m.key, m.kind, m.betweenness FROM component_metrics m JOIN snapshots s ON s.id = m.snapshot_id WHERE s.environment_id = $1 ORDER BY m.key`,
      { type: "SELECT" as never, bind: [env.id] },
    );
    // frontend → cart → redis-cart: a path of three; cart lies on the one path between the other two.
    // Directed betweenness normalised by (n−1)(n−2) = 2 (DESIGN §3): cart = 1/2, the ends 0.
    expect(metrics).toEqual([
      { key: "cart", kind: "service", betweenness: 0.5 },
      { key: "frontend", kind: "service", betweenness: 0 },
      { key: "redis-cart", kind: "datastore", betweenness: 0 },
    ]);
  });
});
