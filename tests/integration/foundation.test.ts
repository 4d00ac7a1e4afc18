// The foundation's promises: 401 JSON for anonymous callers, reads for every role, admin-only
// routes refused to everyone else on the server, and the error shape of DESIGN §4.
import { beforeAll, describe, expect, it } from "vitest";
import { GET as listEnvironments } from "@/app/api/v1/environments/route";
import { GET as listComponents } from "@/app/api/v1/environments/[env]/components/route";
import { GET as listTokens, POST as createTokenRoute } from "@/app/api/v1/tokens/route";
import { ROLES, type Role } from "@/lib/auth/roles";
import { pushInventory } from "@/lib/data/push";
import { call, createUser, type TestUser } from "../support/api";

const users = {} as Record<Role, TestUser>;

const INVENTORY = `pinchpoint: 1
source: shop-repo
environment: staging
components:
  - key: web
    kind: service
    team: shop
    needs: [api]
  - key: api
    kind: service
    needs: [db]
  - key: db
    kind: datastore
`;

beforeAll(async () => {
  for (const role of ROLES) users[role] = await createUser(role);
  await pushInventory({ environment: "staging", format: "pinchpoint", body: INVENTORY, dryRun: false, actor: { type: "system", label: "test", canCreateEnvironments: true } });
});

describe("GET /api/v1/environments", () => {
  it("answers 401 JSON in the error shape to an anonymous caller", async () => {
    const res = await call(listEnvironments, { url: "/api/v1/environments" });
    expect(res.status).toBe(401);
    expect(res.json).toMatchObject({ error: "unauthorized", message: expect.any(String) });
  });

  it("refuses a forged session cookie", async () => {
    const res = await call(listEnvironments, { url: "/api/v1/environments", headers: { cookie: "next-auth.session-token=forged.jwt.value" } });
    expect(res.status).toBe(401);
  });

  it("refuses an unknown bearer token instead of falling back to the session", async () => {
    const res = await call(listEnvironments, { url: "/api/v1/environments", as: { token: "ppt_not-a-real-token" } });
    expect(res.status).toBe(401);
    expect(res.json).toMatchObject({ error: "unauthorized" });
  });

  it.each(ROLES)("lists environments for %s", async (role) => {
    const res = await call(listEnvironments, { url: "/api/v1/environments", as: users[role] });
    expect(res.status).toBe(200);
    expect(res.json).toMatchObject({ items: [{ slug: "staging", latestSnapshot: { number: 1 }, componentCount: 3 }] });
  });
});

describe("GET /api/v1/environments/{env}/components", () => {
  it("lists components with counts and filters", async () => {
    const all = await call(listComponents, { url: "/api/v1/environments/staging/components", params: { env: "staging" }, as: users.viewer });
    expect(all.status).toBe(200);
    expect(all.json).toMatchObject({ counts: { components: 3, unowned: 2, dependencies: 2, undeclared: 0 } });
    const unowned = await call(listComponents, { url: "/api/v1/environments/staging/components?unowned=true", params: { env: "staging" }, as: users.viewer });
    expect((unowned.json as { items: { key: string }[] }).items.map((i) => i.key)).toEqual(["api", "db"]);
    const kind = await call(listComponents, { url: "/api/v1/environments/staging/components?kind=datastore", params: { env: "staging" }, as: users.viewer });
    expect((kind.json as { items: { key: string }[] }).items.map((i) => i.key)).toEqual(["db"]);
  });

  it("answers 404 for an unknown environment and 422 for an unknown query field", async () => {
    const missing = await call(listComponents, { url: "/api/v1/environments/nowhere/components", params: { env: "nowhere" }, as: users.viewer });
    expect(missing.status).toBe(404);
    expect(missing.json).toMatchObject({ error: "not_found" });
    const bad = await call(listComponents, { url: "/api/v1/environments/staging/components?colour=red", params: { env: "staging" }, as: users.viewer });
    expect(bad.status).toBe(422);
    expect(bad.json).toMatchObject({ error: "invalid_request", issues: [expect.objectContaining({ path: expect.stringContaining("query") })] });
  });
});

describe("admin routes", () => {
  it.each(ROLES.filter((r) => r !== "admin"))("refuses %s on the server", async (role) => {
    const list = await call(listTokens, { url: "/api/v1/tokens", as: users[role] });
    expect(list.status).toBe(403);
    const create = await call(createTokenRoute, { url: "/api/v1/tokens", method: "POST", as: users[role], body: { name: "ci", scopes: ["read"] } });
    expect(create.status).toBe(403);
    expect(create.json).toMatchObject({ error: "forbidden" });
  });

  it("lets an admin create a token, shown once, and list it without its secret", async () => {
    const created = await call(createTokenRoute, { url: "/api/v1/tokens", method: "POST", as: users.admin, body: { name: "ci", scopes: ["read"] } });
    expect(created.status).toBe(201);
    const token = (created.json as { token: string }).token;
    expect(token).toMatch(/^ppt_[A-Za-z0-9_-]{40}$/);
    const list = await call(listTokens, { url: "/api/v1/tokens", as: users.admin });
    expect(JSON.stringify(list.json)).not.toContain(token);
    // The token now reads, as a `read` token should.
    const read = await call(listEnvironments, { url: "/api/v1/environments", as: { token } });
    expect(read.status).toBe(200);
  });
});
