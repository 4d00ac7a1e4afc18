// Trace files (OTLP/JSON, JSON Lines) and the edges the OpenTelemetry semantic conventions give.
// Each case is a minimal payload written for the test; the expected edge follows from the text of
// the attribute's page in the semantic conventions (open-telemetry/semantic-conventions, docs/…),
// quoted beside it. Span kinds and ids: opentelemetry-proto trace.proto (SERVER 2, CLIENT 3,
// PRODUCER 4, CONSUMER 5; 16-byte trace ids, 8-byte span ids).
import { describe, expect, it } from "vitest";
import { importInventory } from "@/importers";
import { normaliseKey } from "@/importers/otlp";
import { traceDocuments, TraceFileError } from "@/importers/otlp/documents";
import { spansFromJson } from "@/importers/otlp/spans";
import { TraceFold } from "@/lib/traces/fold";
import { stripPort } from "@/lib/traces/semconv";
import { otlpJson, type SpanSpec } from "../support/otlp";
import { expectIssues, expectOk, fixture, located } from "./helpers";

const otlp = (body: string | Buffer, source: string | undefined = "otel-collector") => importInventory({ format: "otlp", body, source });

/** Fold spans as a whole file would be: edges with their callee kind, evidence and asynchrony. */
function edges(spans: SpanSpec[]) {
  const decoded = spansFromJson(otlpJson(spans));
  if (!decoded.ok) throw new Error(JSON.stringify(decoded.issues));
  const fold = new TraceFold();
  fold.add(decoded.spans);
  fold.finish();
  return [...fold.edges.values()]
    .map((e) => ({ from: e.from, to: e.to, kind: e.toKind, evidence: [...e.evidence].join(","), async: e.async, calls: e.calls }))
    .sort((a, b) => `${a.from}>${a.to}`.localeCompare(`${b.from}>${b.to}`));
}

const client = (service: string, attrs: Record<string, string | boolean>, id = "2"): SpanSpec => ({ service, trace: "a1", id, parent: "1", kind: "client", attrs });

