// The routes the screens added: rank history (sparklines, trend chart), the CSV export of the
// ranking, and one component's change history. Roles, bad input and real values.
import { beforeAll, describe, expect, it } from "vitest";
import { GET as componentHistory } from "@/app/api/v1/environments/[env]/components/[key]/history/route";
import { GET as rankingsExport } from "@/app/api/v1/environments/[env]/rankings/export/route";
import { GET as rankHistory } from "@/app/api/v1/environments/[env]/rankings/history/route";
import { GET as rankings } from "@/app/api/v1/environments/[env]/rankings/route";
import { ROLES, type Role } from "@/lib/auth/roles";
import { drainAnalysisQueue } from "@/lib/jobs/analysis";
import { pushInventory } from "@/lib/data/push";
import { call, createUser, type TestUser } from "../support/api";

const users = {} as Record<Role, TestUser>;
const ENV = "staging";
const system = { type: "system", label: "screens-test", canCreateEnvironments: true } as const;

// Snapshot 1: a three-node chain web → api → db. Snapshot 2: api's tier changes. Snapshot 3: a
// cache joins and api needs it softly. The name with a comma and quotes exercises CSV quoting.
const v1 = `pinchpoint: 1
source: shop-repo
components:
  - key: web
    name: 'Web, "front"'
    kind: service
    team: shop
    needs: [api]
  - key: api
    kind: service
    team: shop
    tier: 2
    needs: [db]
  - key: db
    kind: datastore
    team: data
`;
const v2 = v1.replace("tier: 2", "tier: 1");
const v3 = v2.replace("    needs: [db]\n", "    needs:\n      - db\n      - key: cache\n        strength: soft\n").concat("  - key: cache\n    kind: cache\n    team: data\n");

async function push(body: string) {
  const result = await pushInventory({ environment: ENV, format: "pinchpoint", body, dryRun: false, actor: system });
  await drainAnalysisQueue();
  return result;
}

beforeAll(async () => {
  for (const role of ROLES) users[role] = await createUser(role);
  await push(v1);
  await push(v2);
  await push(v3);
});

const params = { env: ENV };

describe("GET …/rankings/history", () => {
  const url = `/api/v1/environments/${ENV}/rankings/history`;

  it("answers 401 to an anonymous caller", async () => {
    expect((await call(rankHistory, { url, params })).status).toBe(401);
  });

  it.each(ROLES)("gives %s the rank of named components over the snapshots, oldest first", async (role) => {
    const res = await call(rankHistory, { url: `${url}?keys=api,cache`, params, as: users[role] });
    expect(res.status).toBe(200);
    const body = res.json as { snapshots: number[]; series: Array<{ key: string; points: Array<{ snapshot: number; rank: number | null }> }> };
    expect(body.snapshots).toEqual([1, 2, 3]);
    const api = body.series.find((s) => s.key === "api");
    // api is the only component on a path between two others in every snapshot: rank 1 throughout.
    expect(api?.points.map((p) => p.rank)).toEqual([1, 1, 1]);
    const cache = body.series.find((s) => s.key === "cache");
    expect(cache?.points.map((p) => p.rank === null)).toEqual([true, true, false]);
  });

  it("defaults to the current top components", async () => {
    const res = await call(rankHistory, { url: `${url}?top=2`, params, as: users.viewer });
    expect(res.status).toBe(200);
    const body = res.json as { series: Array<{ key: string }> };
    expect(body.series).toHaveLength(2);
    expect(body.series[0]?.key).toBe("api");
  });

  it.each([["keys=NOT_A_KEY"], ["count=1"], ["top=0"], ["unknown=1"]])("refuses %s with 422", async (q) => {
    const res = await call(rankHistory, { url: `${url}?${q}`, params, as: users.viewer });
    expect(res.status).toBe(422);
    expect(res.json).toMatchObject({ error: "invalid_request" });
  });

  it("answers 404 for an environment nobody pushed", async () => {
    const res = await call(rankHistory, { url: "/api/v1/environments/nowhere/rankings/history", params: { env: "nowhere" }, as: users.viewer });
    expect(res.status).toBe(404);
  });
});

