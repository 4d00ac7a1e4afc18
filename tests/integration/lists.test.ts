// Lists that grow with the estate are paged, sorted and filtered on the server, all the same way
// (lib/api/schemas/common.ts): `limit`, `offset`, `sort`, `order` and the list's filters, answered
// with `{ total, limit, offset, items }`. Each expectation is worked out here from the inventory
// pushed (JavaScript's own sort and filter over a list written out below), not read back from the
// code under test. Pages are contiguous: walking every page gives the whole sorted list once.
import type { NextRequest } from "next/server";
import { beforeAll, describe, expect, it } from "vitest";
import { GET as auditRoute } from "@/app/api/v1/audit/route";
import { GET as componentsRoute } from "@/app/api/v1/environments/[env]/components/route";
import { GET as importsRoute } from "@/app/api/v1/environments/[env]/imports/route";
import { GET as snapshotsRoute } from "@/app/api/v1/environments/[env]/snapshots/route";
import { GET as teamRoute } from "@/app/api/v1/teams/[slug]/route";
import { GET as unownedRoute } from "@/app/api/v1/teams/unowned/route";
import { pushInventory } from "@/lib/data/push";
import { db } from "@/models";
import { call, createUser, type TestUser } from "../support/api";

const system = { type: "system" as const, label: "test", canCreateEnvironments: true as const };

/** 30 components: key, team (every fifth unowned), tier, replicas; written out so expectations need no code under test. */
const ROWS = Array.from({ length: 30 }, (_, i) => ({
  key: `svc-${String(i).padStart(2, "0")}`,
  name: `Service ${String.fromCharCode(65 + ((i * 7) % 26))}${i}`,
  team: i % 5 === 0 ? null : ["alpha", "bravo", "charlie"][i % 3]!,
  tier: (i % 4) + 1,
  replicas: (i % 3) + 1,
  kind: i % 6 === 0 ? "datastore" : "service",
}));

const yaml = (source: string, rows: typeof ROWS) =>
  `pinchpoint: 1\nsource: ${source}\ncomponents:\n${rows
    .map((r) => `  - key: ${r.key}\n    name: "${r.name}"\n    kind: ${r.kind}\n    tier: ${r.tier}\n    replicas: ${r.replicas}\n${r.team ? `    team: ${r.team}\n` : ""}`)
    .join("")}`;

let viewer: TestUser;
let architect: TestUser;

beforeAll(async () => {
  viewer = await createUser("viewer");
  architect = await createUser("architect");
  for (const slug of ["alpha", "bravo", "charlie"]) await db().models.Team.create({ slug, name: slug.toUpperCase(), email: null, oncall: null, description: null });
  // Three pushes (two sources), so the snapshot and import lists have a few rows.
  await pushInventory({ environment: "lists", format: "pinchpoint", body: yaml("lists-a", ROWS.slice(0, 20)), dryRun: false, actor: system });
  await pushInventory({ environment: "lists", format: "pinchpoint", body: yaml("lists-b", ROWS.slice(20)), dryRun: false, actor: system });
  await pushInventory({ environment: "lists", format: "pinchpoint", body: yaml("lists-a", ROWS.slice(0, 20)), dryRun: false, actor: system });
});

type Page<T> = { total: number; limit: number; offset: number; items: T[] };

async function get<T>(route: (req: NextRequest, ctx: { params: Promise<never> }) => Promise<Response>, url: string, params: Record<string, string>, as: TestUser = viewer): Promise<Page<T>> {
  const res = await call(route, { url, params: params as never, as });
  expect({ url, status: res.status }).toEqual({ url, status: 200 });
  return res.json as Page<T>;
}

const by = <T>(key: (r: T) => string | number | null, order: "asc" | "desc", tie: (r: T) => string) => (a: T, b: T) => {
  const x = key(a);
  const y = key(b);
  if (x === y) return tie(a) < tie(b) ? -1 : tie(a) > tie(b) ? 1 : 0;
  if (x === null) return 1;
  if (y === null) return -1;
  return (x < y ? -1 : 1) * (order === "asc" ? 1 : -1);
};

describe("the component list", () => {
  const url = (q: string) => `/api/v1/environments/lists/components?${q}`;

  it("walks every page of a sort exactly once, in the sort's order", async () => {
    const expected = [...ROWS].sort(by((r) => r.team, "desc", (r) => r.key)).map((r) => r.key);
    const seen: string[] = [];
    for (let offset = 0; offset < 30; offset += 7) {
      const page = await get<{ key: string }>(componentsRoute, url(`sort=team&order=desc&limit=7&offset=${offset}`), { env: "lists" });
      expect(page).toMatchObject({ total: 30, limit: 7, offset });
      seen.push(...page.items.map((i) => i.key));
    }
    // PostgreSQL puts NULLs first in a descending sort unless told otherwise: nulls last either way.
    expect(seen).toEqual(expected);
  });

  it("reads the sort's own first order when none is given (measures biggest first, text A→Z)", async () => {
    const replicas = await get<{ key: string }>(componentsRoute, url("sort=replicas&limit=100"), { env: "lists" });
    expect(replicas.items.map((i) => i.key)).toEqual([...ROWS].sort(by((r) => r.replicas, "asc", (r) => r.key)).map((r) => r.key));
    const names = await get<{ key: string }>(componentsRoute, url("sort=name&order=desc&limit=100"), { env: "lists" });
    expect(names.items.map((i) => i.key)).toEqual([...ROWS].sort(by((r) => r.name, "desc", (r) => r.key)).map((r) => r.key));
  });

  it("filters by team, kind, tier, text and ownership, and counts what the filters keep", async () => {
    const cases: Array<[string, (r: (typeof ROWS)[number]) => boolean]> = [
      ["team=bravo", (r) => r.team === "bravo"],
      ["kind=datastore", (r) => r.kind === "datastore"],
      ["tier=2", (r) => r.tier === 2],
      ["unowned=true", (r) => r.team === null],
      ["q=SVC-1", (r) => r.key.startsWith("svc-1")],
      ["tier=1&unowned=true", (r) => r.tier === 1 && r.team === null],
    ];
    for (const [q, keep] of cases) {
      const page = await get<{ key: string }>(componentsRoute, url(`${q}&limit=100`), { env: "lists" });
      const expected = ROWS.filter(keep).map((r) => r.key).sort();
      expect({ q, total: page.total, keys: page.items.map((i) => i.key) }).toEqual({ q, total: expected.length, keys: expected });
    }
  });

  it("says how many there are on a page past the end, and refuses bad parameters with a located 422", async () => {
    const past = await get<{ key: string }>(componentsRoute, url("limit=10&offset=100"), { env: "lists" });
    expect(past).toMatchObject({ total: 30, items: [] });
    for (const [q, path] of [
      ["limit=0", "query.limit"],
      ["limit=1001", "query.limit"],
      ["offset=-1", "query.offset"],
      ["sort=colour", "query.sort"],
      ["order=sideways", "query.order"],
      ["tier=5", "query.tier"],
    ] as const) {
      const res = await call(componentsRoute, { url: url(q), params: { env: "lists" }, as: viewer });
      expect({ q, status: res.status, paths: (res.json as { issues?: Array<{ path: string }> }).issues?.map((i) => i.path) }).toEqual({ q, status: 422, paths: [path] });
    }
  });
});

