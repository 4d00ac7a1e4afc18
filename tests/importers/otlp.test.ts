import { describe, expect, it } from "vitest";
import { importInventory } from "@/importers";
import { normaliseKey } from "@/importers/otlp";
import { expectIssues, expectOk, fixture, located } from "./helpers";

const otlp = (body: string | Buffer, source: string | undefined = "otel-collector") => importInventory({ format: "otlp", body, source });

// Span kinds and attribute names from the OpenTelemetry specification: SpanKind CLIENT = 3
// in opentelemetry-proto trace.proto; `peer.service`, `db.system` from the semantic conventions.
describe("OTLP/JSON traces", () => {
  it("three services and a database client span give observed edges, no components", () => {
    const inv = expectOk(otlp(fixture("otlp/checkout-trace.json")));
    expect(inv.components).toEqual([]);
    expect(inv.observedEdges).toEqual([
      { from: "checkout-api", to: "payments-service", count: 1, evidence: "peer.service" },
      { from: "checkout-api", to: "payments-service", count: 1, evidence: "span-parent" },
      { from: "checkout-api", to: "postgresql", count: 1, evidence: "db.system" },
      { from: "storefront", to: "checkout-api", count: 1, evidence: "peer.service" },
      { from: "storefront", to: "checkout-api", count: 1, evidence: "span-parent" },
    ]);
    // The retry span's parent is not in the file: no edge, one warning.
    expect(inv.warnings).toEqual([expect.objectContaining({ message: expect.stringMatching(/^1 spans have a parent span not in this file/) })]);
  });

  it("counts repeated evidence", () => {
    const span = (id: string, parent: string) => ({ traceId: "01", spanId: id, parentSpanId: parent, kind: 2 });
    const body = JSON.stringify({
      resourceSpans: [
        { resource: { attributes: [{ key: "service.name", value: { stringValue: "a" } }] }, scopeSpans: [{ spans: [span("1", ""), span("2", "")] }] },
        { resource: { attributes: [{ key: "service.name", value: { stringValue: "b" } }] }, scopeSpans: [{ spans: [span("3", "1"), span("4", "2")] }] },
      ],
    });
    expect(expectOk(otlp(body)).observedEdges).toEqual([{ from: "a", to: "b", count: 2, evidence: "span-parent" }]);
  });

  it("normalises keys: lower case, other characters to '-', leading junk dropped", () => {
    expect(normaliseKey("Payments Service")).toBe("payments-service");
    expect(normaliseKey("_internal/Cache:v2")).toBe("internal-cache-v2");
    expect(normaliseKey("???")).toBeNull();
  });

  it("bad JSON and wrong shapes are located", () => {
    expect(expectIssues(otlp('{\n  "resourceSpans": [\n    { "scopeSpans": [ ] },\n  ]\n}'), 422)).toEqual([located("", 3, 26, /trailing comma/)]);
    expect(expectIssues(otlp('{\n  "resourceSpans": [\n    { "scopeSpans": [ { "spans": [ { "spanId": "1" } ] } ] }\n  ]\n}'), 422)).toEqual([
      located("resourceSpans[0].scopeSpans[0].spans[0].traceId", 3, 36, /missing required field "traceId"/),
    ]);
    expect(expectIssues(otlp("{}"), 422)[0]).toMatchObject({ path: "resourceSpans" });
    expect(expectIssues(otlp("{}", ""), 422)).toContainEqual(expect.objectContaining({ path: "source" }));
  });
});
