// The push path end to end against PostgreSQL (DESIGN §1, §2, §4): replacement by source,
// conflicts, placeholders, idempotence, dry runs, concurrency, token scope and binding, roles,
// and bad inputs that change nothing.
import { QueryTypes } from "sequelize";
import { beforeAll, describe, expect, it } from "vitest";
import { POST as push } from "@/app/api/v1/environments/[env]/inventory/route";
import { GET as snapshotsRoute } from "@/app/api/v1/environments/[env]/snapshots/route";
import { GET as diffRoute } from "@/app/api/v1/environments/[env]/snapshots/[a]/diff/[b]/route";
import { GET as schemaRoute } from "@/app/api/v1/schema/inventory/route";
import { db } from "@/models";
import type { Role } from "@/lib/auth/roles";
import { addMembership, upsertTeams } from "@/lib/data/teams";
import { call, createApiToken, createUser, type TestUser } from "../support/api";

const users = {} as Record<Role, TestUser>;

function inventory(source: string, components: string, env = "shop"): string {
  return `pinchpoint: 1\nsource: ${source}\nenvironment: ${env}\ncomponents:\n${components}`;
}

const A1 = inventory(
  "alpha-repo",
  `  - key: web
    kind: service
    team: alpha
    needs: [api, { key: search, strength: soft }]
  - key: api
    kind: service
    needs: [db]
  - key: db
    kind: datastore
`,
);

async function pushAs(as: TestUser | { token: string } | null, body: string, query = "", env = "shop") {
  return call(push, { url: `/api/v1/environments/${env}/inventory${query}`, method: "POST", params: { env }, as, body, headers: { "content-type": "application/yaml" } });
}

async function counts() {
  const [row] = await db().sequelize.query<Record<string, string>>(
    `SELECT (SELECT count(*) FROM snapshots) s, (SELECT count(*) FROM components) c, (SELECT count(*) FROM dependencies) d,
            (SELECT count(*) FROM import_records) i, (SELECT count(*) FROM audit_events) a, (SELECT count(*) FROM environments) e,
            (SELECT count(*) FROM sources) src, (SELECT count(*) FROM analysis_runs) r`,
    { type: QueryTypes.SELECT },
  );
  return row;
}

async function componentKinds(env = "shop") {
  return db().sequelize.query<{ key: string; kind: string; source: string | null }>(
    `SELECT c.key, c.kind, s.name AS source FROM components c JOIN environments e ON e.id = c.environment_id
       LEFT JOIN sources s ON s.id = c.source_id WHERE e.slug = :env ORDER BY c.key`,
    { type: QueryTypes.SELECT, replacements: { env } },
  );
}

beforeAll(async () => {
  for (const role of ["admin", "architect", "lead", "engineer", "viewer"] as const) users[role] = await createUser(role);
  // The engineer and the lead work in the teams whose sources they push (lib/data/source-ownership.ts).
  const teams = await upsertTeams({ teams: ["alpha", "beta"].map((slug) => ({ slug, name: slug, email: null, oncall: null, description: null })) });
  for (const team of teams) {
    await addMembership({ userId: users.engineer.id, teamId: team.id, isLead: false });
    await addMembership({ userId: users.lead.id, teamId: team.id, isLead: true });
  }
  // The environment is created by an admin's first push.
  const first = await pushAs(users.admin, A1);
  expect(first.status).toBe(200);
});

describe("creating environments", () => {
  it("refuses an engineer's first push to a new environment with 404", async () => {
    const res = await pushAs(users.engineer, inventory("alpha-repo", "  - key: x\n    kind: service\n", "brand-new"), "", "brand-new");
    expect(res.status).toBe(404);
    expect(res.json).toMatchObject({ error: "not_found" });
  });
});