describe("the unowned queue and a team's components", () => {
  it("pages the unowned queue, filtered to one environment and a text", async () => {
    const unowned = ROWS.filter((r) => r.team === null).map((r) => r.key).sort();
    const first = await get<{ key: string; environment: string }>(unownedRoute, "/api/v1/teams/unowned?environment=lists&sort=key&limit=4", {});
    expect(first).toMatchObject({ total: unowned.length, limit: 4, offset: 0 });
    expect(first.items.map((i) => i.key)).toEqual(unowned.slice(0, 4));
    const rest = await get<{ key: string }>(unownedRoute, "/api/v1/teams/unowned?environment=lists&sort=key&limit=4&offset=4", {});
    expect(rest.items.map((i) => i.key)).toEqual(unowned.slice(4));
    const text = await get<{ key: string }>(unownedRoute, "/api/v1/teams/unowned?environment=lists&q=svc-2", {});
    expect(text.items.map((i) => i.key).sort()).toEqual(unowned.filter((k) => k.startsWith("svc-2")));
  });

  it("pages a team's components by tier, and finds one by text", async () => {
    const mine = ROWS.filter((r) => r.team === "alpha");
    const res = await get<{ key: string }>(teamRoute, "/api/v1/teams/alpha?sort=tier&order=desc&limit=3", { slug: "alpha" });
    // The team answers with its own page envelope under `components` (the rest of the team beside it).
    const page = (res as unknown as { components: Page<{ key: string }> }).components;
    expect(page).toMatchObject({ total: mine.length, limit: 3, offset: 0 });
    // Ties in tier break by environment, then key.
    expect(page.items.map((i) => i.key)).toEqual([...mine].sort(by((r) => r.tier, "desc", (r) => r.key)).slice(0, 3).map((r) => r.key));
    const found = (await get<{ key: string }>(teamRoute, "/api/v1/teams/alpha?q=Service%20", { slug: "alpha" })) as unknown as { components: Page<{ key: string }> };
    expect(found.components.total).toBe(mine.length);
  });
});

describe("history lists", () => {
  it("pages snapshots newest first, and sorts them by size", async () => {
    const newest = await get<{ number: number; components: number }>(snapshotsRoute, "/api/v1/environments/lists/snapshots?limit=1", { env: "lists" });
    // The third push repeats the first source's file: nothing changed, no snapshot.
    expect(newest).toMatchObject({ total: 2, items: [{ number: 2, components: 30 }] });
    const small = await get<{ number: number }>(snapshotsRoute, "/api/v1/environments/lists/snapshots?sort=components&order=asc", { env: "lists" });
    expect(small.items.map((s) => s.number)).toEqual([1, 2]);
  });

  it("pages and filters the import history: three pushes, two by source lists-a", async () => {
    const all = await get<{ source: string; changed: boolean }>(importsRoute, "/api/v1/environments/lists/imports", { env: "lists" });
    expect(all.total).toBe(3);
    expect(all.items.map((i) => [i.source, i.changed])).toEqual([
      ["lists-a", false],
      ["lists-b", true],
      ["lists-a", true],
    ]);
    const a = await get<{ source: string }>(importsRoute, "/api/v1/environments/lists/imports?q=LISTS-A&limit=1&offset=1", { env: "lists" });
    expect(a).toMatchObject({ total: 2, limit: 1, offset: 1, items: [{ source: "lists-a" }] });
    const bySource = await get<{ source: string }>(importsRoute, "/api/v1/environments/lists/imports?sort=source&order=desc", { env: "lists" });
    expect(bySource.items.map((i) => i.source)).toEqual(["lists-b", "lists-a", "lists-a"]);
  });

  it("sorts the audit log by action", async () => {
    const page = await get<{ action: string }>(auditRoute, "/api/v1/audit?environment=lists&sort=action&order=asc&limit=200", {}, architect);
    const actions = page.items.map((i) => i.action);
    // The environment's creation and its three pushes at least.
    expect(actions.length).toBeGreaterThanOrEqual(4);
    expect(actions).toEqual([...actions].sort());
    expect(page.total).toBe(actions.length);
  });
});