describe("GET …/rankings/export", () => {
  const url = `/api/v1/environments/${ENV}/rankings/export`;

  it("answers 401 to an anonymous caller", async () => {
    expect((await call(rankingsExport, { url, params })).status).toBe(401);
  });

  it("exports every row as CSV in the same order as the rankings API", async () => {
    const res = await call(rankingsExport, { url: `${url}?sort=pagerank&order=desc`, params, as: users.viewer });
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toContain("text/csv");
    expect(res.headers.get("content-disposition")).toContain("snapshot-3.csv");
    const lines = String(res.json).trimEnd().split("\r\n");
    expect(lines[0]).toBe("rank,key,name,kind,team,tier,betweenness,pagerank,eigenvector,clustering,blast_down,blast_degraded,pinch_score,articulation,in_cycle,single_point,entries_dominated,snapshot");
    expect(lines).toHaveLength(1 + 4);
    const api = await call(rankings, { url: `/api/v1/environments/${ENV}/rankings?sort=pagerank&order=desc&limit=1000`, params, as: users.viewer });
    const apiKeys = (api.json as { items: Array<{ key: string }> }).items.map((i) => i.key);
    expect(lines.slice(1).map((l) => l.split(",")[1])).toEqual(apiKeys);
  });

  it("quotes fields with commas and quotes (RFC 4180 §2.6–2.7)", async () => {
    const res = await call(rankingsExport, { url: `${url}?q=web`, params, as: users.viewer });
    const lines = String(res.json).trimEnd().split("\r\n");
    expect(lines).toHaveLength(2);
    expect(lines[1]).toContain(',web,"Web, ""front""",service,shop,');
  });

  it("carries the analysis values: api's betweenness in the chain", async () => {
    const res = await call(rankingsExport, { url: `${url}?sort=key`, params, as: users.viewer });
    const row = String(res.json).split("\r\n").find((l) => l.split(",")[1] === "api")?.split(",");
    // Directed graph web→api→{db,cache}: api lies on web→db and web→cache, 2 of (n−1)(n−2) = 6
    // ordered pairs → 1/3, as NetworkX betweenness_centrality(DiGraph, normalized=True) defines it.
    expect(Number(row?.[6])).toBeCloseTo(1 / 3, 10);
  });

  it("filters like the table does", async () => {
    const res = await call(rankingsExport, { url: `${url}?team=data`, params, as: users.viewer });
    const keys = String(res.json).trimEnd().split("\r\n").slice(1).map((l) => l.split(",")[1]).sort();
    expect(keys).toEqual(["cache", "db"]);
  });

  it.each([["sort=nonsense"], ["tier=9"], ["limit=10"]])("refuses %s with 422", async (q) => {
    expect((await call(rankingsExport, { url: `${url}?${q}`, params, as: users.viewer })).status).toBe(422);
  });
});

describe("GET …/components/{key}/history", () => {
  const url = (key: string) => `/api/v1/environments/${ENV}/components/${key}/history`;

  it("answers 401 to an anonymous caller", async () => {
    expect((await call(componentHistory, { url: url("api"), params: { env: ENV, key: "api" } })).status).toBe(401);
  });

  it("lists the snapshots that added and changed a component, newest first", async () => {
    const res = await call(componentHistory, { url: url("api"), params: { env: ENV, key: "api" }, as: users.viewer });
    expect(res.status).toBe(200);
    const body = res.json as { scanned: number; items: Array<{ number: number; change: string; diff: { componentsChanged: Array<{ changes: Record<string, unknown> }>; dependenciesAdded: Array<{ from: string; to: string; strength: string }> } }> };
    expect(body.scanned).toBe(3);
    expect(body.items.map((i) => [i.number, i.change])).toEqual([
      [3, "changed"],
      [2, "changed"],
      [1, "added"],
    ]);
    expect(body.items[1]?.diff.componentsChanged[0]?.changes).toEqual({ tier: { before: 2, after: 1 } });
    expect(body.items[0]?.diff.dependenciesAdded).toEqual([expect.objectContaining({ from: "api", to: "cache", strength: "soft" })]);
  });

  it("leaves out snapshots that did not touch the component", async () => {
    const res = await call(componentHistory, { url: url("db"), params: { env: ENV, key: "db" }, as: users.viewer });
    expect((res.json as { items: Array<{ number: number }> }).items.map((i) => i.number)).toEqual([1]);
  });

  it("answers 404 for a key no snapshot holds, and for a malformed key", async () => {
    expect((await call(componentHistory, { url: url("ghost"), params: { env: ENV, key: "ghost" }, as: users.viewer })).status).toBe(404);
    expect((await call(componentHistory, { url: url("Bad Key"), params: { env: ENV, key: "Bad Key" }, as: users.viewer })).status).toBe(404);
  });
});
