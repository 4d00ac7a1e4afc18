// Drift (DESIGN §2, §10): observed calls from pushed trace files against the declared inventory.
// Expected lists are worked out by hand below from the definitions: "seen but never declared" is
// the set difference observed − declared over from→to pairs (trace names resolved through aliases),
// "declared but never seen" is declared − observed restricted to dependents that some trace shows
// calling something. Edges follow the semantic-conventions rules of lib/traces/semconv.ts.
import { beforeAll, describe, expect, it } from "vitest";
import { GET as drift } from "@/app/api/v1/environments/[env]/drift/route";
import { importInventory } from "@/importers";
import type { DriftResponse } from "@/lib/api/schemas/drift";
import { getDrift, type Drift } from "@/lib/data/drift";
import { getEnvironmentOrThrow } from "@/lib/data/environments";
import { pushInventory } from "@/lib/data/push";
import { call, createUser, type TestUser } from "../support/api";
import { otlpJson, type SpanSpec } from "../support/otlp";

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

const traces = (spans: SpanSpec[]): string => JSON.stringify(otlpJson(spans));

// Source traces-1. ghost→web: ghost's SERVER span is the parent of web's (parent-span); web→api and
// api→pay-a: named by the SERVER child (child-span); web→search: peer.service, no child; api→orders-pg:
// a database call named by its server.address; web→cache.internal: a host name. Six pairs.
const TRACES_1 = traces([
  { service: "ghost", trace: "a1", id: "1", kind: "server" },
  { service: "web", trace: "a1", id: "2", parent: "1", kind: "server" },
  { service: "web", trace: "a1", id: "3", parent: "2", kind: "client", attrs: { "peer.service": "api" }, durationMs: 40 },
  { service: "web", trace: "a1", id: "4", parent: "2", kind: "client", attrs: { "peer.service": "search" } },
  { service: "api", trace: "a1", id: "5", parent: "3", kind: "server" },
  { service: "api", trace: "a1", id: "6", parent: "5", kind: "client", attrs: { "db.system.name": "postgresql", "server.address": "orders-pg" } },
  { service: "api", trace: "a1", id: "7", parent: "5", kind: "client", error: true },
  { service: "pay-a", trace: "a1", id: "8", parent: "7", kind: "server" },
  { service: "web", trace: "a2", id: "9", kind: "client", attrs: { "peer.service": "api" }, durationMs: 20 },
  { service: "api", trace: "a2", id: "a", parent: "9", kind: "server" },
  { service: "web", trace: "a2", id: "b", kind: "client", attrs: { "db.system.name": "redis", "server.address": "cache.internal:6379" } },
]);

// Source traces-2: web→search named by the SERVER child. One pair.
const TRACES_2 = traces([
  { service: "web", trace: "b1", id: "1", kind: "client", attrs: { "peer.service": "search" } },
  { service: "search", trace: "b1", id: "2", parent: "1", kind: "server" },
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
    // The first trace file brings observed needs into the graph: a new snapshot.
    expect(res.changed).toBe(source === "traces-1" || res.changed);
  }
});

const strip = (rows: Drift["seenNotDeclared"]) => rows.map(({ from, to, calls, evidence, fromKnown, toKnown, declareIn }) => ({ from, to, calls, evidence, fromKnown, toKnown, declareIn }));

