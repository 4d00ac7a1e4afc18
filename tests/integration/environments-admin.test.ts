// Environment management (Admin → Environments): create, rename and delete are admin-only on the
// server, bad input writes nothing, a taken slug is a 409, deletion needs the slug typed again,
// refuses the default environment, and takes everything of the environment with it — audited.
import { QueryTypes } from "sequelize";
import { beforeAll, describe, expect, it, vi } from "vitest";
import { GET as listEnvironmentsRoute, POST as createRoute } from "@/app/api/v1/environments/route";
import { DELETE as deleteRoute, GET as summaryRoute, PATCH as renameRoute } from "@/app/api/v1/environments/[env]/route";
import { POST as pushRoute } from "@/app/api/v1/environments/[env]/inventory/route";
import { openApiDocument } from "@/lib/api/openapi";
import { ROLES, type Role } from "@/lib/auth/roles";
import { drainAnalysisQueue } from "@/lib/jobs/analysis";
import { pushInventory } from "@/lib/data/push";
import { db } from "@/models";
import { call, createApiToken, createUser, type TestUser } from "../support/api";

const users = {} as Record<Role, TestUser>;
const system = { type: "system", label: "environments-admin-test", canCreateEnvironments: true } as const;
const tokens = {} as Record<"read" | "inventory:write", string>;

// A small graph: web → api → db plus a soft need on a cache, so that a push leaves rows in every
// per-environment table the cascade must empty.
const INVENTORY = `pinchpoint: 1
source: pantry-repo
components:
  - key: web
    kind: service
    team: storefront
    needs: [api]
  - key: api
    kind: service
    needs:
      - db
      - key: cache
        strength: soft
  - key: db
    kind: datastore
  - key: cache
    kind: cache
`;

async function counts() {
  const { Environment, AuditEvent } = db().models;
  return { environments: await Environment.count(), audit: await AuditEvent.count() };
}

async function auditRows(action: string, targetId: string) {
  return db().sequelize.query<{ actor_label: string; environment_id: string | null; before: unknown; after: unknown }>(
    "SELECT actor_label, environment_id, before, after FROM audit_events WHERE action = :action AND target_id = :targetId ORDER BY created_at",
    { type: QueryTypes.SELECT, replacements: { action, targetId } },
  );
}

/** Rows of one environment, table by table (component_metrics hangs off snapshots, not environments). */
async function rowsOf(environmentId: string): Promise<Record<string, number>> {
  const tables = ["components", "dependencies", "sources", "snapshots", "import_records", "analysis_runs", "api_tokens"];
  const out: Record<string, number> = {};
  for (const table of tables) {
    const [row] = await db().sequelize.query<{ n: string }>(`SELECT count(*) AS n FROM ${table} WHERE environment_id = :id`, { type: QueryTypes.SELECT, replacements: { id: environmentId } });
    out[table] = Number(row?.n ?? 0);
  }
  const [metrics] = await db().sequelize.query<{ n: string }>(
    "SELECT count(*) AS n FROM component_metrics m JOIN analysis_runs r ON r.snapshot_id = m.snapshot_id WHERE r.environment_id = :id",
    { type: QueryTypes.SELECT, replacements: { id: environmentId } },
  );
  out.component_metrics = Number(metrics?.n ?? 0);
  return out;
}

const create = (as: TestUser | { token: string } | null, body: unknown) => call(createRoute, { url: "/api/v1/environments", method: "POST", as, body: body as object });
const rename = (as: TestUser | { token: string } | null, env: string, body: unknown) =>
  call(renameRoute, { url: `/api/v1/environments/${env}`, method: "PATCH", params: { env }, as, body: body as object });
const remove = (as: TestUser | { token: string } | null, env: string, confirm?: string) =>
  call(deleteRoute, { url: `/api/v1/environments/${env}${confirm === undefined ? "" : `?confirm=${encodeURIComponent(confirm)}`}`, method: "DELETE", params: { env }, as });
const summary = (as: TestUser | { token: string } | null, env: string) => call(summaryRoute, { url: `/api/v1/environments/${env}`, params: { env }, as });

