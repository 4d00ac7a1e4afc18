// Drift (DESIGN §2): observed edges from pushed OTLP/JSON traces against the declared inventory.
// Expected lists are worked out by hand below from the definitions: "seen but never declared" is
// the set difference observed − declared over from→to pairs, "declared but never seen" is
// declared − observed restricted to dependents that some trace shows calling something.
import { beforeAll, describe, expect, it } from "vitest";
import { GET as drift } from "@/app/api/v1/environments/[env]/drift/route";
import { getDrift, type Drift } from "@/lib/data/drift";
import { getEnvironmentOrThrow } from "@/lib/data/environments";
import { pushInventory } from "@/lib/data/push";
import { call, createUser, type TestUser } from "../support/api";

const FILE = `pinchpoint: 1
source: core-repo
components:
  - { key: web, kind: service, team: shop, needs: [api, { key: cache, strength: soft }] }
  - { key: api, kind: service, team: orders, needs: [db, ledger, { any_of: [pay-a, pay-b] }] }
  - { key: worker, kind: service, team: orders, needs: [db] }
  - { key: db, kind: datastore, team: data }
  - { key: ledger, kind: service, team: orders }
  - { key: cache, kind: datastore, team: data }
  - { key: pay-a, kind: external, team: payments }
  - { key: pay-b, kind: external, team: payments }
`;

interface SpanSpec {
  service: string;
  trace: string;
  id: string;
  parent?: string;
  client?: boolean;
  attrs?: Record<string, string>;
}

/** An OTLP/JSON ExportTraceServiceRequest (opentelemetry-proto), one resourceSpans entry per service. */
function traces(spans: SpanSpec[]): string {
  const services = [...new Set(spans.map((s) => s.service))];
  return JSON.stringify({
    resourceSpans: services.map((service) => ({
      resource: { attributes: [{ key: "service.name", value: { stringValue: service } }] },
      scopeSpans: [
        {
          spans: spans
            .filter((s) => s.service === service)
            .map((s) => ({
              traceId: s.trace.padStart(32, "0"),
              spanId: s.id.padStart(16, "0"),
              parentSpanId: s.parent ? s.parent.padStart(16, "0") : "",
              name: "op",
              kind: s.client ? 3 : 2,
              attributes: Object.entries(s.attrs ?? {}).map(([key, v]) => ({ key, value: { stringValue: v } })),
            })),
        },
      ],
    })),
  });
}

// Source traces-1, what the importer derives (importers/otlp): ghost→web span-parent 1;
// web→api peer.service 2 and span-parent 2; web→search peer.service 1; api→postgresql db.system 1;
// api→pay-a span-parent 1. Five distinct pairs.
const TRACES_1 = traces([
  { service: "ghost", trace: "a1", id: "1" },
  { service: "web", trace: "a1", id: "2", parent: "1" },
  { service: "web", trace: "a1", id: "3", parent: "2", client: true, attrs: { "peer.service": "api" } },
  { service: "web", trace: "a1", id: "4", parent: "2", client: true, attrs: { "peer.service": "search" } },
  { service: "api", trace: "a1", id: "5", parent: "3" },
  { service: "api", trace: "a1", id: "6", parent: "5", client: true, attrs: { "db.system": "postgresql" } },
  { service: "api", trace: "a1", id: "7", parent: "5", client: true },
  { service: "pay-a", trace: "a1", id: "8", parent: "7" },
  { service: "web", trace: "a2", id: "9", client: true, attrs: { "peer.service": "api" } },
  { service: "api", trace: "a2", id: "a", parent: "9" },
]);

// Source traces-2: web→search peer.service 1 and span-parent 1. One pair.
const TRACES_2 = traces([
  { service: "web", trace: "b1", id: "1", client: true, attrs: { "peer.service": "search" } },
  { service: "search", trace: "b1", id: "2", parent: "1" },
]);

const system = { type: "system" as const, label: "test", canCreateEnvironments: true as const };
let viewer: TestUser;
let environmentId: string;

beforeAll(async () => {
  viewer = await createUser("viewer");
  await pushInventory({ environment: "prod", format: "pinchpoint", body: FILE, dryRun: false, actor: system });
  const env = await getEnvironmentOrThrow({ slug: "prod" });
  environmentId = env.id;
  for (const [source, body] of [["traces-1", TRACES_1], ["traces-2", TRACES_2]] as const) {
    const res = await pushInventory({ environment: "prod", format: "otlp", source, body, contentType: "application/json", dryRun: false, actor: system });
    // Traces declare nothing: no new snapshot.
    expect(res.changed).toBe(false);
  }
});