describe("drift", () => {
  it("reports nothing observed before any trace is pushed", async () => {
    await pushInventory({ environment: "quiet", format: "pinchpoint", body: FILE, dryRun: false, actor: system });
    const quiet = await getEnvironmentOrThrow({ slug: "quiet" });
    const d = await getDrift({ environmentId: quiet.id });
    expect({ ...d, window: undefined }).toEqual({ window: undefined, observedSources: [], seenNotDeclared: [], declaredNotSeen: [], agreeing: 0, aliasProposals: [] });
  });

  it("lists calls seen but never declared, with evidence, known ends and whose file should declare them", async () => {
    const d = await getDrift({ environmentId });
    expect(strip(d.seenNotDeclared)).toEqual([
      // traces-1 peer.service 1 + traces-2 child-span 1.
      { from: "web", to: "search", calls: 2, evidence: ["child-span", "peer.service"], fromKnown: true, toKnown: false, declareIn: { source: "core-repo", team: "shop" } },
      { from: "api", to: "orders-pg", calls: 1, evidence: ["server.address"], fromKnown: true, toKnown: false, declareIn: { source: "core-repo", team: "orders" } },
      { from: "ghost", to: "web", calls: 1, evidence: ["parent-span"], fromKnown: false, toKnown: true, declareIn: null },
      { from: "web", to: "cache.internal", calls: 1, evidence: ["server.address"], fromKnown: true, toKnown: false, declareIn: { source: "core-repo", team: "shop" } },
    ]);
  });

  it("gives traffic, first and last seen, and a format 1 snippet that the format 1 importer accepts", async () => {
    const d = await getDrift({ environmentId });
    const row = d.seenNotDeclared[0]!;
    expect(row.callsPerMinute).toBeGreaterThan(0);
    expect(row.errorRate).toBe(0);
    expect(Date.parse(row.firstSeenAt)).toBeLessThanOrEqual(Date.parse(row.lastSeenAt));
    expect(row.p95Ms).not.toBeNull();
    expect(row.snippet).toContain("under\n# the needs of component \"web\"");
    const parsed = importInventory({ format: "pinchpoint", body: row.snippet });
    expect(parsed.ok && parsed.inventory.components).toEqual([expect.objectContaining({ key: "web", needs: [expect.objectContaining({ type: "single", key: "search", strength: "hard" })] })]);
    // A caller no file declares gets a whole component to add.
    const ghost = d.seenNotDeclared.find((r) => r.from === "ghost")!;
    const ghostFile = importInventory({ format: "pinchpoint", body: ghost.snippet });
    expect(ghostFile.ok && ghostFile.inventory.components[0]).toMatchObject({ key: "ghost", kind: "service", needs: [expect.objectContaining({ key: "web" })] });
  });

  it("lists declared needs never seen only for dependents that traces show calling something", async () => {
    const d = await getDrift({ environmentId });
    // web and api call things in the traces; worker never does, so worker→db says nothing.
    // Seen: web→api, api→pay-a. Left: web→cache (traced only as cache.internal), api→db, api→ledger, api→pay-b.
    expect(d.declaredNotSeen).toEqual([
      { from: "api", to: "db", strength: "hard", source: "core-repo", team: "orders", anyOf: false },
      { from: "api", to: "ledger", strength: "hard", source: "core-repo", team: "orders", anyOf: false },
      { from: "api", to: "pay-b", strength: "hard", source: "core-repo", team: "orders", anyOf: true },
      { from: "web", to: "cache", strength: "soft", source: "core-repo", team: "shop", anyOf: false },
    ]);
    expect(d.agreeing).toBe(2);
  });

  it("proposes an alias for a host name whose first label is a component key, with a snippet the importer accepts", async () => {
    const d = await getDrift({ environmentId });
    expect(d.aliasProposals.map(({ key, alias, source, team }) => ({ key, alias, source, team }))).toEqual([{ key: "cache", alias: "cache.internal", source: "core-repo", team: "data" }]);
    const parsed = importInventory({ format: "pinchpoint", body: d.aliasProposals[0]!.snippet });
    expect(parsed.ok && parsed.inventory.components[0]?.aliases).toEqual(["cache.internal"]);
  });

  it("once the alias is declared, the traced call counts on the declared need", async () => {
    await pushInventory({ environment: "prod", format: "pinchpoint", body: FILE.replace("{ key: cache, kind: datastore, team: data }", "{ key: cache, kind: datastore, team: data, aliases: [cache.internal] }"), dryRun: false, actor: system });
    const d = await getDrift({ environmentId });
    expect(d.seenNotDeclared.map((r) => `${r.from}>${r.to}`)).not.toContain("web>cache.internal");
    expect(d.declaredNotSeen.map((r) => `${r.from}>${r.to}`)).not.toContain("web>cache");
    expect(d.agreeing).toBe(3);
    expect(d.aliasProposals).toEqual([]);
    await pushInventory({ environment: "prod", format: "pinchpoint", body: FILE, dryRun: false, actor: system });
  });

  it("names each trace source with its distinct pairs and last sighting", async () => {
    const d = await getDrift({ environmentId });
    expect(d.observedSources.map((s) => [s.source, s.edges])).toEqual([
      ["traces-1", 6],
      ["traces-2", 1],
    ]);
    for (const s of d.observedSources) expect(Date.now() - Date.parse(s.lastSeenAt)).toBeLessThan(10 * 60_000);
  });

  it("replaces a source's observed edges on its next file", async () => {
    await pushInventory({ environment: "prod", format: "otlp", source: "traces-2", body: traces([]), dryRun: false, actor: system });
    const d = await getDrift({ environmentId });
    expect(d.observedSources.map((s) => s.source)).toEqual(["traces-1"]);
    expect(d.seenNotDeclared.find((r) => r.to === "search")).toMatchObject({ calls: 1, evidence: ["peer.service"] });
    await pushInventory({ environment: "prod", format: "otlp", source: "traces-2", body: TRACES_2, dryRun: false, actor: system });
  });

  it("serves the same over the API: 401 anonymous, 200 viewer, 404 unknown environment", async () => {
    const anon = await call(drift, { url: "/api/v1/environments/prod/drift", params: { env: "prod" }, as: null });
    expect(anon.status).toBe(401);
    const ok = await call(drift, { url: "/api/v1/environments/prod/drift", params: { env: "prod" }, as: viewer });
    expect(ok.status).toBe(200);
    const body = ok.json as DriftResponse;
    const again = await getDrift({ environmentId });
    // Rates move with the clock between the two reads; everything else is the same. Each list is
    // one page of the full one (25 by default, in the same order).
    const still = (x: Drift) => ({ ...x, window: x.window.days, seenNotDeclared: strip(x.seenNotDeclared) });
    expect(still({ ...body, seenNotDeclared: body.seenNotDeclared.items, declaredNotSeen: body.declaredNotSeen.items })).toEqual(still(again));
    expect(body.seenNotDeclared).toMatchObject({ total: 4, limit: 25, offset: 0 });
    expect(body.declaredNotSeen.total).toBe(again.declaredNotSeen.length);
    const missing = await call(drift, { url: "/api/v1/environments/nowhere/drift", params: { env: "nowhere" }, as: viewer });
    expect(missing.status).toBe(404);
  });

  it("pages, sorts and searches each list on the server, with its own prefixed parameters", async () => {
    const full = await getDrift({ environmentId });
    const get = async (query: string) => {
      const res = await call(drift, { url: `/api/v1/environments/prod/drift?${query}`, params: { env: "prod" }, as: viewer });
      expect({ query, status: res.status }).toEqual({ query, status: 200 });
      return res.json as DriftResponse;
    };
    const pairs = (rows: Array<{ from: string; to: string }>) => rows.map((r) => `${r.from}>${r.to}`);
    // The second page of two: the third and fourth calls of the whole list, most calls first.
    const second = await get("seen_limit=2&seen_offset=2");
    expect(second.seenNotDeclared).toMatchObject({ total: 4, limit: 2, offset: 2 });
    expect(pairs(second.seenNotDeclared.items)).toEqual(pairs(full.seenNotDeclared.slice(2, 4)));
    // By caller, A→Z; the declared list keeps its own (default) order.
    const byCaller = await get("seen_sort=from&seen_order=asc");
    expect(pairs(byCaller.seenNotDeclared.items)).toEqual(pairs([...full.seenNotDeclared].sort((a, b) => (a.from < b.from ? -1 : a.from > b.from ? 1 : 0))));
    expect(pairs(byCaller.declaredNotSeen.items)).toEqual(pairs(full.declaredNotSeen));
    // A search looks at both ends, any case; the total counts what it kept.
    const search = await get("seen_q=SEARCH");
    expect(search.seenNotDeclared.total).toBe(1);
    expect(pairs(search.seenNotDeclared.items)).toEqual(["web>search"]);
    // A bad parameter is a located 422 that names it.
    const bad = await call(drift, { url: "/api/v1/environments/prod/drift?seen_limit=0", params: { env: "prod" }, as: viewer });
    expect(bad.status).toBe(422);
    expect((bad.json as { issues: Array<{ path: string }> }).issues.map((i) => i.path)).toEqual(["query.seen_limit"]);
  });
});