describe("a push", () => {
  it("stores the graph, makes snapshot 1 and placeholders for undeclared needs, with a warning", async () => {
    const rows = await componentKinds();
    expect(rows).toEqual([
      { key: "api", kind: "service", source: "alpha-repo" },
      { key: "db", kind: "datastore", source: "alpha-repo" },
      { key: "search", kind: "undeclared", source: null },
      { key: "web", kind: "service", source: "alpha-repo" },
    ]);
    const list = await call(snapshotsRoute, { url: "/api/v1/environments/shop/snapshots", params: { env: "shop" }, as: users.viewer });
    expect(list.json).toMatchObject({ total: 1, items: [{ number: 1, source: "alpha-repo", components: 4, undeclared: 1 }] });
  });

  it("is idempotent: identical content makes no snapshot (changed: false)", async () => {
    const res = await pushAs(users.engineer, A1);
    expect(res.status).toBe(200);
    expect(res.json).toMatchObject({ changed: false, snapshot: null });
  });

  it("a second source declaring the placeholder's key makes it disappear; replacing a source drops only its own rows", async () => {
    const beta = inventory("beta-repo", "  - key: search\n    kind: service\n    team: beta\n");
    const r1 = await pushAs(users.engineer, beta);
    expect(r1.json).toMatchObject({ changed: true, snapshot: { number: 2 } });
    expect((await componentKinds()).find((c) => c.key === "search")).toEqual({ key: "search", kind: "service", source: "beta-repo" });
    // alpha drops db: only alpha's rows change, beta's stay.
    const a2 = inventory("alpha-repo", "  - key: web\n    kind: service\n    needs: [api, { key: search, strength: soft }]\n  - key: api\n    kind: service\n");
    const r2 = await pushAs(users.engineer, a2);
    expect(r2.json).toMatchObject({ changed: true, snapshot: { number: 3 }, diff: { counts: { componentsRemoved: 1, dependenciesRemoved: 1 } } });
    expect((await componentKinds()).map((c) => c.key)).toEqual(["api", "search", "web"]);
    const diff = await call(diffRoute, { url: "/api/v1/environments/shop/snapshots/2/diff/3", params: { env: "shop", a: "2", b: "3" }, as: users.viewer });
    expect(diff.status).toBe(200);
    expect(diff.json).toMatchObject({ from: 2, to: 3, componentsRemoved: [expect.objectContaining({ key: "db" })] });
  });

  it("answers 409 naming both sources when another source declares a taken key, and writes nothing", async () => {
    const before = await counts();
    const res = await pushAs(users.engineer, inventory("gamma-repo", "  - key: web\n    kind: service\n"));
    expect(res.status).toBe(409);
    const message = (res.json as { message: string }).message;
    expect(message).toContain("alpha-repo");
    expect(message).toContain("gamma-repo");
    expect(await counts()).toEqual(before);
  });

  it("a dry run reports the diff and writes nothing at all", async () => {
    const before = await counts();
    const res = await pushAs(users.engineer, inventory("delta-repo", "  - key: cache\n    kind: cache\n"), "?dry_run=true");
    expect(res.status).toBe(200);
    expect(res.json).toMatchObject({ changed: true, dryRun: true, snapshot: null, diff: { counts: { componentsAdded: 1 } } });
    expect(await counts()).toEqual(before);
  });

  it("serialises four concurrent pushes to one environment and loses none", async () => {
    const bodies = [1, 2, 3, 4].map((i) => inventory(`conc-${i}-repo`, `  - key: conc-${i}\n    kind: job\n    needs: [api]\n`));
    const results = await Promise.all(bodies.map((b) => pushAs(users.engineer, b)));
    expect(results.map((r) => r.status)).toEqual([200, 200, 200, 200]);
    const numbers = results.map((r) => (r.json as { snapshot: { number: number } }).snapshot.number).sort();
    expect(new Set(numbers).size).toBe(4);
    const keys = (await componentKinds()).map((c) => c.key);
    for (const i of [1, 2, 3, 4]) expect(keys).toContain(`conc-${i}`);
  });
});

