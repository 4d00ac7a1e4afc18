// The token routes the Admin → Tokens screen uses: admin only, 422 with nothing written on bad
// input, the secret shown once and never listed, revocation audited and effective at once.
import { beforeAll, describe, expect, it } from "vitest";
import { GET as listTokensRoute, POST as createTokenRoute } from "@/app/api/v1/tokens/route";
import { DELETE as revokeTokenRoute } from "@/app/api/v1/tokens/[id]/route";
import { GET as listEnvironments } from "@/app/api/v1/environments/route";
import { ROLES, type Role } from "@/lib/auth/roles";
import { pushInventory } from "@/lib/data/push";
import { db } from "@/models";
import { call, createUser, type TestUser } from "../support/api";

const users = {} as Record<Role, TestUser>;
const someId = "00000000-0000-4000-8000-000000000000";

async function counts() {
  const { ApiToken, AuditEvent } = db().models;
  return { tokens: await ApiToken.count(), audit: await AuditEvent.count() };
}

beforeAll(async () => {
  for (const role of ROLES) users[role] = await createUser(role);
  await pushInventory({
    environment: "staging",
    format: "pinchpoint",
    body: "pinchpoint: 1\nsource: shop-repo\ncomponents:\n  - key: web\n    kind: service\n",
    dryRun: false,
    actor: { type: "system", label: "test", canCreateEnvironments: true },
  });
});

describe("token admin routes", () => {
  it("refuses anonymous callers (401) and every role but admin (403) on list, create and revoke, writing nothing", async () => {
    const before = await counts();
    const runs = [
      (as: TestUser | null) => call(listTokensRoute, { url: "/api/v1/tokens", as }),
      (as: TestUser | null) => call(createTokenRoute, { url: "/api/v1/tokens", method: "POST", as, body: { name: "x", scopes: ["read"] } }),
      (as: TestUser | null) => call(revokeTokenRoute, { url: `/api/v1/tokens/${someId}`, method: "DELETE", params: { id: someId }, as }),
    ];
    for (const run of runs) {
      expect((await run(null)).status).toBe(401);
      for (const role of ROLES.filter((r) => r !== "admin")) expect((await run(users[role])).status, role).toBe(403);
    }
    expect(await counts()).toEqual(before);
  });

  it.each([
    ["no name", { name: "", scopes: ["read"] }],
    ["no scopes", { name: "ci", scopes: [] }],
    ["an unknown scope", { name: "ci", scopes: ["admin"] }],
    ["a bad source", { name: "ci", scopes: ["read"], source: "Not A Source" }],
    ["an unknown environment", { name: "ci", scopes: ["read"], environment: "nowhere" }],
    ["an unknown field", { name: "ci", scopes: ["read"], role: "admin" }],
  ])("refuses %s with 422 and writes nothing", async (_what, body) => {
    const before = await counts();
    const res = await call(createTokenRoute, { url: "/api/v1/tokens", method: "POST", as: users.admin, body });
    expect(res.status).toBe(422);
    expect(await counts()).toEqual(before);
  });

  it("creates a bound token shown once, lists it without the secret, revokes it (audited)", async () => {
    const res = await call(createTokenRoute, { url: "/api/v1/tokens", method: "POST", as: users.admin, body: { name: "shop CI", scopes: ["inventory:write"], environment: "staging", source: "shop-repo" } });
    expect(res.status).toBe(201);
    expect(res.headers.get("cache-control")).toBe("no-store");
    const created = res.json as { id: string; token: string; prefix: string; environment: string; source: string };
    expect(created.token).toMatch(/^ppt_/);
    expect(created).toMatchObject({ environment: "staging", source: "shop-repo" });

    const list = await call(listTokensRoute, { url: "/api/v1/tokens", as: users.admin });
    expect(JSON.stringify(list.json)).not.toContain(created.token);
    const listed = (list.json as { items: { id: string; prefix: string; createdByEmail: string | null }[] }).items.find((t) => t.id === created.id);
    expect(listed?.prefix).toBe(created.token.slice(0, 12));
    // The admin screen's "Made by" column: the creator by e-mail, not by account id.
    expect(listed?.createdByEmail).toBe(users.admin.email);

    // The token works until it is revoked.
    const asToken = { token: created.token };
    const readScope = await call(listEnvironments, { url: "/api/v1/environments", as: asToken });
    expect(readScope.status).toBe(403); // inventory:write only, no read scope
    const revoked = await call(revokeTokenRoute, { url: `/api/v1/tokens/${created.id}`, method: "DELETE", params: { id: created.id }, as: users.admin });
    expect(revoked.status).toBe(200);
    expect(revoked.json).toMatchObject({ revokedAt: expect.any(String) });
    expect((await call(listEnvironments, { url: "/api/v1/environments", as: asToken })).status).toBe(401);

    const actions = (await db().models.AuditEvent.findAll({ where: { targetId: created.id }, order: [["createdAt", "ASC"]] })).map((a) => [a.action, a.actorLabel]);
    expect(actions).toEqual([
      ["token.create", users.admin.email],
      ["token.revoke", users.admin.email],
    ]);
  });

  it("answers 404 when revoking an unknown token", async () => {
    const res = await call(revokeTokenRoute, { url: `/api/v1/tokens/${someId}`, method: "DELETE", params: { id: someId }, as: users.admin });
    expect(res.status).toBe(404);
  });
});