beforeAll(async () => {
  vi.stubEnv("PINCHPOINT_DEFAULT_ENV", "production");
  for (const role of ROLES) users[role] = await createUser(role);
  tokens.read = await createApiToken({ scopes: ["read"], createdBy: users.admin.id });
  tokens["inventory:write"] = await createApiToken({ scopes: ["inventory:write"], createdBy: users.admin.id });
  await pushInventory({ environment: "production", format: "pinchpoint", body: INVENTORY, dryRun: false, actor: system });
  await drainAnalysisQueue();
});

describe("who may manage environments", () => {
  it("refuses anonymous callers (401), the four other roles (403) and API tokens (403) on create, rename and delete, writing nothing", async () => {
    await create(users.admin, { slug: "guarded" });
    const before = await counts();
    const runs = [
      (as: TestUser | { token: string } | null) => create(as, { slug: "intruder" }),
      (as: TestUser | { token: string } | null) => rename(as, "guarded", { name: "Hijacked" }),
      (as: TestUser | { token: string } | null) => remove(as, "guarded", "guarded"),
    ];
    for (const run of runs) {
      expect((await run(null)).status).toBe(401);
      for (const role of ROLES.filter((r) => r !== "admin")) {
        const res = await run(users[role]);
        expect({ role, status: res.status }).toEqual({ role, status: 403 });
      }
      for (const scope of ["read", "inventory:write"] as const) {
        const res = await run({ token: tokens[scope] });
        expect({ scope, status: res.status }).toEqual({ scope, status: 403 });
      }
    }
    expect(await counts()).toEqual(before);
    expect((await summary(users.viewer, "guarded")).json).toMatchObject({ slug: "guarded", name: "guarded" });
  });

  it("lets every role and a read token read one environment's summary; a token bound elsewhere is refused", async () => {
    for (const role of ROLES) {
      const res = await summary(users[role], "production");
      expect({ role, status: res.status }).toEqual({ role, status: 200 });
      expect(res.json).toMatchObject({
        slug: "production",
        isDefault: true,
        componentCount: 4,
        snapshotCount: 1,
        sourceCount: 1,
        latestSnapshot: { number: 1, createdAt: expect.any(String) },
        analysis: { status: "done" },
        createdAt: expect.any(String),
      });
    }
    expect((await summary({ token: tokens.read }, "production")).status).toBe(200);
    expect((await summary(null, "production")).status).toBe(401);
    expect((await summary(users.viewer, "nowhere")).status).toBe(404);
    expect((await summary(users.viewer, "Not A Slug")).status).toBe(404);
    const other = await create(users.admin, { slug: "elsewhere" });
    const bound = await createApiToken({ scopes: ["read"], environmentId: (other.json as { id: string }).id, createdBy: users.admin.id });
    expect((await summary({ token: bound }, "production")).status).toBe(403);
    expect((await summary({ token: bound }, "elsewhere")).status).toBe(200);
  });
});