describe("who may push", () => {
  it("refuses a viewer (403) and anonymous callers (401)", async () => {
    expect((await pushAs(users.viewer, A1)).status).toBe(403);
    expect((await pushAs(null, A1)).status).toBe(401);
  });

  it.each(["engineer", "lead", "architect", "admin"] as const)("lets %s push", async (role) => {
    expect((await pushAs(users[role], A1)).status).toBe(200);
  });

  it("needs the inventory:write scope on a token", async () => {
    const readOnly = await createApiToken({ scopes: ["read"], createdBy: users.admin.id });
    expect((await pushAs({ token: readOnly }, A1)).status).toBe(403);
    const writer = await createApiToken({ scopes: ["inventory:write"], createdBy: users.admin.id });
    expect((await pushAs({ token: writer }, A1)).status).toBe(200);
  });

  it("enforces a token's binding to an environment and to a source", async () => {
    const env = await db().models.Environment.findOne({ where: { slug: "shop" } });
    const other = await db().models.Environment.create({ slug: "elsewhere", name: "elsewhere", pinchWeights: null });
    const boundElsewhere = await createApiToken({ scopes: ["inventory:write"], environmentId: other.id, createdBy: users.admin.id });
    expect((await pushAs({ token: boundElsewhere }, A1)).status).toBe(403);
    const boundToBeta = await createApiToken({ scopes: ["inventory:write"], environmentId: env?.id ?? null, source: "beta-repo", createdBy: users.admin.id });
    const res = await pushAs({ token: boundToBeta }, A1);
    expect(res.status).toBe(403);
    expect((res.json as { message: string }).message).toContain("beta-repo");
    expect((await pushAs({ token: boundToBeta }, inventory("beta-repo", "  - key: search\n    kind: service\n    team: beta\n"))).status).toBe(200);
  });

  it("refuses a revoked token", async () => {
    const token = await createApiToken({ scopes: ["inventory:write"], createdBy: users.admin.id });
    await db().models.ApiToken.update({ revokedAt: new Date() }, { where: {} });
    expect((await pushAs({ token }, A1)).status).toBe(401);
  });
});

// Each bad input: a located 4xx, and not one row written anywhere.
const BAD: Array<[string, string, number, RegExp, { path?: string; line?: number }?]> = [
  ["empty body", "", 422, /empty|nothing/i],
  ["not YAML", "pinchpoint: 1\nsource: [unclosed\n", 422, /./],
  ["wrong version", inventory("alpha-repo", "  - key: a\n    kind: service\n").replace("pinchpoint: 1", "pinchpoint: 2"), 422, /version|1/i, { path: "pinchpoint", line: 1 }],
  ["missing version", "source: alpha-repo\ncomponents: []\n", 422, /pinchpoint/i],
  ["missing source", "pinchpoint: 1\ncomponents: []\n", 422, /source/i],
  ["bad source slug", "pinchpoint: 1\nsource: Not A Slug\ncomponents: []\n", 422, /source/i, { path: "source", line: 2 }],
  ["unknown top-level field", "pinchpoint: 1\nsource: alpha-repo\nowner: me\ncomponents: []\n", 422, /owner|unknown|unrecognized/i, { line: 3 }],
  ["unknown component field", inventory("alpha-repo", "  - key: a\n    kind: service\n    colour: red\n"), 422, /colour|unknown|unrecognized/i, { line: 7 }],
  ["bad kind", inventory("alpha-repo", "  - key: a\n    kind: spaceship\n"), 422, /kind/i, { path: "components[0].kind", line: 6 }],
  ["undeclared as a kind", inventory("alpha-repo", "  - key: a\n    kind: undeclared\n"), 422, /kind/i, { path: "components[0].kind" }],
  ["bad key", inventory("alpha-repo", "  - key: Bad Key\n    kind: service\n"), 422, /key/i, { path: "components[0].key", line: 5 }],
  ["self-dependency", inventory("alpha-repo", "  - key: a\n    kind: service\n    needs: [a]\n"), 422, /itself|self/i, { line: 7 }],
  ["duplicate key in one file", inventory("alpha-repo", "  - key: a\n    kind: service\n  - key: a\n    kind: job\n"), 422, /duplicate|twice|more than once/i, { line: 7 }],
  ["tier out of range", inventory("alpha-repo", "  - key: a\n    kind: service\n    tier: 9\n"), 422, /tier/i, { path: "components[0].tier", line: 7 }],
  ["negative replicas", inventory("alpha-repo", "  - key: a\n    kind: service\n    replicas: -2\n"), 422, /replicas/i, { line: 7 }],
  ["bad strength", inventory("alpha-repo", "  - key: a\n    kind: service\n    needs: [{ key: b, strength: medium }]\n"), 422, /strength|hard|soft/i],
  ["any_of with one member", inventory("alpha-repo", "  - key: a\n    kind: service\n    needs: [{ any_of: [b] }]\n"), 422, /any_of|two|2/i],
  ["environment disagrees with the URL", inventory("alpha-repo", "  - key: a\n    kind: service\n", "staging"), 422, /environment/i, { path: "environment" }],
  ["duplicate YAML mapping key", "pinchpoint: 1\nsource: alpha-repo\nsource: beta-repo\ncomponents: []\n", 422, /duplicate|unique/i, { line: 3 }],
  ["components not a list", "pinchpoint: 1\nsource: alpha-repo\ncomponents: web\n", 422, /components|array|list/i, { path: "components" }],
  ["link that is not a URL", inventory("alpha-repo", "  - key: a\n    kind: service\n    links: { runbook: 'ftp//nope' }\n"), 422, /url|link/i],
  ["alias bomb", `pinchpoint: 1\nsource: alpha-repo\nx: &a [1,1,1,1,1,1,1,1,1,1]\ny: &b [*a,*a,*a,*a,*a,*a,*a,*a,*a,*a]\nz: &c [*b,*b,*b,*b,*b,*b,*b,*b,*b,*b]\nw: &d [*c,*c,*c,*c,*c,*c,*c,*c,*c,*c]\nv: &e [*d,*d,*d,*d,*d,*d,*d,*d,*d,*d]\nu: [*e,*e,*e,*e,*e,*e,*e,*e,*e,*e]\ncomponents: []\n`, 413, /alias|expan/i],
  ["a scalar document", "just a string\n", 422, /./],
  ["binary garbage", "\u0000\u0001\u0002\u0003PK\u0003\u0004", 422, /./],
];

