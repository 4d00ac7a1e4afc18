// Drills through the API (DESIGN §3 blast-radius rules, §4 drills): components and zones failed in one
// drill, and a zone no component declares. Expected sets derived by hand from the rules.
import { beforeAll, describe, expect, it } from "vitest";
import { POST as drills } from "@/app/api/v1/environments/[env]/drills/route";
import { drainAnalysisQueue } from "@/lib/jobs/analysis";
import { pushInventory } from "@/lib/data/push";
import { call, createUser, type TestUser } from "../support/api";

// front needs api (hard) and recs (soft); api needs any_of [db-east, db-west]; recs runs only in east.
const FILE = `pinchpoint: 1
source: drills-repo
components:
  - { key: front, kind: service, tier: 1, replicas: 2, zones: [east, west], needs: [api, { key: recs, strength: soft }] }
  - { key: api, kind: service, tier: 1, replicas: 2, zones: [east, west], needs: [{ any_of: [db-east, db-west] }] }
  - { key: db-east, kind: datastore, zones: [east] }
  - { key: db-west, kind: datastore, zones: [west] }
  - { key: recs, kind: service, zones: [east] }
  - { key: batch, kind: job, needs: [{ key: db-west, strength: startup }] }
`;

let viewer: TestUser;
const drill = (body: unknown) => call(drills, { url: "/api/v1/environments/dr/drills", method: "POST", params: { env: "dr" }, as: viewer, body: body as object });

beforeAll(async () => {
  viewer = await createUser("viewer");
  await pushInventory({ environment: "dr", format: "pinchpoint", body: FILE, dryRun: false, actor: { type: "system", label: "test", canCreateEnvironments: true } });
  await drainAnalysisQueue();
});

describe("drills through the API", () => {
  it("a zone alone: east fails db-east and recs; api keeps db-west, so front is only degraded", async () => {
    const res = await drill({ fail: { zones: ["east"] } });
    expect(res.status).toBe(200);
    expect(res.json).toMatchObject({ down: ["db-east", "recs"], degraded: ["front"] });
  });

  it("components and zones in one drill: east plus db-west leaves the any_of group unmet, so api and front go down", async () => {
    const res = await drill({ fail: { components: ["db-west"], zones: ["east"] } });
    expect(res.status).toBe(200);
    const body = res.json as { down: string[]; degraded: string[]; failed: { components: string[]; zones: string[] }; byTier: Record<string, number> };
    expect([...body.down].sort()).toEqual(["api", "db-east", "db-west", "front", "recs"]);
    expect(body.degraded).toEqual([]);
    expect(body.failed).toEqual({ components: ["db-west"], zones: ["east"] });
    expect(body.byTier).toEqual({ "1": 2, "2": 0, "3": 3, "4": 0 });
    // batch needs db-west only to start: a start-up-only need takes nothing down (DESIGN §10).
    expect(body.down).not.toContain("batch");
  });

  it("a zone no component declares is a 422 naming it and the known zones", async () => {
    const res = await drill({ fail: { components: ["api"], zones: ["north"] } });
    expect(res.status).toBe(422);
    expect(res.json).toMatchObject({
      error: "invalid_request",
      issues: [{ path: "fail.zones", message: 'no component declares zone "north"; known zones: east, west' }],
    });
  });
});

describe("why does one component depend on another (GET …/chain)", () => {
  it("gives the chain of needs with how each hop counts, and says when it runs the other way", async () => {
    const { GET: chain } = await import("@/app/api/v1/environments/[env]/chain/route");
    const ask = (q: string) => call(chain, { url: `/api/v1/environments/dr/chain?${q}`, params: { env: "dr" }, as: viewer });
    const res = await ask("from=front&to=db-west");
    expect(res.status).toBe(200);
    expect(res.json).toMatchObject({
      path: ["front", "api", "db-west"],
      hops: [
        { from: "front", to: "api", strength: "hard", anyOf: false },
        { from: "api", to: "db-west", strength: "hard", anyOf: true },
      ],
      // api needs db-west only as one of an any_of pair: losing db-west alone does not take front down.
      hardAllTheWay: false,
      reversed: false,
    });
    expect((await ask("from=db-west&to=front")).json).toMatchObject({ path: null, reversed: true });
    // batch needs db-west only to start: no runtime chain.
    expect((await ask("from=batch&to=db-west")).json).toMatchObject({ path: null, reversed: false });
    expect((await ask("from=front&to=nope")).status).toBe(404);
    expect((await ask("from=front")).status).toBe(422);
  });
});