describe("callee of a CLIENT span, in the order of the rules", () => {
  it("the SERVER child's service.name (resource/service.md: \"Logical name of the service\") names the callee before any attribute", () => {
    expect(edges([client("frontend", { "peer.service": "cart-svc", "server.address": "10.0.0.7" }), { service: "CartService", trace: "a1", id: "3", parent: "2", kind: "server" }])).toEqual([
      { from: "frontend", to: "cartservice", kind: "service", evidence: "child-span", async: false, calls: 1 },
    ]);
  });

  it("peer.service: \"The service.name of the remote service\" (registry/attributes/peer.md)", () => {
    expect(edges([client("checkout", { "peer.service": "AuthTokenCache", "server.address": "redis-7" })])).toEqual([
      { from: "checkout", to: "authtokencache", kind: "service", evidence: "peer.service", async: false, calls: 1 },
    ]);
  });

  it("server.address: \"On client side, it matches remote service name\" (general/attributes.md), a port written into it stripped", () => {
    expect(edges([client("frontend", { "server.address": "cart:7070" })])).toEqual([{ from: "frontend", to: "cart", kind: "service", evidence: "server.address", async: false, calls: 1 }]);
    expect(stripPort("[::1]:443")).toBe("::1");
    expect(stripPort("::1")).toBe("::1");
  });

  it("net.peer.name: deprecated, \"replaced by server.address on client spans\" (registry/attributes/net.md): used only without server.address", () => {
    expect(edges([client("frontend", { "net.peer.name": "currency:7001" })])).toEqual([{ from: "frontend", to: "currency", kind: "service", evidence: "net.peer.name", async: false, calls: 1 }]);
    expect(edges([client("frontend", { "net.peer.name": "old-name", "server.address": "new-name" })])[0]?.to).toBe("new-name");
  });

  it("the host of url.full (registry/attributes/url.md) when no server.address was recorded", () => {
    expect(edges([client("frontend", { "url.full": "https://payments.example.com:8443/charge" })])).toEqual([
      { from: "frontend", to: "payments.example.com", kind: "service", evidence: "url.full", async: false, calls: 1 },
    ]);
  });

  it("rpc.service: \"The full (logical) name of the service being called\" (registry/attributes/rpc.md)", () => {
    expect(edges([client("checkout", { "rpc.system": "grpc", "rpc.service": "oteldemo.CartService" })])).toEqual([
      { from: "checkout", to: "oteldemo.cartservice", kind: "service", evidence: "rpc.service", async: false, calls: 1 },
    ]);
  });

  it("a database call (db.system.name, database/database-spans.md) names a datastore after its server.address, not the product", () => {
    expect(edges([client("orders", { "db.system.name": "postgresql", "db.namespace": "orders", "server.address": "orders-db.internal" }), client("billing", { "db.system.name": "postgresql", "server.address": "billing-db" }, "5")])).toEqual([
      { from: "billing", to: "billing-db", kind: "datastore", evidence: "server.address", async: false, calls: 1 },
      { from: "orders", to: "orders-db.internal", kind: "datastore", evidence: "server.address", async: false, calls: 1 },
    ]);
  });

  it("without an address, by db.namespace, \"the name of the database, fully qualified within the server address\" (registry/attributes/db.md); the deprecated db.system and db.name count the same", () => {
    expect(edges([client("orders", { "db.system": "postgresql", "db.name": "orders" })])).toEqual([
      { from: "orders", to: "postgresql-orders", kind: "datastore", evidence: "db.namespace", async: false, calls: 1 },
    ]);
    // The product alone names no component: every PostgreSQL user would share one made-up datastore.
    const inv = expectOk(otlp(JSON.stringify(otlpJson([client("orders", { "db.system.name": "postgresql" })]))));
    expect(inv.observedEdges).toEqual([]);
    expect(inv.warnings).toContainEqual(expect.objectContaining({ message: expect.stringMatching(/^1 client, producer or consumer spans name no callee/) }));
  });

  it("a database call does not wait for a server child (database servers send no spans)", () => {
    const fold = new TraceFold();
    const decoded = spansFromJson(otlpJson([client("orders", { "db.system.name": "redis", "server.address": "redis-cart" })]));
    if (!decoded.ok) throw new Error("decode");
    fold.add(decoded.spans);
    expect(fold.takeWaiting().clients).toEqual([]);
    expect([...fold.edges.keys()]).toEqual(["orders\u0000redis-cart"]);
  });
});

describe("messaging (messaging/messaging-spans.md): producer → destination ← consumer, asynchronous", () => {
  it("a PRODUCER and a CONSUMER both need the destination, \"uniquely identified by its name within the messaging system instance\"; the producer never needs the consumer", () => {
    const spans: SpanSpec[] = [
      { service: "checkout", trace: "m1", id: "1", kind: "producer", attrs: { "messaging.system": "kafka", "messaging.destination.name": "orders" } },
      { service: "shipping", trace: "m1", id: "2", parent: "1", kind: "consumer", attrs: { "messaging.system": "kafka", "messaging.destination.name": "orders" } },
    ];
    expect(edges(spans)).toEqual([
      { from: "checkout", to: "kafka-orders", kind: "queue", evidence: "messaging.destination", async: true, calls: 1 },
      { from: "shipping", to: "kafka-orders", kind: "queue", evidence: "messaging.destination", async: true, calls: 1 },
    ]);
  });

  it("a CLIENT \"publish\" (\"CLIENT for the Publish span if its context is not used as creation context\") counts the same; temporary destinations name nothing", () => {
    expect(edges([client("checkout", { "messaging.system": "rabbitmq", "messaging.destination.name": "emails" })])[0]).toMatchObject({ to: "rabbitmq-emails", async: true });
    expect(edges([client("checkout", { "messaging.system": "rabbitmq", "messaging.destination.name": "amq.gen-x1", "messaging.destination.temporary": true })])).toEqual([]);
  });
});