describe("bad inputs change nothing", () => {
  it.each(BAD)("%s", async (_name, body, status, message, where) => {
    const before = await counts();
    const res = await pushAs(users.engineer, body);
    expect(res.status).toBe(status);
    const json = res.json as { error: string; issues?: Array<{ path: string; line?: number; column?: number; message: string }> };
    expect(json.error).toBe(status === 413 ? "payload_too_large" : "invalid_inventory");
    expect(json.issues?.length).toBeGreaterThan(0);
    expect(json.issues?.map((i) => i.message).join(" | ")).toMatch(message);
    if (where?.path) expect(json.issues?.map((i) => i.path)).toContain(where.path);
    if (where?.line) expect(json.issues?.map((i) => i.line)).toContain(where.line);
    expect(await counts()).toEqual(before);
  });

  it("reports every problem of a file in one pass", async () => {
    const res = await pushAs(users.engineer, inventory("alpha-repo", "  - key: a\n    kind: spaceship\n  - key: B\n    kind: service\n    tier: 0\n"));
    expect(res.status).toBe(422);
    expect((res.json as { issues: unknown[] }).issues.length).toBeGreaterThanOrEqual(3);
  });

  it("refuses a body over 20 MiB with 413 before parsing it", async () => {
    const before = await counts();
    const res = await pushAs(users.engineer, "#".repeat(20 * 1024 * 1024 + 1));
    expect(res.status).toBe(413);
    expect(res.json).toMatchObject({ error: "payload_too_large" });
    expect(await counts()).toEqual(before);
  });

  it("needs ?source= for formats whose files do not name one", async () => {
    const res = await pushAs(users.engineer, "from,to\na,b\n", "?format=csv");
    expect(res.status).toBe(422);
    expect((res.json as { message: string }).message).toMatch(/source/);
  });
});

describe("JSON Schema", () => {
  it("is served without sign-in and generated from the zod schema", async () => {
    const res = await call(schemaRoute, { url: "/api/v1/schema/inventory" });
    expect(res.status).toBe(200);
    expect(JSON.stringify(res.json)).toContain("components");
  });
});