describe("drift", () => {
  it("reports nothing observed before any trace is pushed", async () => {
    await pushInventory({ environment: "quiet", format: "pinchpoint", body: FILE, dryRun: false, actor: system });
    const quiet = await getEnvironmentOrThrow({ slug: "quiet" });
    // Every declared edge has an untraced dependent, so none is reported as unseen.
    expect(await getDrift({ environmentId: quiet.id })).toEqual({ observedSources: [], seenNotDeclared: [], declaredNotSeen: [], agreeing: 0 });
  });

  it("lists calls seen but never declared, with evidence, known ends and whose file should declare them", async () => {
    const d = await getDrift({ environmentId });
    expect(d.seenNotDeclared.map(({ lastSeenAt, ...rest }) => (expect(Date.parse(lastSeenAt)).not.toBeNaN(), rest))).toEqual([
      // peer.service 1 + 1 over the two sources = 2; span-parent 1: the larger evidence, not 3 (the same calls).
      { from: "web", to: "search", count: 2, evidence: ["peer.service", "span-parent"], fromKnown: true, toKnown: false, declareIn: { source: "core-repo", team: "shop" } },
      { from: "api", to: "postgresql", count: 1, evidence: ["db.system"], fromKnown: true, toKnown: false, declareIn: { source: "core-repo", team: "orders" } },
      { from: "ghost", to: "web", count: 1, evidence: ["span-parent"], fromKnown: false, toKnown: true, declareIn: null },
    ]);
  });

  it("lists declared needs never seen only for dependents that traces show calling something", async () => {
    const d = await getDrift({ environmentId });
    // web and api call things in the traces; worker never does, so worker→db says nothing.
    // Seen: web→api, api→pay-a. Left: web→cache, api→db, api→ledger, api→pay-b.
    expect(d.declaredNotSeen).toEqual([
      { from: "api", to: "db", strength: "hard", source: "core-repo", team: "orders", anyOf: false },
      { from: "api", to: "ledger", strength: "hard", source: "core-repo", team: "orders", anyOf: false },
      { from: "api", to: "pay-b", strength: "hard", source: "core-repo", team: "orders", anyOf: true },
      { from: "web", to: "cache", strength: "soft", source: "core-repo", team: "shop", anyOf: false },
    ]);
    expect(d.agreeing).toBe(2);
  });

  it("names each trace source with its distinct pairs and last push", async () => {
    const d = await getDrift({ environmentId });
    expect(d.observedSources.map((s) => [s.source, s.edges])).toEqual([
      ["traces-1", 5],
      ["traces-2", 1],
    ]);
    for (const s of d.observedSources) expect(Date.now() - Date.parse(s.lastSeenAt)).toBeLessThan(10 * 60_000);
  });

  it("replaces a source's observed edges on its next push", async () => {
    await pushInventory({ environment: "prod", format: "otlp", source: "traces-2", body: traces([]), dryRun: false, actor: system });
    const d = await getDrift({ environmentId });
    expect(d.observedSources.map((s) => s.source)).toEqual(["traces-1"]);
    expect(d.seenNotDeclared.find((r) => r.to === "search")).toMatchObject({ count: 1, evidence: ["peer.service"] });
    await pushInventory({ environment: "prod", format: "otlp", source: "traces-2", body: TRACES_2, dryRun: false, actor: system });
  });

  it("serves the same over the API: 401 anonymous, 200 viewer, 404 unknown environment", async () => {
    const anon = await call(drift, { url: "/api/v1/environments/prod/drift", params: { env: "prod" }, as: null });
    expect(anon.status).toBe(401);
    const ok = await call(drift, { url: "/api/v1/environments/prod/drift", params: { env: "prod" }, as: viewer });
    expect(ok.status).toBe(200);
    const body = ok.json as Drift;
    expect(body).toEqual(await getDrift({ environmentId }));
    expect(body.seenNotDeclared).toHaveLength(3);
    const missing = await call(drift, { url: "/api/v1/environments/nowhere/drift", params: { env: "nowhere" }, as: viewer });
    expect(missing.status).toBe(404);
  });
});