describe("spans and ids", () => {
  it("a repeated (trace id, span id) counts once; hex ids are case-insensitive (OTLP specification, \"JSON Protobuf Encoding\")", () => {
    const one = client("frontend", { "server.address": "cart" });
    const body = otlpJson([one, one]);
    const upper = otlpJson([one]).resourceSpans[0]!.scopeSpans[0]!.spans[0]!;
    body.resourceSpans[0]!.scopeSpans[0]!.spans.push({ ...upper, traceId: upper.traceId.toUpperCase().replace(/^0/, "0") });
    const decoded = spansFromJson(body);
    if (!decoded.ok) throw new Error("decode");
    const fold = new TraceFold();
    fold.add(decoded.spans);
    fold.finish();
    expect(fold.stats).toMatchObject({ duplicates: 2, calls: 1 });
  });

  it("ids that are not hex (a base64 id from the plain protobuf JSON mapping) keep their case: two spans, not one", () => {
    const body = otlpJson([client("frontend", { "server.address": "cart" })]);
    const s = body.resourceSpans[0]!.scopeSpans[0]!.spans[0]!;
    body.resourceSpans[0]!.scopeSpans[0]!.spans = [
      { ...s, traceId: "W47/95gDgQPSabYzgT/GDA==", spanId: "AAAAAAAAAAo=" },
      { ...s, traceId: "W47/95gDgQPSabYzgT/GDA==", spanId: "AAAAAAAAAAO=" },
    ];
    const decoded = spansFromJson(body);
    if (!decoded.ok) throw new Error("decode");
    expect(decoded.spans.map((x) => x.spanId)).toEqual(["AAAAAAAAAAo=", "AAAAAAAAAAO="]);
    const fold = new TraceFold();
    fold.add(decoded.spans);
    fold.finish();
    expect(fold.stats).toMatchObject({ duplicates: 0, calls: 2 });
  });

  it("a SERVER span whose parent ran in another service without a CLIENT span gives parent → child (context propagated by hand)", () => {
    expect(edges([{ service: "gateway", trace: "p1", id: "1", kind: "internal" }, { service: "api", trace: "p1", id: "2", parent: "1", kind: "server" }])).toEqual([
      { from: "gateway", to: "api", kind: "service", evidence: "parent-span", async: false, calls: 1 },
    ]);
  });

  it("a call into the same service (a loopback) is no dependency", () => {
    expect(edges([client("cart", { "server.address": "cart" }), { service: "cart", trace: "a1", id: "3", parent: "2", kind: "server" }])).toEqual([]);
  });

  it("normalises keys: lower case, other characters to '-', leading junk dropped", () => {
    expect(normaliseKey("Payments Service")).toBe("payments-service");
    expect(normaliseKey("_internal/Cache:v2")).toBe("internal-cache-v2");
    expect(normaliseKey("???")).toBeNull();
  });
});

