// The audit log API: readable by architects and admins only (the `reviews:write` rule), filtered by
// action, actor, environment, target and whole UTC days, paginated, with before and after intact.
import { beforeAll, describe, expect, it } from "vitest";
import { GET as auditRoute } from "@/app/api/v1/audit/route";
import { db } from "@/models";
import { ROLES, type Role } from "@/lib/auth/roles";
import { recordAudit } from "@/lib/data/audit";
import { pushInventory } from "@/lib/data/push";
import { call, createApiToken, createUser, type TestUser } from "../support/api";

const users = {} as Record<Role, TestUser>;

type AuditBody = {
  total: number;
  limit: number;
  offset: number;
  actions: string[];
  items: Array<{ action: string; actorLabel: string; targetId: string; environment: string | null; at: string; before: unknown; after: unknown }>;
};

const get = async (as: TestUser | { token: string } | null, query = "") => {
  const res = await call(auditRoute, { url: `/api/v1/audit${query}`, as });
  return { status: res.status, body: res.json as AuditBody };
};

beforeAll(async () => {
  for (const role of ROLES) users[role] = await createUser(role);
  await pushInventory({
    environment: "staging",
    format: "pinchpoint",
    body: "pinchpoint: 1\nsource: s\ncomponents:\n  - key: api\n    kind: service\n",
    dryRun: false,
    actor: { type: "system", label: "test", canCreateEnvironments: true },
  });
  const env = await db().models.Environment.findOne({ where: { slug: "staging" } });
  const alice = { type: "user" as const, id: users.admin.id, email: "alice@test.example", name: "Alice", role: "admin" as const, label: "alice@test.example" };
  const bob = { type: "user" as const, id: users.architect.id, email: "bob@test.example", name: "Bob", role: "architect" as const, label: "bob@test.example" };
  // Known events on known days, written through the same function the app uses.
  await recordAudit({ actor: alice, action: "team.update", targetType: "team", targetId: "shop", before: { oncall: "old rota" }, after: { oncall: "new rota" } });
  await recordAudit({ actor: bob, action: "review.create", targetType: "component", targetId: "api", environmentId: env?.id, before: null, after: { status: "accepted" } });
  await recordAudit({ actor: bob, action: "review.update", targetType: "component", targetId: "api", environmentId: env?.id, before: { status: "accepted" }, after: { status: "resolved" } });
  await recordAudit({ actor: alice, action: "token.create", targetType: "token", targetId: "tok-1", after: { name: "ci" } });
  await db().sequelize.query("UPDATE audit_events SET created_at = '2030-03-10T23:30:00Z' WHERE action = 'team.update'");
  await db().sequelize.query("UPDATE audit_events SET created_at = '2030-03-11T00:30:00Z' WHERE action = 'review.create'");
});

describe("GET /api/v1/audit — who may read it", () => {
  it("answers 401 to an anonymous caller", async () => {
    expect((await get(null)).status).toBe(401);
  });

  it.each(["viewer", "engineer", "lead"] as const)("refuses %s with 403", async (role) => {
    const res = await get(users[role]);
    expect(res.status).toBe(403);
  });

  it("refuses a read token: tokens never read the audit log", async () => {
    const token = await createApiToken({ scopes: ["read", "inventory:write"], createdBy: users.admin.id });
    expect((await get({ token })).status).toBe(403);
  });

  it.each(["architect", "admin"] as const)("shows the log to %s, newest first, with before and after", async (role) => {
    const res = await get(users[role]);
    expect(res.status).toBe(200);
    expect(res.body.total).toBeGreaterThanOrEqual(4);
    const times = res.body.items.map((i) => i.at);
    expect([...times].sort().reverse()).toEqual(times);
    expect(res.body.items.find((i) => i.action === "team.update")).toMatchObject({ before: { oncall: "old rota" }, after: { oncall: "new rota" } });
    expect(res.body.actions).toEqual(expect.arrayContaining(["review.create", "review.update", "team.update", "token.create"]));
  });
});

describe("GET /api/v1/audit — filters", () => {
  const actionsOf = (b: AuditBody) => b.items.map((i) => i.action).sort();

  it("by action: a full name, or a family by its prefix", async () => {
    expect(actionsOf((await get(users.admin, "?action=review.update")).body)).toEqual(["review.update"]);
    expect(actionsOf((await get(users.admin, "?action=review")).body)).toEqual(["review.create", "review.update"]);
    // "rev" is not a family: prefixes stop at the dot.
    expect((await get(users.admin, "?action=rev")).body.total).toBe(0);
  });

  it("by actor, case-insensitive part of the label", async () => {
    expect(actionsOf((await get(users.admin, "?actor=BOB")).body)).toEqual(["review.create", "review.update"]);
  });

  it("by environment and by target", async () => {
    expect((await get(users.admin, "?environment=staging")).body.items.every((i) => i.environment === "staging")).toBe(true);
    expect(actionsOf((await get(users.admin, "?environment=staging&action=review")).body)).toEqual(["review.create", "review.update"]);
    expect(actionsOf((await get(users.admin, "?target=shop")).body)).toEqual(["team.update"]);
    expect(actionsOf((await get(users.admin, "?target=token")).body)).toEqual(["token.create"]);
  });

  it("by whole UTC days, both ends included", async () => {
    expect(actionsOf((await get(users.admin, "?from=2030-03-10&to=2030-03-10")).body)).toEqual(["team.update"]);
    expect(actionsOf((await get(users.admin, "?from=2030-03-11&to=2030-03-11")).body)).toEqual(["review.create"]);
    expect(actionsOf((await get(users.admin, "?from=2030-03-10&to=2030-03-11")).body)).toEqual(["review.create", "team.update"]);
    expect(actionsOf((await get(users.admin, "?from=2030-03-12")).body)).toEqual([]);
    // Everything else happened today, long before 2030.
    expect(actionsOf((await get(users.admin, "?to=2030-03-10")).body)).not.toContain("review.create");
  });

  it("paginates with a total that does not depend on the page", async () => {
    const first = (await get(users.admin, "?limit=2&offset=0")).body;
    const second = (await get(users.admin, "?limit=2&offset=2")).body;
    const past = (await get(users.admin, "?limit=2&offset=500")).body;
    expect(first.items).toHaveLength(2);
    expect(first.total).toBe(second.total);
    expect(past.items).toEqual([]);
    expect(past.total).toBe(first.total);
    const ids = new Set([...first.items, ...second.items].map((i) => `${i.action}:${i.at}`));
    expect(ids.size).toBe(first.items.length + second.items.length);
  });

  it.each(["?from=2030-13-01", "?from=2030-03-12&to=2030-03-11", "?limit=0", "?limit=5000", "?colour=red"])("answers 422 for %s", async (query) => {
    const res = await get(users.admin, query);
    expect(res.status).toBe(422);
  });
});
