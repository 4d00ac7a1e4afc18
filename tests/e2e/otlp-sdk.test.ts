// Traces from the official OpenTelemetry JavaScript SDK, exported by its own OTLP/HTTP exporters
// (JSON: @opentelemetry/exporter-trace-otlp-http, protobuf: @opentelemetry/exporter-trace-otlp-proto)
// to the running app's receiver, then read back as observed edges and rankings: a trace-only
// environment gets components, an analysis and rankings with nothing declared.
// Uses its own environment (`sdk-traces`), which no other test reads.
import { context, SpanKind, trace } from "@opentelemetry/api";
import { OTLPTraceExporter as JsonExporter } from "@opentelemetry/exporter-trace-otlp-http";
import { OTLPTraceExporter as ProtoExporter } from "@opentelemetry/exporter-trace-otlp-proto";
import { resourceFromAttributes } from "@opentelemetry/resources";
import { BasicTracerProvider, SimpleSpanProcessor } from "@opentelemetry/sdk-trace-base";
import type { Page } from "playwright-core";
import { beforeAll, describe, expect, it } from "vitest";
import type { DriftResponse as Drift } from "@/lib/api/schemas/drift";
import { baseUrl, browserForFile, screenshot } from "./browser";
import { signedInPage } from "./pages/signin";

const browser = browserForFile();
const ENV = "sdk-traces";
let page: Page;
let token: string;

beforeAll(async () => {
  page = await signedInPage(browser(), "admin");
  const res = await page.request.post(`${baseUrl()}/api/v1/tokens`, { headers: { origin: baseUrl() }, data: { name: "e2e-otlp-sdk", scopes: ["inventory:write"] } });
  expect(res.status()).toBe(201);
  token = ((await res.json()) as { token: string }).token;
});

describe("the official SDK exporting to the receiver", () => {
  it("exports over OTLP/HTTP JSON (endpoint from OTEL_EXPORTER_OTLP_ENDPOINT, completed with /v1/traces) and protobuf, and the app ranks what it saw", async () => {
    // The standard variables, as a deployment would set them; the exporter reads them when built.
    process.env.OTEL_EXPORTER_OTLP_ENDPOINT = `${baseUrl()}/api/v1/environments/${ENV}/otlp`;
    process.env.OTEL_EXPORTER_OTLP_HEADERS = `Authorization=Bearer ${token}`;
    const frontendExporter = new JsonExporter();
    delete process.env.OTEL_EXPORTER_OTLP_ENDPOINT;
    delete process.env.OTEL_EXPORTER_OTLP_HEADERS;
    const cartExporter = new ProtoExporter({ url: `${baseUrl()}/api/v1/environments/${ENV}/otlp/v1/traces`, headers: { Authorization: `Bearer ${token}` } });

    // Each service has its own provider and exporter, as two processes would: the client span and
    // its server child reach the receiver in different requests.
    const frontend = new BasicTracerProvider({ resource: resourceFromAttributes({ "service.name": "sdk-frontend" }), spanProcessors: [new SimpleSpanProcessor(frontendExporter)] });
    const cart = new BasicTracerProvider({ resource: resourceFromAttributes({ "service.name": "sdk-cart" }), spanProcessors: [new SimpleSpanProcessor(cartExporter)] });
    for (let i = 0; i < 5; i++) {
      const root = frontend.getTracer("e2e").startSpan("GET /basket", { kind: SpanKind.SERVER });
      const call = frontend.getTracer("e2e").startSpan("GET", { kind: SpanKind.CLIENT, attributes: { "http.request.method": "GET", "server.address": "cart-lb.internal" } }, trace.setSpan(context.active(), root));
      const served = cart.getTracer("e2e").startSpan("GET /items", { kind: SpanKind.SERVER }, trace.setSpanContext(context.active(), call.spanContext()));
      const db = cart.getTracer("e2e").startSpan("HGETALL", { kind: SpanKind.CLIENT, attributes: { "db.system.name": "redis", "server.address": "sdk-redis" } }, trace.setSpan(context.active(), served));
      db.end();
      served.end();
      call.end();
      root.end();
    }
    await Promise.all([frontend.forceFlush(), cart.forceFlush()]);
    await Promise.all([frontend.shutdown(), cart.shutdown()]);

    // The observed edges, with their traffic.
    await expect
      .poll(async () => {
        const res = await page.request.get(`${baseUrl()}/api/v1/environments/${ENV}/drift`);
        if (res.status() !== 200) return [];
        return ((await res.json()) as Drift).seenNotDeclared.items.map((r) => `${r.from}>${r.to}:${r.calls}:${r.evidence.join(",")}`).sort();
      }, { timeout: 30_000, interval: 500 })
      .toEqual(["sdk-cart>sdk-redis:5:server.address", "sdk-frontend>sdk-cart:5:child-span"]);

    // The worker takes the set into the graph and analyses it: rankings, with the view they show.
    let rankings: { graphView?: { view: string }; items: Array<{ key: string; kind: string; betweenness: number }> } | null = null;
    await expect
      .poll(async () => {
        const res = await page.request.get(`${baseUrl()}/api/v1/environments/${ENV}/rankings`);
        if (res.status() !== 200) return 0;
        rankings = (await res.json()) as typeof rankings;
        return rankings?.items.length ?? 0;
      }, { timeout: 60_000, interval: 1_000 })
      .toBe(3);
    expect(rankings!.graphView?.view).toBe("observed");
    // sdk-frontend → sdk-cart → sdk-redis: cart alone lies between the other two, normalised by (n−1)(n−2) = 2.
    expect(rankings!.items.map((i) => [i.key, i.kind, i.betweenness])).toEqual([
      ["sdk-cart", "service", 0.5],
      ["sdk-frontend", "service", 0],
      ["sdk-redis", "datastore", 0],
    ]);

    await page.goto(`${baseUrl()}/environments/${ENV}/pinch-points`);
    await page.getByTestId("graph-view").waitFor();
    expect(await page.getByTestId("graph-view").textContent()).toContain("needs seen in traces");
    await screenshot(page, "otlp-sdk-pinch-points");
    await page.goto(`${baseUrl()}/environments/${ENV}/components/sdk-cart`);
    await page.getByTestId("edge-traffic").first().waitFor();
    expect(await page.getByTestId("edge-traffic").first().textContent()).toMatch(/\/min/);
    await screenshot(page, "otlp-sdk-component");
  });
});