describe("POST /api/v1/environments", () => {
  it.each([
    ["no slug", {}],
    ["an upper-case slug", { slug: "Staging" }],
    ["a slug with a space", { slug: "dr site" }],
    ["a slug starting with a dash", { slug: "-staging" }],
    // DESIGN §1: ^[a-z0-9][a-z0-9-]{0,62}$ allows at most 63 characters.
    ["a 64-character slug", { slug: "a".repeat(64) }],
    ["an empty name", { slug: "qa", name: "   " }],
    ["a 201-character name", { slug: "qa", name: "n".repeat(201) }],
    ["an unknown field", { slug: "qa", pinchWeights: { betweenness: 1 } }],
    ["a body that is not an object", ["qa"]],
  ])("refuses %s with 422 and writes nothing", async (_what, body) => {
    const before = await counts();
    const res = await create(users.admin, body);
    expect(res.status).toBe(422);
    expect(res.json).toMatchObject({ error: "invalid_request", issues: expect.any(Array) });
    expect(await counts()).toEqual(before);
  });

  it("answers 400 to a body that is not JSON", async () => {
    const before = await counts();
    const res = await call(createRoute, { url: "/api/v1/environments", method: "POST", as: users.admin, body: "slug=qa", headers: { "content-type": "application/json" } });
    expect(res.status).toBe(400);
    expect(await counts()).toEqual(before);
  });

  it("creates an empty environment (name defaults to the slug, 63 characters allowed), lists it and audits it", async () => {
    const longest = `q${"a".repeat(62)}`;
    const res = await create(users.admin, { slug: longest });
    expect(res.status).toBe(201);
    expect(res.json).toMatchObject({ slug: longest, name: longest, componentCount: 0, snapshotCount: 0, latestSnapshot: null, analysis: null, isDefault: false });

    const named = await create(users.admin, { slug: "staging", name: "  Staging (eu-west)  " });
    expect(named.status).toBe(201);
    expect(named.json).toMatchObject({ slug: "staging", name: "Staging (eu-west)" });

    const list = await call(listEnvironmentsRoute, { url: "/api/v1/environments", as: users.viewer });
    expect((list.json as { items: { slug: string }[] }).items.map((e) => e.slug)).toEqual(expect.arrayContaining(["production", "staging", longest]));

    const [audit] = await auditRows("environment.create", "staging");
    expect(audit).toMatchObject({ actor_label: users.admin.email, environment_id: (named.json as { id: string }).id, before: null, after: { slug: "staging", name: "Staging (eu-west)" } });
  });

  it("answers 409 when the slug exists, whether created here or by a push, and writes nothing", async () => {
    await create(users.admin, { slug: "twice" });
    const before = await counts();
    for (const slug of ["twice", "production"]) {
      const res = await create(users.admin, { slug, name: "Again" });
      expect(res.status).toBe(409);
      expect(res.json).toMatchObject({ error: "conflict", message: expect.stringContaining(slug) });
    }
    expect(await counts()).toEqual(before);
    expect((await summary(users.admin, "twice")).json).toMatchObject({ name: "twice" });
  });

  it("lets an engineer push into an environment an admin created, though engineers cannot create one by pushing", async () => {
    await create(users.admin, { slug: "pushable" });
    const pushed = await call(pushRoute, { url: "/api/v1/environments/pushable/inventory", method: "POST", params: { env: "pushable" }, as: users.engineer, body: INVENTORY, headers: { "content-type": "application/yaml" } });
    expect(pushed.status).toBe(200);
    const refused = await call(pushRoute, { url: "/api/v1/environments/unmade/inventory", method: "POST", params: { env: "unmade" }, as: users.engineer, body: INVENTORY, headers: { "content-type": "application/yaml" } });
    expect(refused.status).toBe(404);
  });
});

describe("PATCH /api/v1/environments/{env}", () => {
  it("renames (slug unchanged), audits before and after, and leaves no audit row when nothing changes", async () => {
    await create(users.admin, { slug: "renamed" });
    const res = await rename(users.admin, "renamed", { name: "Disaster-recovery site" });
    expect(res.status).toBe(200);
    expect(res.json).toMatchObject({ slug: "renamed", name: "Disaster-recovery site" });
    expect(await auditRows("environment.rename", "renamed")).toEqual([
      expect.objectContaining({ actor_label: users.admin.email, before: { slug: "renamed", name: "renamed" }, after: { slug: "renamed", name: "Disaster-recovery site" } }),
    ]);
    const before = await counts();
    expect((await rename(users.admin, "renamed", { name: "Disaster-recovery site" })).status).toBe(200);
    expect(await counts()).toEqual(before);
  });

  it.each([
    ["no name", {}],
    ["an empty name", { name: "" }],
    ["a slug change", { name: "X", slug: "other" }],
  ])("refuses %s with 422 and writes nothing", async (_what, body) => {
    const before = await counts();
    const res = await rename(users.admin, "production", body);
    expect(res.status).toBe(422);
    expect(await counts()).toEqual(before);
    expect((await summary(users.admin, "production")).json).toMatchObject({ slug: "production", name: "production" });
  });

  it("answers 404 for an environment that does not exist", async () => {
    expect((await rename(users.admin, "nowhere", { name: "Nowhere" })).status).toBe(404);
  });
});

