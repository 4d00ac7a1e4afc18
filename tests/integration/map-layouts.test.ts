// The worker lays the map out after each analysis: a map-layout job per analysed snapshot, one row
// per view in map_layouts, served by GET …/map/layouts for the map's snapshot. The positions are
// ELK's (npm elkjs 0.12); checked here are that every component has one and that they follow the snapshot.
import { beforeAll, describe, expect, it } from "vitest";
import { GET as layouts } from "@/app/api/v1/environments/[env]/map/layouts/route";
import { mapLayoutsResponseSchema } from "@/lib/api/schemas/map";
import { drainAnalysisQueue } from "@/lib/jobs/analysis";
import { drainMapLayoutQueue } from "@/lib/jobs/map-layout";
import { pushInventory } from "@/lib/data/push";
import { call, createUser, type TestUser } from "../support/api";

const file = (extra: string) => `pinchpoint: 1
source: map-repo
components:
  - { key: front, kind: service, team: shop, needs: [api] }
  - { key: api, kind: service, team: shop, needs: [db, cache] }
  - { key: db, kind: datastore, team: data }
  - { key: cache, kind: cache, team: data }
${extra}`;

const system = { type: "system" as const, label: "test", canCreateEnvironments: true as const };
let viewer: TestUser;
const get = () => call(layouts, { url: "/api/v1/environments/maps/map/layouts", params: { env: "maps" }, as: viewer });

beforeAll(async () => {
  viewer = await createUser("viewer");
  await pushInventory({ environment: "maps", format: "pinchpoint", body: file(""), dryRun: false, actor: system });
});

describe("map layouts stored per snapshot", () => {
  it("are empty until the worker has laid the snapshot out, then hold every view", async () => {
    await drainAnalysisQueue();
    const before = await get();
    expect(before.status).toBe(200);
    expect(Object.keys(mapLayoutsResponseSchema.parse(before.json).views)).toEqual([]);

    expect(await drainMapLayoutQueue()).toBe(1);
    const body = mapLayoutsResponseSchema.parse((await get()).json);
    expect(body.snapshot?.number).toBe(1);
    expect(Object.keys(body.views).sort()).toEqual(["flat", "grouped", "team:data", "team:shop", "teams"]);
    expect(Object.keys(body.views.teams!.boxes).sort()).toEqual(["team:data", "team:shop"]);
    expect(Object.keys(body.views["team:shop"]!.boxes).sort()).toEqual(["api", "front"]);
    expect(Object.keys(body.views.flat!.boxes).sort()).toEqual(["api", "cache", "db", "front"]);
  });

  it("follow the newest analysed snapshot", async () => {
    await pushInventory({ environment: "maps", format: "pinchpoint", body: file("  - { key: queue, kind: queue, team: data }\n"), dryRun: false, actor: system });
    await drainAnalysisQueue();
    await drainMapLayoutQueue();
    const body = mapLayoutsResponseSchema.parse((await get()).json);
    expect(body.snapshot?.number).toBe(2);
    expect(Object.keys(body.views["team:data"]!.boxes).sort()).toEqual(["cache", "db", "queue"]);
  });
});