describe("trace files", () => {
  it("a file of three services: observed edges with counts and evidence, no components", () => {
    const inv = expectOk(otlp(fixture("otlp/checkout-trace.json")));
    expect(inv.components).toEqual([]);
    expect(inv.observedEdges).toEqual([
      // The SERVER child in payments-service names the callee; peer.service agrees after normalising.
      { from: "checkout-api", to: "payments-service", count: 1, evidence: "child-span" },
      // Deprecated db.system with db.name and no address: named by the namespace.
      { from: "checkout-api", to: "postgresql-orders", count: 1, evidence: "db.namespace" },
      { from: "storefront", to: "checkout-api", count: 1, evidence: "child-span" },
    ]);
    // The INTERNAL retry span's parent is not in the file: it makes no call, so nothing to warn about.
    expect(inv.warnings).toEqual([]);
    const orphan = otlpJson([{ service: "api", trace: "o1", id: "2", parent: "1", kind: "server" }]);
    expect(expectOk(otlp(JSON.stringify(orphan))).warnings).toEqual([expect.objectContaining({ message: expect.stringMatching(/^1 server spans have a parent span not in this file/) })]);
  });

  it("JSON Lines, as the Collector's file exporter writes: one request a line, blank lines skipped, a repeated span once", () => {
    const a = JSON.stringify(otlpJson([client("frontend", { "peer.service": "cart" })]));
    const b = JSON.stringify(otlpJson([client("frontend", { "peer.service": "cart" }, "7"), client("cart", { "db.system.name": "redis", "server.address": "redis" }, "8")]));
    const inv = expectOk(otlp(`${a}\r\n\n${b}\n${a}\n`));
    expect(inv.observedEdges).toEqual([
      { from: "cart", to: "redis", count: 1, evidence: "server.address" },
      { from: "frontend", to: "cart", count: 2, evidence: "peer.service" },
    ]);
    expect(inv.warnings).toContainEqual(expect.objectContaining({ message: expect.stringMatching(/^1 spans repeated a trace and span id/) }));
  });

  it("streams JSON Lines in chunks cut anywhere, even inside a multi-byte character, and refuses bytes that are not UTF-8", async () => {
    const lines = [JSON.stringify(otlpJson([client("frontend", { "peer.service": "cart" })])), JSON.stringify(otlpJson([client("fröntend-ü", { "peer.service": "cart" })]))];
    const bytes = Buffer.from(`\uFEFF${lines.join("\n")}\n`);
    async function* chunks(size: number, from: Buffer = bytes) {
      for (let i = 0; i < from.length; i += size) yield from.subarray(i, i + size);
    }
    const read = async (size: number, from?: Buffer) => {
      const out: unknown[] = [];
      for await (const d of traceDocuments(chunks(size, from))) out.push([d.line, d.value]);
      return out;
    };
    const expected = lines.map((l, i) => [i + 1, JSON.parse(l)]);
    for (const size of [1, 7, 64, 100_000]) expect(await read(size)).toEqual(expected);
    const bad = Buffer.concat([Buffer.from(`${lines[0]}\n{"resourceSpans": [], "x": "`), Buffer.from([0xff, 0xfe]), Buffer.from('"}\n')]);
    await expect(read(16, bad)).rejects.toEqual(new TraceFileError(422, [{ path: "", line: 2, message: "the file is not UTF-8 text" }]));
  });

  it("bad JSON and wrong shapes are located, in a single document and in JSON Lines", () => {
    expect(expectIssues(otlp('{\n  "resourceSpans": [\n    { "scopeSpans": [ ] },\n  ]\n}'), 422)).toEqual([located("", 3, 26, /trailing comma/)]);
    expect(expectIssues(otlp('{\n  "resourceSpans": [\n    { "scopeSpans": [ { "spans": [ { "spanId": "1" } ] } ] }\n  ]\n}'), 422)).toEqual([
      located("resourceSpans[0].scopeSpans[0].spans[0].traceId", 3, 36, /traceId must be a hex string/),
    ]);
    const good = JSON.stringify(otlpJson([client("a", { "peer.service": "b" })]));
    expect(expectIssues(otlp(`${good}\n{"resourceSpans": [ {"scopeSpans": 3} ]}\n`), 422)).toEqual([
      expect.objectContaining({ path: "lines[2].resourceSpans[0].scopeSpans", line: 2, message: "scopeSpans must be an array" }),
    ]);
    expect(expectIssues(otlp(`${good}\n{"resourceSpans": [ }\n`), 422)).toEqual([expect.objectContaining({ path: "lines[2]", line: 2 })]);
    expect(expectIssues(otlp("{}"), 422)[0]).toMatchObject({ path: "resourceSpans" });
    expect(expectIssues(otlp("{}", ""), 422)).toContainEqual(expect.objectContaining({ path: "source" }));
  });
});