describe("DELETE /api/v1/environments/{env}", () => {
  it("needs ?confirm= equal to the slug (422 otherwise) and deletes nothing without it", async () => {
    await create(users.admin, { slug: "keepme" });
    const before = await counts();
    for (const confirm of [undefined, "", "KEEPME", "keep", "production"]) {
      const res = await remove(users.admin, "keepme", confirm);
      expect({ confirm, status: res.status }).toEqual({ confirm, status: 422 });
      expect(res.json).toMatchObject({ error: "invalid_request", issues: [expect.objectContaining({ path: "query.confirm" })] });
    }
    expect(await counts()).toEqual(before);
    expect((await summary(users.admin, "keepme")).status).toBe(200);
  });

  it("refuses the default environment with 409 and a message that says why", async () => {
    const before = await counts();
    const res = await remove(users.admin, "production", "production");
    expect(res.status).toBe(409);
    expect((res.json as { message: string }).message).toMatch(/default environment.*PINCHPOINT_DEFAULT_ENV/);
    expect(await counts()).toEqual(before);
  });

  it("answers 404 for an environment that does not exist", async () => {
    expect((await remove(users.admin, "nowhere", "nowhere")).status).toBe(404);
  });

  it("deletes the environment and everything of it, bound tokens included, audited; other environments untouched", async () => {
    await pushInventory({ environment: "doomed", format: "pinchpoint", body: INVENTORY, dryRun: false, actor: system });
    await pushInventory({ environment: "doomed", format: "pinchpoint", body: INVENTORY.replace("kind: cache", "kind: cache\n    tier: 2"), dryRun: false, actor: system });
    await drainAnalysisQueue();
    const doomed = (await summary(users.admin, "doomed")).json as { id: string; componentCount: number; snapshotCount: number };
    expect(doomed).toMatchObject({ componentCount: 4, snapshotCount: 2 });
    const bound = await createApiToken({ scopes: ["read"], environmentId: doomed.id, createdBy: users.admin.id });
    expect((await summary({ token: bound }, "doomed")).status).toBe(200);
    expect((await summary(users.admin, "doomed")).json).toMatchObject({ liveTokenCount: 1 });

    const production = (await summary(users.admin, "production")).json as { id: string };
    const productionRows = await rowsOf(production.id);
    const before = await rowsOf(doomed.id);
    // Every table the cascade must empty has something in it first, or the check below proves nothing.
    // (The second snapshot superseded the first before a worker took it: one analysed, four metrics rows.)
    expect(before).toEqual({ components: 4, dependencies: 3, sources: 1, snapshots: 2, import_records: 2, analysis_runs: 2, api_tokens: 1, component_metrics: 4 });

    const res = await remove(users.admin, "doomed", "doomed");
    expect(res.status).toBe(200);
    expect(res.json).toEqual({ slug: "doomed", name: "doomed", removed: { components: 4, snapshots: 2, sources: 1, tokens: 1 } });

    expect(Object.values(await rowsOf(doomed.id)).every((n) => n === 0)).toBe(true);
    expect(await rowsOf(production.id)).toEqual(productionRows);
    expect((await summary(users.admin, "doomed")).status).toBe(404);
    // The bound token went with it: it no longer authenticates at all.
    expect((await summary({ token: bound }, "production")).status).toBe(401);

    const [audit] = await auditRows("environment.delete", "doomed");
    expect(audit).toMatchObject({
      actor_label: users.admin.email,
      environment_id: null,
      after: null,
      before: { slug: "doomed", components: 4, snapshots: 2, latestSnapshot: 2, sources: 1, tokens: [expect.objectContaining({ prefix: bound.slice(0, 12), revoked: false })] },
    });
    // The audit trail of the environment outlives it, detached from the deleted row.
    const created = await auditRows("environment.create", "doomed");
    expect(created).toHaveLength(1);
    expect(created[0]?.environment_id).toBeNull();

    // The slug is free again: a new environment of that name starts from snapshot 1.
    expect((await create(users.admin, { slug: "doomed" })).status).toBe(201);
  });
});

describe("openapi.json", () => {
  it("documents create, rename and the delete confirmation", () => {
    const doc = openApiDocument("http://127.0.0.1:3000") as { paths: Record<string, Record<string, { parameters: { name: string; in: string; required: boolean }[]; requestBody?: unknown }>> };
    expect(doc.paths["/environments"]?.post?.requestBody).toBeDefined();
    expect(doc.paths["/environments/{env}"]?.patch?.requestBody).toBeDefined();
    expect(doc.paths["/environments/{env}"]?.delete?.parameters).toEqual(expect.arrayContaining([expect.objectContaining({ name: "confirm", in: "query", required: true })]));
  });
});
